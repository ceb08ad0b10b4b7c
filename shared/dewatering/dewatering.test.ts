import { describe, expect, it } from "vitest";
import { KILOGRAMS_PER_POUND, LITRES_PER_US_GALLON, cubicMetresPerHourFrom, kilogramsPerCubicMetreFrom } from "../units";
import { CAKE_SOLIDS_MISSING, cakeSolidsInForce, haulDryMassKg } from "./haul";
import { polymerFeed } from "./polymer-feed";
import { reconcileSolids } from "./reconciliation";
import { computeShiftFigures, flowFromTotaliser, shiftMeasurementsOf } from "./shift";
import { drySolidsRateKgPerH, slurryFromSolidsByWeight, slurryFromSpecificGravity } from "./slurry";
import { NEAR_CAPACITY_SHARE, fillLevel, isNearCapacity, theoreticalDiameter, tubeEnds } from "./tubes";

// Checks of the dewatering arithmetic against values from outside Firmsand; the source is named
// beside each (shared/REFERENCES.md of the workplace, "Water, dewatering, pipeline" and "Added for
// dewatering").

describe("polymer feed", () => {
  it("20 m³/h at 5 mg/L with a 0.5 % stock: 20 L/h of stock, 100 g/h neat", () => {
    // published: worked example of an online polymer dosing calculator (0.5 % = 5 g/L stock)
    const feed = polymerFeed(20, 5, 0.5);
    expect(feed.stockSolutionLPerH).toBeCloseTo(20, 9);
    expect(feed.neatPolymerKgPerH * 1000).toBeCloseTo(100, 9);
  });

  it("the pounds formula: 15 MGD × 18 mg/L × 8.34 = 2,251.8 lb/day, to the rounding of 8.34", () => {
    // published: water-treatment chemical dosage worksheets, lb/day = MGD × mg/L × 8.34 → 2,251.8 lb/day (93.8 lb/h).
    // 8.34 is a gallon of water's weight in pounds, rounded; NIST's gallon and pound give
    // 3.785411784 / 0.45359237 = 8.3454 lb, so the exact figure is 2,251.8 × 8.3454 / 8.34.
    const gpm = (15 * 1_000_000) / 1440; // computed: MGD = gpm × 1440 / 1,000,000
    const figures = computeShiftFigures({ slurryFlow: { value: gpm, unit: "gpm" }, pumpHours: 24, solidsSpecificGravity: 2.65, polymer: { doseMgPerL: 18, stockPercent: 0.5 } }, "ft");
    expect(figures.neatPolymer!.unit).toBe("lb");
    expect(figures.neatPolymerForShift!.value).toBeCloseTo((2251.8 * (LITRES_PER_US_GALLON / KILOGRAMS_PER_POUND)) / 8.34, 1);
    expect(Math.abs(figures.neatPolymerForShift!.value / 2251.8 - 1)).toBeLessThan(0.001);
    expect(figures.neatPolymer!.value).toBeCloseTo(93.8, 0);
  });

  it("answers a metre project in L/h and kg, a feet project in gal/h and lb", () => {
    const metric = computeShiftFigures({ slurryFlow: { value: 20, unit: "m3/h" }, pumpHours: 10, solidsSpecificGravity: 2.65, polymer: { doseMgPerL: 5, stockPercent: 0.5 } }, "m");
    // published: the calculator's example again, now through the shift's figures
    expect(metric.stockFeedRate).toMatchObject({ unit: "L/h" });
    expect(metric.stockFeedRate!.value).toBeCloseTo(20, 9);
    expect(metric.neatPolymer!.value).toBeCloseTo(0.1, 12);
    expect(metric.neatPolymerForShift!.value).toBeCloseTo(1, 12); // computed: 0.1 kg/h × 10 h
    const feet = computeShiftFigures({ slurryFlow: { value: 20, unit: "m3/h" }, pumpHours: 10, solidsSpecificGravity: 2.65, polymer: { doseMgPerL: 5, stockPercent: 0.5 } }, "us-ft");
    // computed: 20 L/h ÷ 3.785411784 L/gal (NIST SP 811)
    expect(feet.stockFeedRate).toMatchObject({ unit: "gal/h" });
    expect(feet.stockFeedRate!.value).toBeCloseTo(5.2834, 4);
    // a shift without a polymer has no feed figures, and without solids no dry solids
    const bare = computeShiftFigures({ slurryFlow: { value: 20, unit: "m3/h" }, pumpHours: 10, solidsSpecificGravity: 2.65 }, "m");
    expect([bare.stockFeedRate, bare.drySolids, bare.polymerPerDryTon]).toEqual([null, null, null]);
  });
});

