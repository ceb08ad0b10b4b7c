import { describe, expect, it } from "vitest";
import { createCellGrid } from "../grid/cell-grid";
import type { ProjectedMultiPolygon } from "../grid/work-limit";
import { nodeCells, workLimitMask } from "../grid/work-limit-mask";
import { allowedTvu } from "../qa/tvu";
import { computePeriodCells } from "./period";
import { removedVolumeBand } from "./period-uncertainty";
import { NO_ZONE } from "./rollup";

const rules = { tolerance: 0.1, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.1 };

/** Two 20 × 20 m cells side by side on a 1 m raster; the bottom of each survey set per cell. */
function site(bottoms: number[][]) {
  const limit: ProjectedMultiPolygon = [[[[0, 0], [40, 0], [40, 20], [0, 20], [0, 0]]]];
  const cellGrid = createCellGrid(limit, { cellSize: 20 });
  const rasterGrid = { originX: 0, originY: 0, spacing: 1, cols: 40, rows: 20 };
  const nodeCell = nodeCells(cellGrid, rasterGrid, workLimitMask(limit, rasterGrid));
  const surface = (perCell: number[]) => Float64Array.from({ length: 800 }, (_, node) => perCell[Math.floor((node % 40) / 20)]);
  const [baseline, ...later] = bottoms.map(surface);
  return { grids: { cellGrid, rasterGrid, nodeCell }, rasters: { muckTop: baseline, firm: surface([-10, -10]), progress: later } };
}

const counts = (perCell: number[]) => Uint32Array.from(perCell);
const noZones = (count: number) => new Int32Array(count).fill(NO_ZONE);

describe("the removed volume's band from the surveys' vertical uncertainty", () => {
  // computed from IHO S-44 ed. 6.0.0 table 1: Special order at d = 5 m, TVU = 0.252797 m (95 %)
  const tvu = allowedTvu("special", 5, "m");

  it("one cell dredged between two surveys of four soundings each: area × TVU × √(1/4 + 1/4)", () => {
    expect(tvu).toBeCloseTo(0.252797, 6); // computed from S-44 (shared/REFERENCES.md)
    const { grids, rasters } = site([[-1, -1], [-2, -1]]); // the first cell lowered 1 m, the second untouched
    const stats = computePeriodCells(grids, rasters, 0, 1, rules, 0);
    const surveys = [{ tvu, soundingsPerCell: counts([4, 4]) }, { tvu, soundingsPerCell: counts([4, 0]) }];
    const band = removedVolumeBand(stats, surveys, 0, 1, noZones(stats.count), 0).project;
    // computed: 400 m² × 0.252797 m × √0.5 = 71.50 m³; the untouched cell adds nothing (negative control)
    expect(band.bandCubicLength).toBeCloseTo(400 * 0.252797 * Math.SQRT1_2, 2);
    expect(band.changedArea).toBe(400);
  });

  it("more soundings narrow the random band as 1/√n; the area a reference bias acts on stays", () => {
    const { grids, rasters } = site([[-1, -1], [-2, -1]]);
    const stats = computePeriodCells(grids, rasters, 0, 1, rules, 0);
    const band = (soundings: number) =>
      removedVolumeBand(stats, [{ tvu, soundingsPerCell: counts([soundings, 0]) }, { tvu, soundingsPerCell: counts([soundings, 0]) }], 0, 1, noZones(stats.count), 0).project;
    // computed: 16 soundings instead of 4 halve the band (√(4/16) = 1/2)
    expect(band(16).bandCubicLength).toBeCloseTo(band(4).bandCubicLength / 2, 9);
    expect(band(16).changedArea).toBe(band(4).changedArea);
  });

  it("a cell the later survey did not sound rests on the newest earlier survey that did", () => {
    // Three surveys: the cell lowered at the second; the third did not sound it. The period from the
    // baseline to the third survey: its end rests on the second survey's 9 soundings.
    const { grids, rasters } = site([[-1, -1], [-2, -1], [-2, -1]]);
    const stats = computePeriodCells(grids, rasters, 0, 2, rules, 0);
    const surveys = [
      { tvu, soundingsPerCell: counts([4, 4]) },
      { tvu: 2 * tvu, soundingsPerCell: counts([9, 0]) },
      { tvu: 100, soundingsPerCell: counts([0, 0]) },
    ];
    const band = removedVolumeBand(stats, surveys, 0, 2, noZones(stats.count), 0).project;
    // computed: √((400 · tvu)²/4 + (400 · 2tvu)²/9)
    expect(band.bandCubicLength).toBeCloseTo(Math.sqrt((400 * tvu) ** 2 / 4 + (400 * 2 * tvu) ** 2 / 9), 9);
  });
});
