import { describe, expect, it } from "vitest";
import { convertLength } from "../units";
import { crossingDifferences, linesByHeading } from "./crossings";
import { cellIndexOf, soundingDensity, sparseCells } from "./density";
import { isInsidePreparedWorkLimit, prepareWorkLimit, soundingsOutsideWorkLimit } from "./outside";
import { buildPointGrid, forEachWithin } from "./point-grid";
import { findSpikes } from "./spikes";
import { allowedTvuM } from "./tvu";

/** Seeded generator (mulberry32) so the synthetic surveys are the same on every run. */
function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe("point grid index", () => {
  it("finds exactly the points a brute-force search finds", () => {
    // computed invariant: the index must agree with checking every point
    const random = seeded(7);
    const n = 2000;
    const xs = new Float64Array(n).map(() => 500_000 + random() * 300);
    const ys = new Float64Array(n).map(() => 3_200_000 + random() * 200);
    const grid = buildPointGrid(xs, ys, 5);
    for (const probe of [0, 17, 999, 1999]) {
      const found: number[] = [];
      forEachWithin(grid, xs[probe], ys[probe], 7.5, (j) => found.push(j));
      const expected: number[] = [];
      for (let j = 0; j < n; j++) if (Math.hypot(xs[j] - xs[probe], ys[j] - ys[probe]) <= 7.5) expected.push(j);
      expect(found.sort((a, b) => a - b)).toEqual(expected);
    }
  });
});

describe("spikes", () => {
  it("flags the planted spikes and nothing else on a smooth bottom", () => {
    // computed: a sloping bottom with ±0.05 noise; three soundings raised or dropped by 2
    const random = seeded(11);
    const xs: number[] = [];
    const ys: number[] = [];
    const depths: number[] = [];
    for (let row = 0; row < 40; row++) for (let col = 0; col < 40; col++) {
      xs.push(col * 2 + random() * 0.5);
      ys.push(row * 2 + random() * 0.5);
      depths.push(6 + 0.02 * col + (random() - 0.5) * 0.1);
    }
    const planted = [105, 777, 1234];
    depths[105] += 2;
    depths[777] -= 2;
    depths[1234] += 2.5;
    const result = findSpikes(Float64Array.from(xs), Float64Array.from(ys), Float64Array.from(depths), { radius: 4.5, threshold: 0.5 });
    expect(Array.from(result.indices)).toEqual(planted);
    expect(result.differences[0]).toBeCloseTo(2, 0);
    expect(result.differences[1]).toBeCloseTo(-2, 0);
  });

  it("does not judge a lone sounding", () => {
    const result = findSpikes(new Float64Array([0, 100]), new Float64Array([0, 0]), new Float64Array([1, 9]), { radius: 5, threshold: 0.1 });
    expect(result.indices.length).toBe(0);
    expect(result.unjudged).toBe(2);
  });
});

describe("outside the work limit", () => {
  // a square basin 100 × 100 with a square island 20 × 20 (a hole), plus a separate 10 × 10 cove
  const limit = prepareWorkLimit([
    [
      [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]],
      [[40, 40], [40, 60], [60, 60], [60, 40], [40, 40]],
    ],
    [[[200, 0], [210, 0], [210, 10], [200, 10], [200, 0]]],
  ]);

  it("tells inside, hole and second polygon apart", () => {
    expect(isInsidePreparedWorkLimit(limit, 10, 10)).toBe(true);
    expect(isInsidePreparedWorkLimit(limit, 50, 50)).toBe(false); // on the island
    expect(isInsidePreparedWorkLimit(limit, 205, 5)).toBe(true);
    expect(isInsidePreparedWorkLimit(limit, 150, 5)).toBe(false);
    expect(isInsidePreparedWorkLimit(limit, -1, 50)).toBe(false);
  });

  it("agrees with the closed-form area share for random soundings", () => {
    // computed: inside share = (100² − 20² + 10²) / (220 × 100) over the box [−10, 210] × [0, 100]
    const random = seeded(3);
    const n = 200_000;
    const xs = new Float64Array(n).map(() => -10 + random() * 220);
    const ys = new Float64Array(n).map(() => random() * 100);
    const outside = soundingsOutsideWorkLimit(xs, ys, limit);
    const insideShare = 1 - outside.length / n;
    // 4 binomial standard deviations of a share near 0.44 over 200,000 draws ≈ 0.0044
    expect(Math.abs(insideShare - (10_000 - 400 + 100) / 22_000)).toBeLessThan(0.0045);
    for (const index of outside.subarray(0, 200)) {
      const x = xs[index], y = ys[index];
      const inBasin = x > 0 && x < 100 && y > 0 && y < 100 && !(x > 40 && x < 60 && y > 40 && y < 60);
      const inCove = x > 200 && x < 210 && y > 0 && y < 10;
      expect(inBasin || inCove).toBe(false);
    }
  });

  it("accepts a single Polygon's coordinates", () => {
    const triangle = prepareWorkLimit([[[0, 0], [10, 0], [0, 10], [0, 0]]]);
    expect(isInsidePreparedWorkLimit(triangle, 2, 2)).toBe(true);
    expect(isInsidePreparedWorkLimit(triangle, 6, 6)).toBe(false);
  });
});

