import { describe, expect, it } from "vitest";
import {
  averageEndAreaVolume,
  endAreaVolume,
  prismoidalVolume,
  prismoidalVolumeOfSections,
  sampleRaster,
  sectionArea,
  thicknessBetween,
  type SampledRaster,
} from "./end-area";
import { cubicToVolumeUnit } from "./units";

describe("handbook end-area and prismoidal examples", () => {
  it("average end area: A1 1504 ft², A2 2240 ft², L 100 ft → 6,933.33 yd³", () => {
    const volumeFt3 = averageEndAreaVolume([1504, 2240], [0, 100]);
    // computed from the formula V = L(A1 + A2)/2; method in USACE EM 1110-2-1003 (2002), ch. 15
    expect(volumeFt3).toBe((100 * (1504 + 2240)) / 2);
    expect(volumeFt3).toBe(187_200);
    expect(cubicToVolumeUnit(volumeFt3, "ft")).toBeCloseTo(6933.33, 2);
  });

  it("prismoidal: same ends, mid-area 1860 ft² → 6,903.70 yd³ (±0.5)", () => {
    const volumeFt3 = prismoidalVolume(1504, 1860, 2240, 100);
    // published: worked example in a standard handbook of engineering calculations; formula in EM 1110-2-1003 ch. 15
    expect(Math.abs(cubicToVolumeUnit(volumeFt3, "ft") - 6903.7)).toBeLessThanOrEqual(0.5);
    // computed: V = L(A1 + 4Am + A2)/6
    expect(volumeFt3).toBeCloseTo((100 * (1504 + 4 * 1860 + 2240)) / 6, 9);
  });

  it("frustum of a square pyramid (base 10×10, top 4×4, h 3): 156 exactly; end area gives 174", () => {
    const base = 10 * 10;
    const top = 4 * 4;
    const middle = 7 * 7; // the side varies linearly: 7 at mid-height
    // computed: frustum formula V = h/3 (A1 + A2 + √(A1·A2)) = 156
    const frustum = (3 / 3) * (base + top + Math.sqrt(base * top));
    expect(frustum).toBe(156);
    expect(prismoidalVolume(base, middle, top, 3)).toBeCloseTo(frustum, 12);
    // computed: end area over the whole height over-estimates: 3 (100 + 16)/2 = 174
    expect(averageEndAreaVolume([base, top], [0, 3])).toBe(174);
  });

  it("square pyramid (base 100, h 6): 200 exactly; end area gives 300", () => {
    // computed; Deakin & Hunter (2009) The Prismoidal Correction Revisited: end area over-estimates pyramids
    expect(averageEndAreaVolume([100, 0], [0, 6])).toBe(300);
    expect(prismoidalVolume(100, 25, 0, 6)).toBe(200);
    expect((100 * 6) / 3).toBe(200); // computed: V = A·h/3
  });
});

