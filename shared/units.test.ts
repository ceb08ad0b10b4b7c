import { describe, expect, it } from "vitest";
import * as units from "./units";
import { METRES_PER_UNIT, SQUARE_METRES_PER_ACRE, areaFromAcres, convertLength, cubicToVolumeUnit, defaultsFor, lengthUnitSchema, unitLabel, volumeUnitFor } from "./units";

describe("NIST length definitions", () => {
  it("US survey foot is 1200/3937 m", () => {
    // published: NIST, 85 FR 62698 (2020): 1 US survey foot = 1200/3937 m = 0.3048006096012192 m
    expect(METRES_PER_UNIT["us-ft"]).toBe(0.3048006096012192);
    expect(METRES_PER_UNIT["us-ft"] * 3937).toBeCloseTo(1200, 12);
  });
  it("international foot is 0.3048 m exactly", () => {
    // published: NIST SP 811
    expect(METRES_PER_UNIT.ft).toBe(0.3048);
    expect(METRES_PER_UNIT.m).toBe(1);
  });
  it("the two feet differ by 2 ppm", () => {
    // computed from the NIST definitions: (1200/3937)/0.3048 − 1 = 1200/1199.9976 − 1 = 1/499,999 ≈ 2.000004e-6
    const ratio = METRES_PER_UNIT["us-ft"] / METRES_PER_UNIT.ft - 1;
    expect(ratio).toBeCloseTo(1 / 499_999, 12);
    expect(convertLength(1_000_000, "us-ft", "ft")).toBeCloseTo(1_000_002, 3);
  });
  it("converts lengths both ways", () => {
    // computed: 200,000 m = 200,000 × 3937/1200 ftUS = 656,166.6667 ftUS (the FE of EPSG:2237)
    expect(convertLength(200_000, "m", "us-ft")).toBeCloseTo(656_166.6667, 3);
    expect(convertLength(convertLength(123.456, "ft", "m"), "m", "ft")).toBeCloseTo(123.456, 12);
    expect(convertLength(5, "m", "m")).toBe(5);
  });
});

describe("NIST area definitions", () => {
  it("acre is 43,560 ft² = 4,046.8564224 m²", () => {
    // computed from NIST definitions: 43,560 × 0.3048²
    expect(SQUARE_METRES_PER_ACRE).toBeCloseTo(4046.8564224, 9);
    expect(areaFromAcres(2, "ft")).toBeCloseTo(87_120, 8);
    expect(areaFromAcres(1, "m")).toBeCloseTo(4046.8564224, 9);
    // computed: an acre is 4 ppm fewer square survey feet than square international feet
    expect(areaFromAcres(1, "us-ft") / 43_560 - 1).toBeCloseTo(-3.999996e-6, 10);
  });
});

describe("project volume units", () => {
  it("feet projects report cubic yards of their own foot", () => {
    // computed: 27 ft³ = 1 yd³ by definition of the yard (3 ft)
    expect(volumeUnitFor("us-ft")).toBe("yd3");
    expect(volumeUnitFor("ft")).toBe("yd3");
    expect(volumeUnitFor("m")).toBe("m3");
    expect(cubicToVolumeUnit(187_200, "ft")).toBeCloseTo(6933.333, 3);
    expect(cubicToVolumeUnit(187_200, "us-ft")).toBeCloseTo(6933.333, 3);
    expect(cubicToVolumeUnit(42, "m")).toBe(42);
  });
});