describe("flow from a totaliser", () => {
  it("is the volume between the readings over the pumping time", () => {
    // computed: 480,000 gal in 8 h = 1,000 gpm; 1,817 m³ in 8 h = 227.1 m³/h
    expect(flowFromTotaliser({ start: 1_250_000, end: 1_730_000, unit: "gal" }, 8)).toEqual({ value: 1000, unit: "gpm" });
    expect(flowFromTotaliser({ start: 100, end: 1917, unit: "m3" }, 8).value).toBeCloseTo(227.125, 9);
  });
});

describe("a logged shift's measurements", () => {
  it("the pump hours default to the whole shift and a totaliser gives the mean flow over them", () => {
    // computed: 07:00–15:00 is 8 h; 480,000 gal in 8 h = 1,000 gpm
    const measured = shiftMeasurementsOf({ start: "07:00", end: "15:00", totaliser: { start: 1_250_000, end: 1_730_000, unit: "gal" }, solidsByWeight: 0.2 }, 2.65);
    expect(measured).toMatchObject({ pumpHours: 8, slurryFlow: { value: 1000, unit: "gpm" }, solidsSpecificGravity: 2.65, solidsByWeight: 0.2 });
    // computed: 480,000 gal over the 6 pump hours given = 1,333.3 gpm; the shift's own Gs wins over the project's
    const pumped = shiftMeasurementsOf({ start: "07:00", end: "15:00", pumpHours: 6, totaliser: { start: 1_250_000, end: 1_730_000, unit: "gal" }, solidsSpecificGravity: 2.5 }, 2.65);
    expect(pumped?.slurryFlow.value).toBeCloseTo(1333.333, 3);
    expect(pumped?.solidsSpecificGravity).toBe(2.5);
  });
  it("is null without a positive span or a flow, so no figure is shown for an unfinished entry", () => {
    expect(shiftMeasurementsOf({ start: "15:00", end: "07:00", slurryFlow: { value: 900, unit: "gpm" } }, 2.65)).toBeNull();
    expect(shiftMeasurementsOf({ start: "07:00", end: "15:00" }, 2.65)).toBeNull();
  });
});

