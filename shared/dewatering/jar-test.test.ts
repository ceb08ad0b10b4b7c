import { describe, expect, it } from "vitest";
import { benchStockMillilitres, jarTestFigures, stockMilligramsPerLitre, turbidityRemoval } from "./jar-test";
import { stockGramsPerLitre } from "./polymer-feed";

// The jar test's bench arithmetic, each check with its source (shared/REFERENCES.md of the workplace).

describe("bench stock per jar", () => {
  it("1 mL of a 0.1 % stock in a 1-litre jar doses 1 mg/L", () => {
    // published: jar-test procedures' rule of thumb (a 0.1 % stock holds 1 g/L = 1 mg per mL; 1 mg in 1 L is 1 mg/L)
    expect(benchStockMillilitres(1000, 1, 0.1)).toBeCloseTo(1, 12);
    expect(stockMilligramsPerLitre(0.1)).toBe(1000);
  });

  it("scales with the jar and the dose, inversely with the stock", () => {
    // computed: 2,000 mL × 10 mg/L ÷ 1,000 mg/L = 20 mL; 1,000 mL × 5 mg/L ÷ 5,000 mg/L (0.5 %) = 1 mL
    expect(benchStockMillilitres(2000, 10, 0.1)).toBeCloseTo(20, 12);
    expect(benchStockMillilitres(1000, 5, 0.5)).toBeCloseTo(1, 12);
  });

  it("agrees with the line's feed arithmetic: the same stock concentration in g/L", () => {
    // computed: the plant's stock at 0.5 % is 5 g/L (shared/dewatering/polymer-feed.ts); the bench's mg/L is 1,000 × that
    expect(stockMilligramsPerLitre(0.5)).toBe(stockGramsPerLitre(0.5) * 1000);
  });
});

describe("reading the jars", () => {
  it("turbidity removed: 400 NTU raw to 20 NTU settled is 95 %", () => {
    // computed: (400 − 20) ÷ 400
    expect(turbidityRemoval(400, 20)).toBeCloseTo(0.95, 12);
    expect(turbidityRemoval(400, 500)).toBeCloseTo(-0.25, 12);
  });

  it("points to the lowest dose among the clearest jars, by turbidity when every jar was measured", () => {
    // practice: past the best dose a polymer overdose restabilises the fines, so the clearest jar need not be the highest dose
    const figures = jarTestFigures({
      jarVolumeMl: 1000, benchStockPercent: 0.1, rawTurbidityNtu: 400,
      jars: [
        { doseMgPerL: 2, settlingMinutes: 10, turbidityNtu: 60, clarity: "hazy" },
        { doseMgPerL: 4, settlingMinutes: 10, turbidityNtu: 12, clarity: "clear" },
        { doseMgPerL: 6, settlingMinutes: 10, turbidityNtu: 12, clarity: "clear" },
        { doseMgPerL: 8, settlingMinutes: 10, turbidityNtu: 35, clarity: "slightly-hazy" },
      ],
    });
    expect(figures.clearestAtLowestDose).toBe(4);
    expect(figures.jars.map((jar) => jar.stockMl)).toEqual([2, 4, 6, 8]);
    expect(figures.jars[1].removal).toBeCloseTo(0.97, 12); // computed: (400 − 12) ÷ 400
  });

  it("falls back on the clarity seen when a jar was not measured, and gives no removal without a raw reading", () => {
    const figures = jarTestFigures({
      jarVolumeMl: 1000, benchStockPercent: 0.1, rawTurbidityNtu: null,
      jars: [
        { doseMgPerL: 3, settlingMinutes: 5, turbidityNtu: null, clarity: "slightly-hazy" },
        { doseMgPerL: 5, settlingMinutes: 5, turbidityNtu: 8, clarity: "clear" },
        { doseMgPerL: 7, settlingMinutes: 5, turbidityNtu: null, clarity: "clear" },
      ],
    });
    expect(figures.clearestAtLowestDose).toBe(5);
    expect(figures.jars.every((jar) => jar.removal === null)).toBe(true);
    expect(jarTestFigures({ jarVolumeMl: 1000, benchStockPercent: 0.1, rawTurbidityNtu: 100, jars: [] }).clearestAtLowestDose).toBeNull();
  });
});
