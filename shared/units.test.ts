import { describe, expect, it } from "vitest";
import {
  CUBIC_METRES_PER_CUBIC_YARD,
  LITRES_PER_US_GALLON,
  METRES_PER_UNIT,
  SQUARE_METRES_PER_ACRE,
  acresFromArea,
  areaFromAcres,
  convertArea,
  convertLength,
  cubicMetresToCubicYards,
  cubicToVolumeUnit,
  cubicYardsToCubicMetres,
  defaultsFor,
  lengthUnitSchema,
  litresToUsGallons,
  squareFeetToSquareMetres,
  squareMetresToSquareFeet,
  unitLabel,
  usGallonsToLitres,
  volumeToCubicMetres,
  volumeUnitFor,
} from "./units";

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

describe("NIST area and volume definitions", () => {
  it("cubic yard is 0.9144³ = 0.764554857984 m³ and 27 ft³", () => {
    // published: NIST SP 811
    expect(CUBIC_METRES_PER_CUBIC_YARD).toBeCloseTo(0.764554857984, 15);
    expect(cubicYardsToCubicMetres(1)).toBeCloseTo(0.764554857984, 15);
    expect(cubicMetresToCubicYards(0.764554857984)).toBeCloseTo(1, 14);
    // computed: 27 ft³ (international foot) in m³ equals one cubic yard
    expect(27 * 0.3048 ** 3).toBeCloseTo(CUBIC_METRES_PER_CUBIC_YARD, 15);
  });
  it("US gallon is 231 in³ = 3.785411784 L", () => {
    // published: NIST SP 811
    expect(LITRES_PER_US_GALLON).toBe(3.785411784);
    // computed: 231 in³ × (2.54 cm)³ = 3785.411784 cm³
    expect(usGallonsToLitres(1)).toBeCloseTo((231 * 2.54 ** 3) / 1000, 12);
    expect(litresToUsGallons(3.785411784)).toBeCloseTo(1, 14);
  });
  it("acre is 43,560 ft² = 4,046.8564224 m²", () => {
    // computed from NIST definitions: 43,560 × 0.3048²
    expect(SQUARE_METRES_PER_ACRE).toBeCloseTo(4046.8564224, 9);
    expect(squareFeetToSquareMetres(43_560)).toBeCloseTo(4046.8564224, 9);
    expect(squareMetresToSquareFeet(4046.8564224)).toBeCloseTo(43_560, 8);
    expect(acresFromArea(43_560, "ft")).toBeCloseTo(1, 12);
    expect(acresFromArea(4046.8564224, "m")).toBeCloseTo(1, 12);
    expect(areaFromAcres(2, "ft")).toBeCloseTo(87_120, 8);
    // computed: a survey-foot acre of 43,560 ftUS² is 4 ppm larger than the international one
    expect(acresFromArea(43_560, "us-ft") - 1).toBeCloseTo(4.000012e-6, 10);
  });
  it("converts areas with the square of the length ratio", () => {
    // computed: 1 m² = 1/0.3048² ft² = 10.7639104 ft²
    expect(convertArea(1, "m", "ft")).toBeCloseTo(10.7639104, 6);
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
  it("a survey-foot cubic yard is 6 ppm larger in m³", () => {
    // computed: (3 × 1200/3937)³ / 0.9144³ − 1 ≈ 3/499,999 ≈ 6.000012e-6
    expect(volumeToCubicMetres(1, "us-ft") / CUBIC_METRES_PER_CUBIC_YARD - 1).toBeCloseTo(6e-6, 9);
    expect(volumeToCubicMetres(1, "ft")).toBeCloseTo(CUBIC_METRES_PER_CUBIC_YARD, 15);
    expect(volumeToCubicMetres(3, "m")).toBe(3);
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
  });
  it("validates a unit at the boundary", () => {
    expect(lengthUnitSchema.parse("us-ft")).toBe("us-ft");
    expect(lengthUnitSchema.safeParse("yards").success).toBe(false);
  });
});
