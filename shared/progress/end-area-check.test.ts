import { describe, expect, it } from "vitest";
import { endAreaCheck, principalAxisLayout } from "./end-area-check";

/** A raster of `cols × rows` nodes at pixel centres, value(x, y); NaN outside `inside`. */
function raster(cols: number, rows: number, spacing: number, value: (x: number, y: number) => number) {
  const values = new Float64Array(cols * rows);
  for (let row = 0; row < rows; row++) for (let col = 0; col < cols; col++) values[row * cols + col] = value((col + 0.5) * spacing, (row + 0.5) * spacing);
  return { values, cols, rows, originX: 0, originY: 0, spacing };
}

describe("end-area check", () => {
  it("finds the long axis of a rectangle", () => {
    // computed: a 400 × 100 rectangle along x has its principal axis along x, through its centre
    const layout = principalAxisLayout([[[[0, 0], [400, 0], [400, 100], [0, 100], [0, 0]]]], 20, 1);
    expect(Math.min(layout.baselineStartX, layout.baselineEndX)).toBeCloseTo(0, 9);
    expect(Math.max(layout.baselineStartX, layout.baselineEndX)).toBeCloseTo(400, 9);
    expect(layout.baselineStartY).toBeCloseTo(50, 9);
    expect(layout.baselineEndY).toBeCloseTo(50, 9);
    expect(layout.halfWidth).toBeGreaterThanOrEqual(50);
  });

  it("a uniform 2-unit cut over a 200 × 60 block: sections and surface agree", () => {
    // computed: prism volume 200 × 60 × 2 = 24,000; the average end area is exact for a prism
    const upper = raster(200, 60, 1, () => 10);
    const lower = raster(200, 60, 1, () => 8);
    const layout = { baselineStartX: 0.5, baselineStartY: 30, baselineEndX: 199.5, baselineEndY: 30, sectionSpacing: 19.9, halfWidth: 29.5, sampleStep: 1 };
    const check = endAreaCheck(upper, lower, 24_000, layout);
    // sections span 199 × 59 between the outermost pixel centres (sampling stays on data): 2 × 199 × 59
    expect(check.endAreaVolumeCubicLength).toBeCloseTo(2 * 199 * 59, 6);
    expect(check.differencePercent).toBeCloseTo(((2 * 199 * 59 - 24_000) / 24_000) * 100, 9);
    expect(check.sections).toBe(11);
  });

  it("a cut deepening linearly along the axis: the average end area is exact for linear section areas", () => {
    // computed: t(x) = x/100 sampled between the outermost pixel centres (x 0.5–199.5, y 0.5–59.5):
    // V = 59 · ∫ x/100 dx from 0.5 to 199.5 = 59 · (199.5² − 0.5²)/200 = 59 · 199 = 11,741
    const upper = raster(200, 60, 1, (x) => x / 100);
    const lower = raster(200, 60, 1, () => 0);
    const layout = { baselineStartX: 0.5, baselineStartY: 30, baselineEndX: 199.5, baselineEndY: 30, sectionSpacing: 19.9, halfWidth: 29.5, sampleStep: 1 };
    const check = endAreaCheck(upper, lower, 12_000, layout);
    expect(check.endAreaVolumeCubicLength).toBeCloseTo(59 * 199, 6);
    expect(check.differencePercent).toBeCloseTo(((59 * 199 - 12_000) / 12_000) * 100, 9);
  });
});