describe("slurry composition", () => {
  it("Cw 0.20 and 0.50 with Gs 2.67: SG 1.143 / 1.455, Cv 0.086 / 0.272", () => {
    // computed from SG = 1/(Cw/Gs + 1 − Cw), Cv = Cw·SG/Gs; a published dredge-pipeline slurry table lists 1.14 / 9 % and 1.45 / 27 %
    const twenty = slurryFromSolidsByWeight(0.2, 2.67);
    expect(twenty.specificGravity).toBeCloseTo(1.143, 3);
    expect(twenty.solidsByVolume).toBeCloseTo(0.086, 3);
    const fifty = slurryFromSolidsByWeight(0.5, 2.67);
    expect(fifty.specificGravity).toBeCloseTo(1.455, 3);
    expect(fifty.solidsByVolume).toBeCloseTo(0.272, 3);
    // published table, to its own rounding
    expect(Math.round(twenty.specificGravity * 100) / 100).toBe(1.14);
    expect(Math.round(fifty.solidsByVolume * 100)).toBe(27);
  });

  it("from a measured SG: 1.10 with solids of 2.65 → Cv 0.06061", () => {
    // published: USACE hydraulic engineering formulas, Cv = (Sm − 1)/(Ss − 1); Cw = Cv·Ss/Sm
    const slurry = slurryFromSpecificGravity(1.1, 2.65);
    expect(slurry.solidsByVolume).toBeCloseTo(0.06061, 5);
    expect(slurry.solidsByWeight).toBeCloseTo((0.1 / 1.65) * (2.65 / 1.1), 12);
  });

  it("the two directions invert each other and keep the mass balance (invariant)", () => {
    for (const gs of [1.4, 2.0, 2.65]) {
      for (const cw of [0.01, 0.1, 0.35, 0.7]) {
        const forward = slurryFromSolidsByWeight(cw, gs);
        expect(slurryFromSpecificGravity(forward.specificGravity, gs).solidsByWeight).toBeCloseTo(cw, 12);
        // mixture density = water + Cv·(solids − water) (USACE formula ρm = ρw + Cv(ρs − ρw))
        expect(forward.specificGravity).toBeCloseTo(1 + forward.solidsByVolume * (gs - 1), 12);
      }
    }
  });

  it("1,000 gpm at Cw 0.20, Gs 2.67 carries 57.2 dry short tons per hour", () => {
    // computed: Q × SG × Cw with the NIST gallon (3.785411784 L) and the short ton (2,000 lb of 0.45359237 kg)
    const figures = computeShiftFigures({ slurryFlow: { value: 1000, unit: "gpm" }, pumpHours: 8, solidsByWeight: 0.2, solidsSpecificGravity: 2.67 }, "ft");
    expect(figures.drySolidsRate!.unit).toBe("short-ton");
    expect(figures.drySolidsRate!.value).toBeCloseTo(57.2, 1);
    expect(figures.drySolids!.value).toBeCloseTo(figures.drySolidsRate!.value * 8, 9);
    // the same flow on a metre project: 227.12 m³/h → 51.9 dry tonnes/h
    expect(drySolidsRateKgPerH(cubicMetresPerHourFrom(1000, "gpm"), slurryFromSolidsByWeight(0.2, 2.67)) / 1000).toBeCloseTo(51.92, 2);
  });

  it("polymer per dry ton is the neat polymer over the dry solids", () => {
    // computed: 1 m³/h at 10 mg/L = 10 g/h neat; 1 m³/h at Cw 0.5, Gs 2.67 = 727.5 kg/h dry → 0.01375 kg per dry tonne
    const figures = computeShiftFigures({ slurryFlow: { value: 1, unit: "m3/h" }, pumpHours: 1, solidsByWeight: 0.5, solidsSpecificGravity: 2.67, polymer: { doseMgPerL: 10, stockPercent: 0.25 } }, "m");
    expect(figures.polymerPerDryTon!.unit).toBe("kg/t");
    expect(figures.polymerPerDryTon!.value).toBeCloseTo(0.01 / (1.455 * 0.5), 3);
  });
});