describe("sections sampled across a thickness field", () => {
  // A ridge whose section at station x is a triangle of height h(x) and half-width h(x):
  // area h(x)², with h falling linearly from 10 to 0 over 6 — a pyramid of base area 100, height 6.
  const ridgeHeight = (x: number) => 10 * (1 - x / 6);
  const ridge = (x: number, y: number) => Math.max(0, ridgeHeight(x) - Math.abs(y));
  const layout = { baselineStartX: 0, baselineStartY: 0, baselineEndX: 6, baselineEndY: 0, halfWidth: 12, sampleStep: 0.01 };

  it("gives the pyramid's 300 by end area over one interval and 200 by prismoidal with a middle section", () => {
    // computed; Deakin & Hunter (2009): end area 300 vs exact 200 for a pyramid
    const coarse = endAreaVolume(ridge, { ...layout, sectionSpacing: 6 });
    expect(coarse.areas[0]).toBeCloseTo(100, 6);
    expect(coarse.averageEndAreaVolume).toBeCloseTo(300, 6);
    expect(coarse.prismoidalVolume).toBeNull();
    const withMiddle = endAreaVolume(ridge, { ...layout, sectionSpacing: 3 });
    expect(withMiddle.stations).toEqual(Float64Array.from([0, 3, 6]));
    expect(withMiddle.prismoidalVolume).toBeCloseTo(200, 6);
    // computed: 3(100 + 25)/2 + 3(25 + 0)/2 = 225
    expect(withMiddle.averageEndAreaVolume).toBeCloseTo(225, 6);
  });

  it("converges to the exact volume as the sections close up", () => {
    // computed: the trapezoid rule over-estimates by L·s²·A''/12; with A = (100/36)(6 − x)²,
    // A'' = 200/36, so at s = 0.1 the excess is 6 × 0.01 × (200/36)/12 = 0.02778
    const fine = endAreaVolume(ridge, { ...layout, sectionSpacing: 0.1 });
    expect(fine.averageEndAreaVolume - 200).toBeCloseTo((6 * 0.01 * (200 / 36)) / 12, 3);
  });

  it("works along a rotated baseline", () => {
    // computed invariant: rotating the solid and the baseline together leaves the volume unchanged
    const angle = (35 * Math.PI) / 180;
    const rotated = (x: number, y: number) =>
      ridge(x * Math.cos(angle) + y * Math.sin(angle), -x * Math.sin(angle) + y * Math.cos(angle));
    const result = endAreaVolume(rotated, {
      ...layout,
      baselineEndX: 6 * Math.cos(angle),
      baselineEndY: 6 * Math.sin(angle),
      sectionSpacing: 3,
    });
    expect(result.prismoidalVolume).toBeCloseTo(200, 4);
  });

  it("counts no-data samples as zero thickness and reports their share", () => {
    const section = sectionArea((x) => (x < 5 ? Number.NaN : 1), 0, 0, 10, 0, 1);
    expect(section.noDataSamples).toBe(5);
    // computed: trapezoid of 0,0,0,0,0,1,1,1,1,1,1 at unit steps = 0.5 + 4 + 0.5 + ... = 5.5
    expect(section.area).toBeCloseTo(5.5, 12);
  });
});

describe("sections across a raster pair", () => {
  function planeRaster(valueAt: (x: number, y: number) => number): SampledRaster {
    const cols = 51;
    const rows = 21;
    const values = new Float64Array(cols * rows);
    for (let row = 0; row < rows; row++) for (let col = 0; col < cols; col++) values[row * cols + col] = valueAt((col + 0.5) * 2, (row + 0.5) * 2);
    return { values, cols, rows, originX: 0, originY: 0, spacing: 2 };
  }
  const before = planeRaster(() => 10);
  const after = planeRaster((x) => 10 - (1 + 0.01 * x));

  it("reproduces planes by bilinear sampling", () => {
    // computed: bilinear interpolation is exact for a plane, also in the outer half pixel
    expect(sampleRaster(after, 33.3, 17.1)).toBeCloseTo(10 - (1 + 0.333), 12);
    expect(sampleRaster(after, 0.2, 41.9)).toBeCloseTo(10 - (1 + 0.002), 12);
    expect(Number.isNaN(sampleRaster(after, -0.1, 5))).toBe(true);
    expect(Number.isNaN(sampleRaster(after, 5, 42.1))).toBe(true);
  });

  it("gives the exact volume of a linearly thickening cut", () => {
    // computed: thickness 1 + 0.01x over 0 ≤ x ≤ 100, 0 ≤ y ≤ 40: V = 40 ∫(1 + 0.01x)dx = 6000;
    // the section area is linear in x, so the average end area is exact at any spacing
    const result = endAreaVolume(thicknessBetween(before, after), {
      baselineStartX: 0,
      baselineStartY: 20,
      baselineEndX: 100,
      baselineEndY: 20,
      sectionSpacing: 25,
      halfWidth: 20,
      sampleStep: 0.5,
    });
    expect(result.averageEndAreaVolume).toBeCloseTo(6000, 6);
    expect(result.prismoidalVolume).toBeCloseTo(6000, 6);
    expect(result.noDataShare).toBe(0);
  });

  it("rejects a degenerate layout", () => {
    expect(() => averageEndAreaVolume([1, 2], [0, 0])).toThrow(/increase/);
    expect(() => prismoidalVolumeOfSections([1, 2], 1)).toThrow(/odd/);
  });
});
