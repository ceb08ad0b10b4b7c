import { describe, expect, it } from "vitest";
import { computeSurveyVolumes, type EngineSettings, type SurveyPoints } from "../pipeline";
import type { ProjectedMultiPolygon } from "../grid/work-limit";

/**
 * Closed-form solids pushed through the real path: soundings → Delaunay TIN → raster (midpoint
 * rule) → cell integrals. Sources per assertion, from shared/REFERENCES.md.
 *
 * Tolerances: the TIN reproduces a solid's facets exactly when its vertices are soundings, so the
 * only error left is the raster's. The midpoint rule is exact on a pixel where the surface is one
 * plane; a pixel that straddles a ridge or a kink of max(·, 0) is off by at most slope × spacing ×
 * pixel area, and there are about (ridge length ÷ spacing) such pixels, so the error is O(spacing²)
 * per unit ridge length. Each test states the bound it uses.
 */

function points(list: Array<[number, number, number]>, shift = { x: 0, y: 0 }, scale = 1): SurveyPoints {
  return {
    easting: Float64Array.from(list, ([x]) => x * scale + shift.x),
    northing: Float64Array.from(list, ([, y]) => y * scale + shift.y),
    elevation: Float64Array.from(list, ([, , z]) => z * scale),
  };
}

function square(minX: number, minY: number, maxX: number, maxY: number): ProjectedMultiPolygon {
  return [[[[minX, minY], [maxX, minY], [maxX, maxY], [minX, maxY], [minX, minY]]]];
}

function settings(resolution: number, cellSize: number, extra: Partial<EngineSettings> = {}): EngineSettings {
  return {
    cellSize,
    resolution,
    maxEdge: 1e9,
    tolerance: 0.01,
    firmShare: 0.95,
    minCoverage: 0.5,
    surveyNoise: 0.01,
    originX: 0,
    originY: 0,
    ...extra,
  };
}

/** Planned volume (muck top over firm) through the whole engine. */
function plannedVolume(top: SurveyPoints, firm: SurveyPoints, limit: ProjectedMultiPolygon, engineSettings: EngineSettings) {
  return computeSurveyVolumes({ baseline: top, progress: [], firm }, limit, engineSettings).totals.plannedVolumeCubicLength;
}

const flatCorners = (minX: number, minY: number, maxX: number, maxY: number, z: number): Array<[number, number, number]> => [
  [minX, minY, z], [maxX, minY, z], [maxX, maxY, z], [minX, maxY, z],
];

