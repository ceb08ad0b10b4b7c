import { describe, expect, it } from "vitest";
import { createCellGrid } from "../grid/cell-grid";
import type { ProjectedMultiPolygon } from "../grid/work-limit";
import { nodeCells, workLimitMask } from "../grid/work-limit-mask";
import { TVU_COEFFICIENTS, allowedTvuM, tvuCoefficients, type SurveyOrder } from "../qa/tvu";
import { computePeriod } from "./period";
import { cellElevations, meanTvuSquared, removedVolumeBand, type BandSurvey } from "./period-uncertainty";
import { NO_ZONE } from "./rollup";

const rules = { tolerance: 0.1, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.1 };

/**
 * Two 20 × 20 m cells side by side on a 1 m raster; each survey's bottom given per cell, or per
 * node by a function of the node's column within the cell (0–19).
 */
function site(bottoms: Array<Array<number | ((column: number) => number)>>) {
  const limit: ProjectedMultiPolygon = [[[[0, 0], [40, 0], [40, 20], [0, 20], [0, 0]]]];
  const cellGrid = createCellGrid(limit, { cellSize: 20 });
  const rasterGrid = { originX: 0, originY: 0, spacing: 1, cols: 40, rows: 20 };
  const nodeCell = nodeCells(cellGrid, rasterGrid, workLimitMask(limit, rasterGrid));
  const surface = (perCell: Array<number | ((column: number) => number)>) =>
    Float64Array.from({ length: 800 }, (_, node) => {
      const value = perCell[Math.floor((node % 40) / 20)];
      return typeof value === "function" ? value(node % 20) : value;
    });
  const [baseline, ...later] = bottoms.map(surface);
  return { grids: { cellGrid, rasterGrid, nodeCell }, rasters: { muckTop: baseline, firm: surface([-100, -100]), progress: later } };
}

/** The period's stats and the band's inputs for it, with every survey of `order` sounded from water at 0 m. */
function period(bottoms: Parameters<typeof site>[0], from: number, to: number) {
  const { grids, rasters } = site(bottoms);
  const { stats, before, after } = computePeriod(grids, rasters, from, to, rules, 0);
  const bottomsOf = { from: cellElevations(grids.nodeCell, before, stats.count), to: cellElevations(grids.nodeCell, after, stats.count) };
  const band = (surveys: BandSurvey[]) => removedVolumeBand(stats, surveys, from, to, new Int32Array(stats.count).fill(NO_ZONE), 0, bottomsOf).project;
  return { stats, band, bottoms: bottomsOf };
}

const counts = (perCell: number[]) => Uint32Array.from(perCell);
const fromWater = (order: SurveyOrder, soundings: number[], level = 0): BandSurvey => ({ ...tvuCoefficients(order, "m"), waterSurfaceElevation: level, fallbackDepth: null, soundingsPerCell: counts(soundings), bias: 0 });
/** TVU² of IHO S-44 at depth d (m), written out from table 1's formula. */
const tvuSquared = (order: SurveyOrder, depth: number) => TVU_COEFFICIENTS[order].aM ** 2 + (TVU_COEFFICIENTS[order].b * depth) ** 2;

describe("IHO S-44 ed. 6.0.0 (2020) coefficients the band rests on", () => {
  it("are table 1's a and b per order, in metres and converted for a project in feet", () => {
    // published: IHO S-44 ed. 6.0.0 (2020), table 1 — Exclusive a 0.15 m, b 0.0075; Special a 0.25 m,
    // b 0.0075; Order 1a and 1b a 0.5 m, b 0.013; Order 2 a 1.0 m, b 0.023
    expect(tvuCoefficients("exclusive", "m")).toEqual({ a: 0.15, b: 0.0075 });
    expect(tvuCoefficients("special", "m")).toEqual({ a: 0.25, b: 0.0075 });
    expect(tvuCoefficients("1a", "m")).toEqual({ a: 0.5, b: 0.013 });
    expect(tvuCoefficients("1b", "m")).toEqual({ a: 0.5, b: 0.013 });
    expect(tvuCoefficients("2", "m")).toEqual({ a: 1.0, b: 0.023 });
    // computed: 0.5 m = 0.5 × 3937/1200 US survey ft; b is a ratio and does not change with the unit
    expect(tvuCoefficients("1a", "us-ft").a).toBeCloseTo((0.5 * 3937) / 1200, 12);
    expect(tvuCoefficients("1a", "us-ft").b).toBe(0.013);
  });
});