describe("sounding density per cell", () => {
  it("counts soundings in an unrotated grid", () => {
    const grid = { originX: 1000, originY: 2000, cellSize: 20, cols: 3, rows: 2, rotationDegrees: 0 };
    const xs = new Float64Array([1005, 1015, 1025, 1059, 1005, 990]);
    const ys = new Float64Array([2005, 2019, 2005, 2039, 2025, 2005]);
    const result = soundingDensity(xs, ys, grid);
    expect(Array.from(result.counts)).toEqual([2, 1, 0, 1, 0, 1]);
    expect(result.outsideGrid).toBe(1);
    expect(result.perArea[0]).toBe(2 / 400);
    expect(Array.from(sparseCells(result.counts, 1))).toEqual([2, 4]);
  });

  it("turns the grid counter-clockwise about its origin", () => {
    // computed: with the grid turned 90°, columns run north and rows run west of the origin
    const grid = { originX: 0, originY: 0, cellSize: 10, cols: 4, rows: 3, rotationDegrees: 90 };
    expect(cellIndexOf(grid, -5, 35)).toBe(0 * 4 + 3); // row 0, col 3
    expect(cellIndexOf(grid, -25, 5)).toBe(2 * 4 + 0); // row 2, col 0
    expect(cellIndexOf(grid, 5, 5)).toBe(-1);
    // a grid that starts one column and one row before its origin, named as the cell grid names it
    const widened = { originX: 0, originY: 0, cellSize: 10, cols: 5, rows: 4, rotationDegrees: 90, firstCol: -1, firstRow: -1 };
    expect(cellIndexOf(widened, -5, 35)).toBe(1 * 5 + 4);
    expect(cellIndexOf(widened, 5, -5)).toBe(0);
    // computed invariant: a point at the centre of every cell, placed by the forward rotation, lands in it
    const rotated = { ...grid, rotationDegrees: 27.5 };
    const angle = (27.5 * Math.PI) / 180;
    for (let row = 0; row < 3; row++) for (let col = 0; col < 4; col++) {
      const along = (col + 0.5) * 10, across = (row + 0.5) * 10;
      const x = along * Math.cos(angle) - across * Math.sin(angle);
      const y = along * Math.sin(angle) + across * Math.cos(angle);
      expect(cellIndexOf(rotated, x, y)).toBe(row * 4 + col);
    }
  });
});

