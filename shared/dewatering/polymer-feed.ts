/**
 * Flocculant polymer feed: the stock solution pumped into the slurry line and the neat (as
 * supplied) polymer it carries. The dose is mg of neat polymer per litre of slurry; the stock
 * concentration is percent weight per volume as the trade makes it up (0.5 % = 5 g per litre).
 * Product and dose follow jar tests, the product's approval and the permit: these are aids.
 */

export interface PolymerFeed {
  /** Stock solution to pump, L/h. */
  stockSolutionLPerH: number;
  /** Neat polymer, kg/h. */
  neatPolymerKgPerH: number;
}

/** grams per litre of a stock made up at `stockPercent` % (w/v). */
export function stockGramsPerLitre(stockPercent: number): number {
  return stockPercent * 10;
}

/** neat g/h = flow (m³/h) × 1,000 L/m³ × dose (mg/L) ÷ 1,000 mg/g; stock L/h = neat g/h ÷ stock g/L. */
export function polymerFeed(slurryFlowM3PerH: number, doseMgPerL: number, stockPercent: number): PolymerFeed {
  const neatGramsPerHour = slurryFlowM3PerH * doseMgPerL;
  return { stockSolutionLPerH: neatGramsPerHour / stockGramsPerLitre(stockPercent), neatPolymerKgPerH: neatGramsPerHour / 1000 };
}