describe("nutrients removed", () => {
  it("1,000 yd³ at 15 lb/ft³ dry and 800 mg/kg TP: 324 lb of phosphorus", () => {
    // computed: 27,000 ft³ × 15 lb/ft³ = 405,000 lb dry × 800 × 10⁻⁶ = 324 lb
    const result = reconcileSolids({
      lengthUnit: "ft",
      zones: [{ zoneId: 1, name: "North", removedVolume: 1000 }],
      samples: [{ zoneId: 1, dryBulkDensityKgPerM3: kilogramsPerCubicMetreFrom(15, "lb/ft3"), totalNitrogenMgKg: 10_000, totalPhosphorusMgKg: 800 }],
      pumpedDryKg: 0,
      hauledDryKg: 0,
    });
    expect(result.project.phosphorusRemoved).toMatchObject({ unit: "lb" });
    expect(result.project.phosphorusRemoved!.value).toBeCloseTo(324, 6);
    expect(result.project.nitrogenRemoved!.value).toBeCloseTo(4050, 5); // computed: 405,000 lb × 10,000 × 10⁻⁶
    expect(result.project.dryMassFromSurveys!.value).toBeCloseTo(202.5, 6); // computed: 405,000 lb ÷ 2,000 lb per short ton
  });

  it("uses a zone's own samples, the project's mean for a zone without any, and none when there are none", () => {
    const density = (lbPerFt3: number) => kilogramsPerCubicMetreFrom(lbPerFt3, "lb/ft3");
    const samples = [
      { zoneId: 1, dryBulkDensityKgPerM3: density(10), totalNitrogenMgKg: 0, totalPhosphorusMgKg: 1000 },
      { zoneId: 1, dryBulkDensityKgPerM3: density(20), totalNitrogenMgKg: 0, totalPhosphorusMgKg: 1000 },
      { zoneId: null, dryBulkDensityKgPerM3: density(30), totalNitrogenMgKg: 0, totalPhosphorusMgKg: 1000 },
    ];
    const zones = [{ zoneId: 1, name: "North", removedVolume: 100 }, { zoneId: 2, name: "South", removedVolume: 100 }];
    const result = reconcileSolids({ lengthUnit: "ft", zones, samples, pumpedDryKg: 0, hauledDryKg: 0 });
    // computed: North at its mean of 15 lb/ft³, South at the project's mean of 20 lb/ft³; 2,700 ft³ each
    expect(result.zones[0].samplesFrom).toBe("zone");
    expect(result.zones[0].phosphorusRemoved!.value).toBeCloseTo(2700 * 15 * 1e-3, 9);
    expect(result.zones[1].samplesFrom).toBe("project");
    expect(result.zones[1].phosphorusRemoved!.value).toBeCloseTo(2700 * 20 * 1e-3, 9);
    // the project is the sum of its zones (invariant)
    expect(result.project.phosphorusRemoved!.value).toBeCloseTo(result.zones[0].phosphorusRemoved!.value + result.zones[1].phosphorusRemoved!.value, 9);
    const none = reconcileSolids({ lengthUnit: "m", zones, samples: [], pumpedDryKg: 1000, hauledDryKg: 500 });
    expect(none.zones[0].samplesFrom).toBe("none");
    expect(none.project.phosphorusRemoved).toBeNull();
    expect(none.project.pumpedVersusSurveyedPercent).toBeNull();
    expect(none.project.hauledVersusPumpedPercent).toBeCloseTo(-50, 9); // computed: (0.5 − 1) ÷ 1 tonne
    expect(none.project.dryMassNotYetHauled.value).toBeCloseTo(0.5, 12); // computed: 1 t pumped − 0.5 t hauled
  });

  it("states differences against the surveyed dry mass in percent", () => {
    // computed: 100 m³ × 500 kg/m³ = 50 t surveyed; 60 t pumped is +20 %, 45 t hauled is −10 %
    const result = reconcileSolids({
      lengthUnit: "m",
      zones: [{ zoneId: null, name: "Unzoned", removedVolume: 100 }],
      samples: [{ zoneId: null, dryBulkDensityKgPerM3: 500, totalNitrogenMgKg: 0, totalPhosphorusMgKg: 0 }],
      pumpedDryKg: 60_000,
      hauledDryKg: 45_000,
    });
    expect(result.project.dryMassFromSurveys).toMatchObject({ unit: "t" });
    expect(result.project.dryMassFromSurveys!.value).toBeCloseTo(50, 9);
    expect(result.project.pumpedVersusSurveyedPercent).toBeCloseTo(20, 9);
    expect(result.project.hauledVersusSurveyedPercent).toBeCloseTo(-10, 9);
  });
});