describe("closed-form solids through triangulate → raster → cells", () => {
  it("square pyramid, base area 100, height 6", () => {
    const top = points([...flatCorners(0, 0, 10, 10, 0), [5, 5, 6]]);
    const firm = points(flatCorners(0, 0, 10, 10, 0));
    const spacing = 0.02;
    const volume = plannedVolume(top, firm, square(0, 0, 10, 10), settings(spacing, 5));
    const exact = (100 * 6) / 3; // computed: V = A·h/3 = 200 (Deakin & Hunter 2009; end-area would give 300)
    // Four ridges of 7.07 each, slope ≤ 1.7: bound 4 · 7.07 · 1.7 · spacing² ≈ 0.02 at spacing 0.02.
    expect(Math.abs(volume - exact)).toBeLessThan(4 * Math.hypot(5, 5) * 1.7 * spacing ** 2);
    expect(Math.abs(volume - 300)).toBeGreaterThan(50); // computed: not the end-area over-estimate
  });

  it("square pyramid sampled densely (the TIN only approximates the ridges)", () => {
    // A jittered 101 × 101 lattice over the base, heights from the closed form; corners and apex included.
    let seed = 12345;
    const random = () => ((seed = Math.imul(seed, 1664525) + 1013904223) >>> 0) / 2 ** 32;
    const height = (x: number, y: number) => 6 * (1 - Math.max(Math.abs(x - 5), Math.abs(y - 5)) / 5);
    const sampled: Array<[number, number, number]> = [[5, 5, 6], ...flatCorners(0, 0, 10, 10, 0)];
    for (let row = 0; row <= 100; row++) {
      for (let col = 0; col <= 100; col++) {
        const onEdge = row === 0 || row === 100 || col === 0 || col === 100;
        const x = onEdge ? col / 10 : (col + (random() - 0.5) * 0.6) / 10;
        const y = onEdge ? row / 10 : (row + (random() - 0.5) * 0.6) / 10;
        sampled.push([x, y, height(x, y)]);
      }
    }
    const volume = plannedVolume(points(sampled), points(flatCorners(0, 0, 10, 10, 0)), square(0, 0, 10, 10), settings(0.05, 5));
    // computed: 200 (V = A·h/3). Triangles that cut across a ridge lose up to slope × (sample spacing 0.1)
    // over a strip one sample wide: 4 · 7.07 · 0.1 · 1.7 · 0.1 / 2 ≈ 0.25, so 0.5 % is a fair bound.
    expect(Math.abs(volume - 200) / 200).toBeLessThan(0.005);
  });

  it("frustum of a square pyramid, base 10 × 10, top 4 × 4, height 3", () => {
    const top = points([...flatCorners(0, 0, 10, 10, 0), ...flatCorners(3, 3, 7, 7, 3)]);
    const firm = points(flatCorners(0, 0, 10, 10, 0));
    const spacing = 0.02;
    const volume = plannedVolume(top, firm, square(0, 0, 10, 10), settings(spacing, 5));
    const [bottomArea, topArea, height] = [100, 16, 3];
    const exact = (height / 3) * (bottomArea + topArea + Math.sqrt(bottomArea * topArea)); // computed: frustum formula = 156
    expect(exact).toBeCloseTo(156, 12);
    // Ridges: 4 corner edges (4.24 each) + the top square's edge (16), slope ≤ 1: 32.97 · spacing².
    expect(Math.abs(volume - exact)).toBeLessThan((4 * Math.hypot(3, 3) + 16) * spacing ** 2);
    expect(Math.abs(volume - 174)).toBeGreaterThan(10); // computed: 174 is the end-area answer, not ours
  });

  it("prism between two planar triangles, plan area 50, thicknesses 1, 2, 3", () => {
    // Plan triangle with legs 12.5 and 8 along the axes (area 50); the hypotenuse is not at 45°, so
    // pixel centres fall at every phase along it and the staircase error averages out.
    const corners: Array<[number, number]> = [[0, 0], [12.5, 0], [0, 8]];
    const thickness = [1, 2, 3];
    const firmElevation = (x: number, y: number) => -4 + 0.1 * x - 0.05 * y; // a sloping firm-sand plane
    const firm = points(corners.map(([x, y]) => [x, y, firmElevation(x, y)]));
    const top = points(corners.map(([x, y], index) => [x, y, firmElevation(x, y) + thickness[index]]));
    const limit: ProjectedMultiPolygon = [[[...corners, corners[0]]]];
    const spacing = 0.01;
    const volume = plannedVolume(top, firm, limit, settings(spacing, 5));
    const exact = (50 * (1 + 2 + 3)) / 3; // computed: A·(h1+h2+h3)/3 = 100, the exact TIN-to-TIN prism
    // Pixels cut by the hypotenuse (length 14.84): each is in or out whole, error ≤ ½ pixel × thickness ≤ 3;
    // with the phase varying these cancel to well under the one-sided bound 14.84/spacing · spacing²/2 · 3 = 0.22.
    expect(Math.abs(volume - exact)).toBeLessThan(0.25 * 0.1);
  });

  it("a planar surface pair over whole cells is integrated exactly (1e-9 relative)", () => {
    const muck = (x: number, y: number) => 2.5 + 0.03 * x - 0.02 * y;
    const sand = (x: number, y: number) => -1 + 0.01 * x + 0.015 * y;
    const corners: Array<[number, number]> = [[0, 0], [40, 0], [40, 40], [0, 40]];
    const top = points(corners.map(([x, y]) => [x, y, muck(x, y)]));
    const firm = points(corners.map(([x, y]) => [x, y, sand(x, y)]));
    const result = computeSurveyVolumes({ baseline: top, progress: [], firm }, square(0, 0, 40, 40), settings(0.5, 20));
    // computed: the thickness is linear, so each 20 × 20 cell holds area × thickness at the cell centre.
    for (let cell = 0; cell < result.cells.count; cell++) {
      const col = cell % result.cellGrid.cols;
      const row = Math.floor(cell / result.cellGrid.cols);
      const [cx, cy] = [col * 20 + 10, row * 20 + 10];
      const exact = 400 * (muck(cx, cy) - sand(cx, cy));
      expect(Math.abs(result.cells.plannedVolumeCubicLength[cell] - exact) / exact).toBeLessThan(1e-9);
    }
    expect(result.cells.count).toBe(4); // computed: 40 × 40 limit in 20-unit cells
  });

  it("volumes do not change when coordinates are offset by 1e6 or the solid is scaled", () => {
    const pyramid: Array<[number, number, number]> = [...flatCorners(0, 0, 10, 10, 0), [5, 5, 6]];
    const base = plannedVolume(points(pyramid), points(flatCorners(0, 0, 10, 10, 0)), square(0, 0, 10, 10), settings(0.05, 5));
    const shift = { x: 1e6, y: 2e6 };
    const shifted = plannedVolume(
      points(pyramid, shift),
      points(flatCorners(0, 0, 10, 10, 0), shift),
      square(shift.x, shift.y, shift.x + 10, shift.y + 10),
      settings(0.05, 5, { originX: shift.x, originY: shift.y }),
    );
    // invariant: translation changes nothing but rounding (offsets are removed before the arithmetic).
    expect(Math.abs(shifted - base) / base).toBeLessThan(1e-9);
    const scale = 1000;
    const scaled = plannedVolume(
      points(pyramid, { x: 0, y: 0 }, scale),
      points(flatCorners(0, 0, 10, 10, 0), { x: 0, y: 0 }, scale),
      square(0, 0, 10 * scale, 10 * scale),
      settings(0.05 * scale, 5 * scale),
    );
    // invariant: scaling every length by k scales volume by k³ exactly (same pixels, same triangles).
    expect(Math.abs(scaled / scale ** 3 - base) / base).toBeLessThan(1e-9);
  });
});