describe("crossing lines", () => {
  // Five main lines running east and one check line running north across them, in metres.
  function survey(checkOffset: number) {
    const xs: number[] = [], ys: number[] = [], depths: number[] = [], lines: number[] = [];
    for (let line = 0; line < 5; line++) for (let k = 0; k <= 100; k++) {
      xs.push(k); ys.push(line * 20); depths.push(4 + 0.01 * k); lines.push(line);
    }
    for (let k = 0; k <= 100; k++) {
      xs.push(50.3); ys.push(k); depths.push(4 + 0.01 * 50.3 + checkOffset); lines.push(99);
    }
    return { xs: Float64Array.from(xs), ys: Float64Array.from(ys), depths: Float64Array.from(depths), lines: Uint32Array.from(lines) };
  }

  it("compares check-line soundings with the main lines they cross", () => {
    const { xs, ys, depths, lines } = survey(0.1);
    const result = crossingDifferences(xs, ys, depths, lines, { radius: 0.5, order: "special", unit: "m", isCheckLine: (id) => id === 99 });
    // computed: five crossings, one check sounding each; main sounding at x = 50 is 0.003 m shallower
    expect(result.first.length).toBe(5);
    for (const difference of result.differences) expect(difference).toBeCloseTo(0.1 + 0.003, 9);
    expect(result.withinAllowanceShare).toBe(1);
    // computed from S-44: Special-order allowance at the pair's mean depth (4.603 + 4.5)/2 m
    expect(result.allowances[0]).toBeCloseTo(allowedTvuM("special", (4.603 + 4.5) / 2), 9);
  });

  it("reports the share outside the allowance when the check line disagrees", () => {
    const { xs, ys, depths, lines } = survey(0.4);
    const result = crossingDifferences(xs, ys, depths, lines, { radius: 0.5, order: "special", unit: "m", isCheckLine: (id) => id === 99 });
    // computed: 0.403 m exceeds the Special-order allowance of about 0.2522 m
    expect(result.withinAllowanceShare).toBe(0);
    expect(result.rmsDifference).toBeCloseTo(0.403, 9);
  });

  it("pairs each crossing once without check lines and works in feet", () => {
    const { xs, ys, depths, lines } = survey(0.1);
    const depthsFt = depths.map((d) => convertLength(d, "m", "us-ft"));
    const result = crossingDifferences(xs, ys, depthsFt, lines, { radius: 0.5, order: "special", unit: "us-ft" });
    expect(result.first.length).toBe(5);
    expect(Math.abs(result.differences[0])).toBeCloseTo(convertLength(0.103, "m", "us-ft"), 6);
  });

  it("pairs agree with a brute-force search: each sounding's nearest on another line, each pair once, in order", () => {
    // computed invariant: the indexed search must give what checking every pair gives
    const random = seeded(11);
    const n = 1500;
    const xs = new Float64Array(n).map(() => random() * 40);
    const ys = new Float64Array(n).map(() => random() * 40);
    // Rounded positions make ties and exact mirrors common; a few depths are missing.
    for (let i = 0; i < n; i++) { xs[i] = Math.round(xs[i] * 4) / 4; ys[i] = Math.round(ys[i] * 4) / 4; }
    const depths = new Float64Array(n).map((_, i) => (i % 97 === 0 ? Number.NaN : 3 + random()));
    const lines = new Uint32Array(n).map(() => Math.floor(random() * 6));
    const radius = 0.8;
    const nearest = new Int32Array(n).fill(-1);
    for (let i = 0; i < n; i++) {
      if (Number.isNaN(depths[i])) continue;
      let best = Infinity;
      for (let j = 0; j < n; j++) {
        if (lines[j] === lines[i] || Number.isNaN(depths[j])) continue;
        const d = (xs[j] - xs[i]) ** 2 + (ys[j] - ys[i]) ** 2;
        if (d <= radius * radius && (d < best || (d === best && j < nearest[i]))) { best = d; nearest[i] = j; }
      }
    }
    const pairs: Array<[number, number]> = [];
    const seen = new Set<string>();
    for (let i = 0; i < n; i++) {
      if (nearest[i] < 0) continue;
      const key = `${Math.min(i, nearest[i])}-${Math.max(i, nearest[i])}`;
      if (!seen.has(key)) { seen.add(key); pairs.push([i, nearest[i]]); }
    }
    const result = crossingDifferences(xs, ys, depths, lines, { radius, order: "1a", unit: "m" });
    expect(pairs.length).toBeGreaterThan(300);
    expect(pairs.length).toBeLessThan(nearest.filter((j) => j >= 0).length); // mirrors were dropped
    expect(Array.from(result.first)).toEqual(pairs.map(([a]) => a));
    expect(Array.from(result.second)).toEqual(pairs.map(([, b]) => b));
    expect(Array.from(result.differences)).toEqual(pairs.map(([a, b]) => depths[a] - depths[b]));
  });

  it("finds the lines from the heading when the file has no line column", () => {
    // a lawnmower pattern: east along y = 0, a sharp turn, west along y = 10, then a jump; the
    // short turn leg (15,0)→(15,10) ends at a sounding of its own line
    const xs = new Float64Array([0, 5, 10, 15, 15, 10, 5, 0, 100, 105]);
    const ys = new Float64Array([0, 0, 0, 0, 10, 10, 10, 10, 50, 50]);
    const lines = linesByHeading(xs, ys, { maxGap: 12 });
    expect(Array.from(lines)).toEqual([0, 0, 0, 0, 1, 2, 2, 2, 3, 3]);
  });
});
