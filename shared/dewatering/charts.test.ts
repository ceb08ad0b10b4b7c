import { describe, expect, it } from "vitest";
import { KILOGRAMS_PER_POUND } from "../units";
import { cumulativeSolids, dewateringDays } from "./charts";
import { reconcileSolids } from "./reconciliation";

// The dewatering charts' series, checked by hand (computed) and against the reconciliation's own
// figures, which the charts must never contradict.

describe("dewatering days", () => {
  it("adds a day's shifts and takes polymer per dry ton over the dosed shifts only", () => {
    const days = dewateringDays([
      { date: "2026-10-02", drySolidsKg: 10_000, neatPolymerKg: 20 },
      { date: "2026-10-02", drySolidsKg: 5_000, neatPolymerKg: null },
      { date: "2026-10-01", drySolidsKg: null, neatPolymerKg: 3 },
    ], "ft");
    expect(days.map((day) => day.date)).toEqual(["2026-10-01", "2026-10-02"]);
    // computed: a day whose only shift logged no solids has no dry solids and no ratio
    expect(days[0]).toMatchObject({ shifts: 1, drySolids: null, polymerPerDryTon: null });
    // computed: 15,000 kg ÷ 907.18474 kg per short ton (2,000 lb × 0.45359237 kg, NIST SP 811)
    expect(days[1].drySolids).toBeCloseTo(15_000 / (2000 * KILOGRAMS_PER_POUND), 9);
    // computed: 20 kg over 10 t is 2 kg/t, and 1 kg/t is exactly 2 lb per short ton, so 4 lb/ton;
    // the undosed shift's 5,000 kg must not dilute it to 2.67
    expect(days[1].polymerPerDryTon).toBeCloseTo(4, 9);
    // computed: its parts, which a week adds before dividing: 20 kg = 44.09 lb over the dosed 10,000 kg only
    expect(days[1].polymerParts!.polymer).toBeCloseTo(20 / KILOGRAMS_PER_POUND, 9);
    expect(days[1].polymerParts!.drySolids).toBeCloseTo(10_000 / (2000 * KILOGRAMS_PER_POUND), 9);
    expect(days[1].polymerParts!.polymer / days[1].polymerParts!.drySolids).toBeCloseTo(days[1].polymerPerDryTon!, 12);
    expect(days[0].polymerParts).toBeNull();
  });

  it("answers tonnes and kilograms on a metre project", () => {
    const [day] = dewateringDays([{ date: "2026-10-02", drySolidsKg: 12_500, neatPolymerKg: 25 }], "m");
    // computed: 12.5 t; 25 kg ÷ 12.5 t = 2 kg/t
    expect(day.drySolids).toBeCloseTo(12.5, 12);
    expect(day.polymerPerDryTon).toBeCloseTo(2, 12);
  });
});

describe("cumulative solids", () => {
  const samples = [
    { zoneId: 1, dryBulkDensityKgPerM3: 500, totalNitrogenMgKg: 0, totalPhosphorusMgKg: 0 },
    { zoneId: null, dryBulkDensityKgPerM3: 300, totalNitrogenMgKg: 0, totalPhosphorusMgKg: 0 },
  ];
  const surveyed = {
    dates: ["2026-10-01", "2026-10-10", "2026-10-20"],
    zones: [
      { zoneId: 1, removedVolume: [0, 100, 150] },
      { zoneId: 2, removedVolume: [0, null, 40] },
    ],
  };

  it("puts surveys, shifts and hauls on one date axis, each line holding its last value", () => {
    const result = cumulativeSolids({
      lengthUnit: "m", surveyed, samples,
      shifts: [{ date: "2026-10-05", drySolidsKg: 10_000, neatPolymerKg: null }, { date: "2026-10-12", drySolidsKg: 5_000, neatPolymerKg: 10 }, { date: "2026-10-12", drySolidsKg: null, neatPolymerKg: 1 }],
      hauls: [{ date: "2026-10-12", drySolidsKg: 8_000 }],
    });
    expect(result.dates).toEqual(["2026-10-01", "2026-10-05", "2026-10-10", "2026-10-12", "2026-10-20"]);
    // computed: zone 1 at its own 500 kg/m³, zone 2 at the project's mean (500 + 300) ÷ 2 = 400 kg/m³;
    // 10-10: 100 × 500 = 50 t (zone 2's missing value holds its 0); 10-20: 150 × 500 + 40 × 400 = 91 t
    expect(result.surveyed).toEqual([0, 0, 50, 50, 91]);
    expect(result.pumped).toEqual([null, 10, 10, 15, 15]);
    expect(result.hauled).toEqual([null, null, null, 8, 8]);
    expect(result.own.pumped).toEqual([false, true, false, true, false]);
    expect(result.own.surveyed).toEqual([true, false, true, false, true]);
    expect(result).toMatchObject({ unit: "t", massUnit: "kg", surveyedMissing: null });
  });

  it("ends where the reconciliation's dry mass from surveys does", () => {
    const result = cumulativeSolids({ lengthUnit: "ft", surveyed, samples, shifts: [], hauls: [] });
    const reconciled = reconcileSolids({
      lengthUnit: "ft", samples, pumpedDryKg: 0, hauledDryKg: 0,
      zones: [{ zoneId: 1, name: "North", removedVolume: 150 }, { zoneId: 2, name: "South", removedVolume: 40 }],
    });
    expect(result.unit).toBe("short-ton");
    expect(result.surveyed.at(-1)).toBeCloseTo(reconciled.project.dryMassFromSurveys!.value, 9);
  });

  it("has no surveyed line without lab samples, and says why", () => {
    const result = cumulativeSolids({ lengthUnit: "m", surveyed, samples: [], shifts: [], hauls: [{ date: "2026-10-02", drySolidsKg: 1000 }] });
    expect(result.surveyed.every((value) => value === null)).toBe(true);
    expect(result.surveyedMissing).toBe("no-samples");
    expect(cumulativeSolids({ lengthUnit: "m", surveyed: { dates: [], zones: [] }, samples, shifts: [], hauls: [] }).surveyedMissing).toBe("no-surveys");
  });
});