describe("the removed volume's band from the surveys' vertical uncertainty", () => {
  it("two cells at different depths each carry the TVU of their own depth (closed form by hand)", () => {
    // Cell A lowered from 2 m to 3 m deep, cell B from 30 m to 31 m; Special order, four soundings
    // per cell at each end, water surface at 0 m.
    const { band } = period([[-2, -30], [-3, -31]], 0, 1);
    const result = band([fromWater("special", [4, 4]), fromWater("special", [4, 4])]);
    // computed by hand: TVU² = 0.25² + (0.0075·d)²
    //   A: d = 2 → 0.0625 + 0.000225 = 0.062725;  d = 3 → 0.0625 + 0.00050625 = 0.06300625
    //   B: d = 30 → 0.0625 + 0.050625 = 0.113125; d = 31 → 0.0625 + 0.05405625 = 0.11655625
    // band = 400 m² × √((0.062725 + 0.06300625 + 0.113125 + 0.11655625) / 4) = 400 × √0.088853125 = 119.2330 m³
    expect(result.bandCubicLength).toBeCloseTo(119.233, 3);
    expect(result.bandCubicLength).toBeCloseTo(400 * Math.sqrt((tvuSquared("special", 2) + tvuSquared("special", 3) + tvuSquared("special", 30) + tvuSquared("special", 31)) / 4), 9);
    // negative control: one depth for both cells (their median, the old method) gives another figure
    const oneDepth = 400 * Math.sqrt((2 * tvuSquared("special", 16.5) + 2 * tvuSquared("special", 17.5)) / 4);
    expect(Math.abs(result.bandCubicLength - oneDepth)).toBeGreaterThan(1);
  });

  it("a sloping cell averages TVU² over its nodes: a² + b²·mean(d²), not TVU at the mean depth", () => {
    // Cell A slopes from 2 m to 21 m deep across its 20 columns before, and is 1 m deeper after; cell B untouched.
    const { band, bottoms } = period([[(column: number) => -2 - column, -5], [(column: number) => -3 - column, -5]], 0, 1);
    // computed: mean(d²) over d = 2..21 = (Σ d² for 1..21 − 1) / 20 = (3311 − 1) / 20 = 165.5; after, d = 3..22: (3795 − 5) / 20 = 189.5
    const survey = fromWater("2", [9, 0]);
    expect(meanTvuSquared(survey, bottoms.from, 0)).toBeCloseTo(1 + 0.023 ** 2 * 165.5, 12);
    expect(meanTvuSquared(survey, bottoms.to, 0)).toBeCloseTo(1 + 0.023 ** 2 * 189.5, 12);
    // computed: 400 × √((1 + 0.000529·165.5 + 1 + 0.000529·189.5) / 9)
    expect(band([survey, survey]).bandCubicLength).toBeCloseTo(400 * Math.sqrt((2 + 0.000529 * (165.5 + 189.5)) / 9), 9);
    // the untouched cell adds nothing (negative control): the changed area is cell A's alone
    expect(band([survey, survey]).changedArea).toBe(400);
  });

  it("more soundings narrow the random band as 1/√n; the area a reference bias acts on stays", () => {
    const { band } = period([[-1, -1], [-2, -1]], 0, 1);
    const withSoundings = (n: number) => band([fromWater("special", [n, 0]), fromWater("special", [n, 0])]);
    // computed: 16 soundings instead of 4 halve the band (√(4/16) = 1/2)
    expect(withSoundings(16).bandCubicLength).toBeCloseTo(withSoundings(4).bandCubicLength / 2, 9);
    expect(withSoundings(16).changedArea).toBe(withSoundings(4).changedArea);
  });

  it("a survey without a water surface takes its median depth, else a alone", () => {
    const { band } = period([[-1, -1], [-2, -1]], 0, 1);
    const median = (depth: number | null): BandSurvey => ({ ...tvuCoefficients("special", "m"), waterSurfaceElevation: null, fallbackDepth: depth, soundingsPerCell: counts([4, 4]), bias: 0 });
    // computed from S-44: Special order at d = 5 m, TVU = 0.252797 m (shared/REFERENCES.md); 400 m² × TVU × √(1/4 + 1/4)
    expect(allowedTvuM("special", 5)).toBeCloseTo(0.252797, 6);
    expect(band([median(5), median(5)]).bandCubicLength).toBeCloseTo(400 * 0.252797 * Math.SQRT1_2, 2);
    // computed: no depth at all → a = 0.25 m alone
    expect(band([median(null), median(null)]).bandCubicLength).toBeCloseTo(400 * 0.25 * Math.SQRT1_2, 12);
  });

  it("a cell the later survey did not sound rests on the newest earlier survey that did", () => {
    // Three surveys: the cell lowered from 1 m to 2 m deep at the second; the third did not sound it.
    // The period from the baseline to the third survey: its end rests on the second survey's 9 soundings (order 2).
    const { band } = period([[-1, -1], [-2, -1], [-2, -1]], 0, 2);
    const result = band([fromWater("special", [4, 4]), fromWater("2", [9, 0]), { ...fromWater("exclusive", [0, 0]), a: 100 }]);
    // computed: √(400² · TVU²_special(1)/4 + 400² · TVU²_order2(2)/9)
    expect(result.bandCubicLength).toBeCloseTo(Math.sqrt((400 ** 2 * tvuSquared("special", 1)) / 4 + (400 ** 2 * tvuSquared("2", 2)) / 9), 9);
  });
});

