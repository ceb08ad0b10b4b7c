import { describe, expect, it } from "vitest";
import { computeSurveyVolumes, type EngineSettings, type SurveyPoints } from "./pipeline";
import type { ProjectedMultiPolygon } from "./grid/work-limit";
import { noSurvey } from "./volumes/latest-bottom";

function planarSurvey(spacing: number, size: number, elevation: (x: number, y: number) => number, keep: (x: number, y: number) => boolean = () => true): SurveyPoints {
  const easting: number[] = [];
  const northing: number[] = [];
  const values: number[] = [];
  for (let y = 0; y <= size; y += spacing) {
    for (let x = 0; x <= size; x += spacing) {
      if (!keep(x, y)) continue;
      easting.push(x);
      northing.push(y);
      values.push(elevation(x, y));
    }
  }
  return { easting: Float64Array.from(easting), northing: Float64Array.from(northing), elevation: Float64Array.from(values) };
}

const square: ProjectedMultiPolygon = [[[[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]]]];
const settings: EngineSettings = { cellSize: 20, resolution: 0.5, maxEdge: 15, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };

describe("computeSurveyVolumes", () => {
  const firm = planarSurvey(10, 100, () => -10);
  const baseline = planarSurvey(10, 100, () => -6);

  it("stacks a partial progress survey over the baseline and reports progress", () => {
    // The progress pass covers only the western 40 units, 3 units deeper.
    const progress = planarSurvey(10, 100, () => -9, (x) => x <= 40);
    const stages: Array<[string, number]> = [];
    const result = computeSurveyVolumes({ baseline, progress: [progress], firm }, square, settings, (stage, fraction) => stages.push([stage, fraction]));
    // computed: removed = 3 × (40 × 100) = 12,000 (the strip x ≤ 40 is covered by the progress TIN)
    expect(result.totals.removedVolumeCubicLength).toBeCloseTo(12_000, 6);
    // computed: remaining = 1 × 4,000 + 4 × 6,000 = 28,000
    expect(result.totals.remainingVolumeCubicLength).toBeCloseTo(28_000, 6);
    expect(result.totals.plannedVolumeCubicLength).toBeCloseTo(40_000, 6); // computed: 4 × 10,000
    const westNode = 10 * result.rasterGrid.cols + 10;
    const eastNode = 10 * result.rasterGrid.cols + 150;
    expect([result.latestSource[westNode], result.latestSource[eastNode]]).toEqual([0, 1]); // newest survey, then the baseline
    expect(stages.map(([stage]) => stage)).toEqual(expect.arrayContaining(["triangulate", "work limit", "raster", "latest bottom", "cells"]));
    expect(stages.every(([, fraction]) => fraction >= 0 && fraction <= 1)).toBe(true);
    expect(result.latestSource.includes(noSurvey)).toBe(false);
  });

  it("says no-data where the surveys leave a gap wider than the maximum edge", () => {
    // Baseline soundings missing over x 40–80 (a 40-unit hole, longer than maxEdge 15): no surface is invented.
    const gappy = planarSurvey(10, 100, () => -6, (x) => x < 40 || x > 80);
    const result = computeSurveyVolumes({ baseline: gappy, progress: [], firm }, square, settings);
    const statuses = new Set<number>();
    for (let cell = 0; cell < result.cells.count; cell++) if (result.cells.coverage[cell] < 0.8) statuses.add(result.cells.status[cell]);
    expect([...statuses]).toEqual([0]); // code 0 is "no-data"
    // computed: the data covers x ≤ 30 and x ≥ 90 (30 + 10 wide) × 100, 4 units thick
    expect(result.totals.plannedVolumeCubicLength).toBeCloseTo(4 * 40 * 100, 6);
  });

  it("total volume does not depend on the grid's rotation or origin", () => {
    const sloping = planarSurvey(10, 100, (x, y) => -6 + 0.01 * x - 0.02 * y);
    const straight = computeSurveyVolumes({ baseline: sloping, progress: [], firm }, square, settings);
    const rotated = computeSurveyVolumes({ baseline: sloping, progress: [], firm }, square, { ...settings, rotationDegrees: 27, originX: 3, originY: -4 });
    // invariant: cells only partition the same raster nodes; the sum over all cells is the same integral.
    expect(Math.abs(rotated.totals.plannedVolumeCubicLength - straight.totals.plannedVolumeCubicLength) / straight.totals.plannedVolumeCubicLength).toBeLessThan(1e-9);
    // computed: mean thickness 4 + 0.01 · 50 − 0.02 · 50 = 3.5 over 10,000
    expect(straight.totals.plannedVolumeCubicLength).toBeCloseTo(35_000, 6);
  });

  it("rejects settings that cannot be right", () => {
    expect(() => computeSurveyVolumes({ baseline, progress: [], firm }, square, { ...settings, firmShare: 1.5 })).toThrow();
    expect(() => computeSurveyVolumes({ baseline, progress: [], firm }, square, { ...settings, resolution: 0.001 })).toThrow(/too large/);
  });
});