describe("geotextile tubes", () => {
  it("a 30 ft circumference gives a theoretical diameter of 9.55 ft", () => {
    // computed: D = C/π (geometry)
    expect(theoreticalDiameter(30)).toBeCloseTo(9.55, 2);
  });

  it("fill level is the delivered dry mass over the capacity; near capacity is flagged", () => {
    // computed: 45 dry tons into a 100 ft tube holding 0.5 dry tons per foot is 90 % full, 25 is half full
    expect(fillLevel(45, 0.5, 100)).toBeCloseTo(0.9, 12);
    expect(fillLevel(25, 0.5, 100)).toBeCloseTo(0.5, 12);
    expect(isNearCapacity(fillLevel(45, 0.5, 100))).toBe(true);
    expect(isNearCapacity(NEAR_CAPACITY_SHARE - 0.01)).toBe(false);
  });

  it("lies along its bearing: 150 ft north–south at 0°, east–west at 90°, its ends 150 ft apart at any bearing", () => {
    // computed: plane geometry, bearings clockwise from grid north
    const [south, north] = tubeEnds({ x: 1000, y: 2000 }, 150, 0);
    expect(south[0]).toBeCloseTo(1000, 9);
    expect([south[1], north[1]]).toEqual([1925, 2075]);
    const [west, east] = tubeEnds({ x: 1000, y: 2000 }, 150, 90);
    expect([west[0], east[0]]).toEqual([925, 1075]);
    expect(west[1]).toBeCloseTo(2000, 9);
    const [a, b] = tubeEnds({ x: 0, y: 0 }, 150, 37);
    expect(Math.hypot(b[0] - a[0], b[1] - a[1])).toBeCloseTo(150, 9);
    expect(Math.atan2(b[0] - a[0], b[1] - a[1]) * (180 / Math.PI)).toBeCloseTo(37, 9);
  });

  it("flags at the project's own share when the manager set one", () => {
    // computed: 46 of 50 dry tons is 92 %: flagged at the default 90 %, not at a supplier's 95 %
    const level = fillLevel(46, 0.5, 100);
    expect(isNearCapacity(level)).toBe(true);
    expect(isNearCapacity(level, 0.95)).toBe(false);
    expect(isNearCapacity(0.95, 0.95)).toBe(true);
  });
});

describe("haul tickets", () => {
  it("a scale ticket's dry solids are its wet load times the cake solids", () => {
    // computed: 20,000 kg wet at 25 % solids
    expect(haulDryMassKg({ wetMassKg: 20_000 }, 0.25, 2.65)).toBeCloseTo(5000, 9);
  });

  it("a truck body's dry solids are its solids volume times the solids' density (invariant)", () => {
    // computed: dry mass = V × Cv × Gs × 1,000 kg/m³, the solids' own volume at their own density
    const cake = slurryFromSolidsByWeight(0.3, 1.8);
    expect(haulDryMassKg({ volumeM3: 10 }, 0.3, 1.8)).toBeCloseTo(10 * cake.solidsByVolume * 1.8 * 1000, 6);
  });
});

describe("the cake solids a ticket is counted at", () => {
  it("the load's own sample first, then the project's default, else none (practice: a ticket without a sample is counted at the project's figure)", () => {
    expect(cakeSolidsInForce(0.28, 0.3)).toEqual({ cakeSolidsByWeight: 0.28, fromSample: true });
    expect(cakeSolidsInForce(null, 0.3)).toEqual({ cakeSolidsByWeight: 0.3, fromSample: false });
    expect(cakeSolidsInForce(undefined, 0.3)).toEqual({ cakeSolidsByWeight: 0.3, fromSample: false });
    expect(cakeSolidsInForce(0.25, null)).toEqual({ cakeSolidsByWeight: 0.25, fromSample: true });
    expect(cakeSolidsInForce(null, null)).toBeNull();
    expect(cakeSolidsInForce(undefined, undefined)).toBeNull();
    expect(CAKE_SOLIDS_MISSING).toMatch(/cake solids/);
  });
});