describe("a survey's vertical-reference bias in the removed volume's band", () => {
  // IHO S-44 ed. 6.0.0 (2020), section 2 and table 1: TVU is the uncertainty of the reduced depth
  // at 95 %; a bias of the vertical reference (water level, datum) is systematic, so it moves the
  // whole surface together and does not average down over soundings or cells.
  const noRandom = (soundings: number[], bias: number): BandSurvey => ({ a: 0, b: 0, waterSurfaceElevation: 0, fallbackDepth: null, soundingsPerCell: counts(soundings), bias });

  it("enters as area × bias per end, the two surveys' biases in quadrature (closed form by hand)", () => {
    // One 20 × 20 m cell (400 m²) lowered 1 m; the start survey's reference may be off 0.05 m, the end's 0.10 m; no random error.
    const { band } = period([[-1, -1], [-2, -1]], 0, 1);
    const result = band([noRandom([4, 4], 0.05), noRandom([4, 4], 0.1)]);
    // computed by hand: √((400 × 0.05)² + (400 × 0.10)²) = √(400 + 1600) = √2000 = 44.7214 m³
    expect(result.bandCubicLength).toBeCloseTo(44.7214, 4);
  });

  it("does not shrink with more soundings, unlike the random part", () => {
    const { band } = period([[-1, -1], [-2, -1]], 0, 1);
    const biased = (n: number) => band([{ ...fromWater("special", [n, 0]), bias: 0.1 }, { ...fromWater("special", [n, 0]), bias: 0.1 }]);
    // computed by hand: random part 400² × TVU²/n per end (TVU² = 0.25² + (0.0075·1)² = 0.06255625 at 1 m,
    // 0.25² + (0.0075·2)² = 0.062725 at 2 m); bias part (400 × 0.1)² per end = 1600 m⁶, whatever n
    const expected = (n: number) => Math.sqrt((160000 * (0.06255625 + 0.062725)) / n + 2 * 1600);
    expect(biased(4).bandCubicLength).toBeCloseTo(expected(4), 9);
    expect(biased(10000).bandCubicLength).toBeCloseTo(expected(10000), 9);
    // with ten thousand soundings the band is nearly the bias alone: 400 × 0.1 × √2 = 56.5685 m³
    expect(biased(10000).bandCubicLength).toBeCloseTo(56.5685, 1);
    // negative control: without the bias, many soundings shrink the band to almost nothing
    expect(band([fromWater("special", [10000, 0]), fromWater("special", [10000, 0])]).bandCubicLength).toBeLessThan(2);
  });

  it("adds a survey's cells before squaring: two cells on one survey count 2 × area, not √2 × area", () => {
    // Both cells lowered 1 m between the baseline and the second survey; only the baseline's reference is biased (0.1 m).
    const { band } = period([[-1, -1], [-2, -2]], 0, 1);
    const result = band([noRandom([4, 4], 0.1), noRandom([4, 4], 0)]);
    // computed by hand: (400 + 400) m² × 0.1 m = 80 m³ (per cell in quadrature it would be √2 × 40 = 56.57 m³)
    expect(result.bandCubicLength).toBeCloseTo(80, 9);
  });

  it("a cell resting on another survey at the end counts that survey's bias with its own area", () => {
    // Three surveys: both cells lowered by the second; the third sounded cell A only (lowered again).
    // Period baseline → third: A starts on the baseline and ends on the third; B starts on the baseline and ends on the second.
    const { band } = period([[-1, -1], [-2, -2], [-3, -2]], 0, 2);
    const result = band([noRandom([4, 4], 0.1), noRandom([4, 4], 0.2), noRandom([4, 0], 0.3)]);
    // computed by hand: baseline 800 m² × 0.1 = 80; second 400 × 0.2 = 80; third 400 × 0.3 = 120;
    // √(80² + 80² + 120²) = √(6400 + 6400 + 14400) = √27200 = 164.9242 m³
    expect(result.bandCubicLength).toBeCloseTo(164.9242, 4);
  });

  it("a survey whose cells are at both ends of the period cancels (it did not move them)", () => {
    // Period second → third: cell B rests on the second survey at both ends (the third did not sound it) and did not change;
    // cell A starts on the second and ends on the third.
    const { band } = period([[-1, -1], [-2, -2], [-3, -2]], 1, 2);
    const result = band([noRandom([4, 4], 5), noRandom([4, 4], 0.2), noRandom([4, 0], 0.3)]);
    // computed by hand: only A changed: √((400 × 0.2)² + (400 × 0.3)²) = √(6400 + 14400) = 144.2221 m³; the baseline's 5 m bias plays no part
    expect(result.bandCubicLength).toBeCloseTo(144.2221, 4);
  });
});