describe("defaults and labels", () => {
  it("gives defaults in the project's unit", () => {
    // practice: 20 ft / 5 m cells, 1 ft / 0.25 m raster; published: 0.25 ft probe accuracy, EM 1110-2-1003 table 3-1
    expect(defaultsFor("us-ft")).toEqual({ cellSize: 20, resolution: 1, tolerance: 0.25, maxEdge: 50 });
    expect(defaultsFor("m")).toEqual({ cellSize: 5, resolution: 0.25, tolerance: 0.08, maxEdge: 15 });
  });
  it("labels units for display", () => {
    expect(unitLabel("us-ft")).toBe("ftUS");
    expect(unitLabel("ft", "volume")).toBe("yd³");
    expect(unitLabel("m", "area")).toBe("m²");
    // One long label per unit, for messages, pages and pickers alike: the two feet told apart (NIST SP 811).
    expect(["us-ft", "ft", "m"].map((unit) => unitLabel(unit as "us-ft", "length-long"))).toEqual(["US survey feet", "international feet", "metres"]);
    // One short label per unit: EPSG's abbreviations; no two units share one.
    const shorts = ["us-ft", "ft", "m"].map((unit) => unitLabel(unit as "us-ft"));
    expect(shorts).toEqual(["ftUS", "ft", "m"]);
    expect(new Set(shorts).size).toBe(3);
    expect(unitLabel("us-ft", "volume-long")).toBe("cubic yards");
    expect(unitLabel("m", "volume-long")).toBe("cubic metres");
  });
  it("validates a unit at the boundary", () => {
    expect(lengthUnitSchema.parse("us-ft")).toBe("us-ft");
    expect(lengthUnitSchema.safeParse("yards").success).toBe(false);
  });
});

describe("NIST mass, volume and density definitions for the dewatering records", () => {
  it("a pound is 0.45359237 kg, a short ton 907.18474 kg, a US gallon 3.785411784 L", () => {
    // published: NIST SP 811
    expect(units.KILOGRAMS_PER_POUND).toBe(0.45359237);
    expect(units.kilogramsTo(907.18474, "short-ton")).toBeCloseTo(1, 12);
    expect(units.cubicMetresPerHourFrom(1, "gpm")).toBeCloseTo(0.227124707, 9); // computed: 60 × 3.785411784 L
    expect(units.cubicMetresPerHourTo(units.cubicMetresPerHourFrom(123, "gpm"), "gpm")).toBeCloseTo(123, 9);
  });
  it("a cubic yard is 0.764554857984 m³; 1 lb/ft³ is 16.018463 kg/m³", () => {
    // published: NIST SP 811 (cubic yard exact); computed: 0.45359237 / 0.3048³
    expect(units.cubicMetresPerVolumeUnit("ft")).toBeCloseTo(0.764554857984, 12);
    expect(units.cubicMetresPerVolumeUnit("m")).toBe(1);
    expect(units.kilogramsPerCubicMetreFrom(1, "lb/ft3")).toBeCloseTo(16.018463, 6);
    expect(units.kilogramsPerCubicMetreFrom(1.2, "g/cm3")).toBe(1200);
    expect(units.kilogramsPerCubicMetreTo(units.kilogramsPerCubicMetreFrom(15, "lb/ft3"), "lb/ft3")).toBeCloseTo(15, 12);
  });
});

describe("hand-measured volumes (debris in baskets)", () => {
  it("a US gallon is 3.785411784 L and a cubic foot 28.316846592 L; a cubic metre 1000 L", () => {
    // published: NIST SP 811 appendix B (both exact)
    expect(units.litresFrom(1, "gal")).toBe(3.785411784);
    expect(units.litresFrom(1, "ft3")).toBeCloseTo(28.316846592, 9);
    expect(units.litresFrom(2.5, "m3")).toBe(2500);
    expect(units.litresFrom(7, "L")).toBe(7);
    // computed: a cubic foot is 1728 in³ and a gallon 231 in³, so 1 ft³ = 1728 / 231 gal = 7.480519… gal
    expect(units.litresTo(units.litresFrom(1, "ft3"), "gal")).toBeCloseTo(1728 / 231, 9);
  });
  it("converts there and back in every unit (invariant)", () => {
    for (const unit of units.HAND_VOLUME_UNITS) expect(units.litresTo(units.litresFrom(12.34, unit), unit)).toBeCloseTo(12.34, 9);
  });
  it("adds up in gallons on feet projects and litres on metre projects, offering the project's units first (practice)", () => {
    expect(units.handVolumeUnitFor("us-ft")).toBe("gal");
    expect(units.handVolumeUnitFor("ft")).toBe("gal");
    expect(units.handVolumeUnitFor("m")).toBe("L");
    expect(units.handVolumeUnitsFor("m").slice(0, 2)).toEqual(["L", "m3"]);
    expect([...units.handVolumeUnitsFor("us-ft")].sort()).toEqual([...units.HAND_VOLUME_UNITS].sort());
    expect(units.measureLabel("ft3")).toBe("ft³");
    expect(units.measureLabel("gal")).toBe("gal");
  });
});
