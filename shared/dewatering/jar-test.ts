/**
 * The jar test: the operator's bench check of a polymer dose. A jar of raw slurry is left undosed
 * beside jars dosed from a dilute bench stock; after mixing and settling, each jar's clarity is
 * judged (and its turbidity measured when a meter is at hand), and a dose is chosen for the line.
 * These figures help set up and read the jars; the product and dose still follow the permit, the
 * approved product list and the product's safety data sheet.
 */

/** How clear a jar's water is after settling, by eye, clearest first. */
export const JAR_CLARITIES = ["clear", "slightly-hazy", "hazy", "turbid"] as const;
export type JarClarity = (typeof JAR_CLARITIES)[number];
export const JAR_CLARITY_LABELS: Record<JarClarity, string> = { clear: "clear", "slightly-hazy": "slightly hazy", hazy: "hazy", turbid: "turbid" };

/** The bench's usual jar, mL (a 1-litre beaker or square jar). */
export const DEFAULT_JAR_VOLUME_ML = 1000;

/** mg/L in a stock made up at `stockPercent` % weight per volume: 1 % = 10 g/L = 10,000 mg/L. */
export function stockMilligramsPerLitre(stockPercent: number): number {
  return stockPercent * 10_000;
}

/**
 * Bench stock to add to one jar for a dose: mL = jar volume (mL) × dose (mg/L) ÷ stock (mg/L).
 * (C₁V₁ = C₂V₂ with the jar's own volume; the few mL of stock added are neglected, as at the bench.)
 */
export function benchStockMillilitres(jarVolumeMl: number, doseMgPerL: number, stockPercent: number): number {
  return (jarVolumeMl * doseMgPerL) / stockMilligramsPerLitre(stockPercent);
}

/** Share of the raw sample's turbidity a dosed jar removed, 0–1 (negative when it is cloudier). */
export function turbidityRemoval(rawNtu: number, dosedNtu: number): number {
  return (rawNtu - dosedNtu) / rawNtu;
}

export interface DosedJar {
  doseMgPerL: number;
  settlingMinutes: number;
  turbidityNtu: number | null;
  clarity: JarClarity;
}

export interface JarFigures {
  /** Bench stock for this jar, mL. */
  stockMl: number;
  /** Share of the raw turbidity removed, when both were measured. */
  removal: number | null;
}

export interface JarTestFigures {
  jars: JarFigures[];
  /**
   * The lowest dose among the clearest jars: by turbidity when every jar was measured, else by
   * the clarity seen. A pointer for the operator, not the choice, which stays theirs.
   */
  clearestAtLowestDose: number | null;
}

export function jarTestFigures(test: { jarVolumeMl: number; benchStockPercent: number; rawTurbidityNtu: number | null; jars: readonly DosedJar[] }): JarTestFigures {
  const jars = test.jars.map((jar) => ({
    stockMl: benchStockMillilitres(test.jarVolumeMl, jar.doseMgPerL, test.benchStockPercent),
    removal: test.rawTurbidityNtu !== null && test.rawTurbidityNtu > 0 && jar.turbidityNtu !== null ? turbidityRemoval(test.rawTurbidityNtu, jar.turbidityNtu) : null,
  }));
  if (test.jars.length === 0) return { jars, clearestAtLowestDose: null };
  const measured = test.jars.every((jar) => jar.turbidityNtu !== null);
  const score = (jar: DosedJar) => (measured ? jar.turbidityNtu! : JAR_CLARITIES.indexOf(jar.clarity));
  const best = Math.min(...test.jars.map(score));
  const clearest = test.jars.filter((jar) => score(jar) === best).map((jar) => jar.doseMgPerL);
  return { jars, clearestAtLowestDose: Math.min(...clearest) };
}
