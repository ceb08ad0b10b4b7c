import { describe, expect, it } from "vitest";
import { createCellGrid } from "../grid/cell-grid";
import { nodeCells, workLimitMask } from "../grid/work-limit-mask";
import { cellStatusAt, computeCellStats } from "./cell-stats";
import { NO_ZONE, rollUpCells, rollUpZones, zoneOfEachCell } from "./rollup";

// Four 10 × 10 cells in a row (A1 B1 C1 D1) on a 1-unit raster: 100 nodes of 1 unit² per cell.
// Muck top −2, firm sand −6 (4 units of muck); the latest bottom per cell: A1 −3, B1 −4, C1 −5.9,
// D1 −2. Zone "west" covers x 0–22 (centroids of A1, B1), "middle" x 12–28 (B1, C1): B1 lies in
// both, D1 in neither.

function site() {
  const limit = [[[[0, 0], [40, 0], [40, 10], [0, 10], [0, 0]] as [number, number][]]];
  const cellGrid = createCellGrid(limit, { cellSize: 10 });
  const grid = { originX: 0, originY: 0, spacing: 1, cols: 40, rows: 10 };
  const nodeCell = nodeCells(cellGrid, grid, workLimitMask(limit, grid));
  const surface = (value: (col: number) => number) => Float64Array.from({ length: 400 }, (_, node) => value(node % 40));
  const bottom = [-3, -4, -5.9, -2];
  const muckTop = surface(() => -2);
  const stats = computeCellStats(cellGrid, grid, nodeCell, { muckTop, firm: surface(() => -6), before: muckTop, after: surface((col) => bottom[Math.floor(col / 10)]) },
    { tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 });
  return { cellGrid, stats };
}

const rectangle = (minX: number, maxX: number): [number, number][][][] => [[[[minX, -1], [maxX, -1], [maxX, 11], [minX, 11], [minX, -1]]]];
const west = { id: "west", polygon: rectangle(0, 22) };
const middle = { id: "middle", polygon: rectangle(12, 28) };

describe("zone rows add up to the project", () => {
  const { cellGrid, stats } = site();

  it("the hand-built site reads as written (the sums below rest on it)", () => {
    // computed: removed = 100 × (−2 − bottom), remaining = 100 × (bottom − −6)
    expect(Array.from(stats.removedVolumeCubicLength)).toEqual([100, 200, 390, 0].map((value) => expect.closeTo(value, 9)));
    expect(Array.from(stats.remainingVolumeCubicLength)).toEqual([300, 200, 10, 400].map((value) => expect.closeTo(value, 9)));
    expect([0, 1, 2, 3].map((cell) => cellStatusAt(stats, cell))).toEqual(["in-work", "in-work", "at-firm-sand", "untouched"]);
  });

  it("a cell in two zones belongs to the first by the zones' order; a cell in none to no zone", () => {
    expect(Array.from(zoneOfEachCell(cellGrid, [west, middle]))).toEqual([0, 0, 1, NO_ZONE]);
    expect(Array.from(zoneOfEachCell(cellGrid, [middle, west]))).toEqual([1, 0, 0, NO_ZONE]);
  });

  it("gives an Unzoned row for the cell in no zone and counts the shared cell once", () => {
    const rows = rollUpZones(cellGrid, stats, [west, middle]);
    expect(rows.map((row) => row.id)).toEqual(["west", "middle", null]);
    const [westRow, middleRow, unzoned] = rows.map((row) => row.totals);
    // computed by hand: west = A1 + B1, middle = C1 (B1 went to west), Unzoned = D1
    expect(westRow.plannedVolumeCubicLength).toBeCloseTo(800, 9);
    expect(westRow.removedVolumeCubicLength).toBeCloseTo(300, 9);
    expect(westRow.remainingVolumeCubicLength).toBeCloseTo(500, 9);
    expect([westRow.cells, westRow.cellsInWork, westRow.cellsAtFirmSand]).toEqual([2, 2, 0]);
    expect(middleRow.plannedVolumeCubicLength).toBeCloseTo(400, 9);
    expect(middleRow.removedVolumeCubicLength).toBeCloseTo(390, 9);
    expect(middleRow.remainingVolumeCubicLength).toBeCloseTo(10, 9);
    expect([middleRow.cells, middleRow.cellsAtFirmSand]).toEqual([1, 1]);
    expect(unzoned.plannedVolumeCubicLength).toBeCloseTo(400, 9);
    expect(unzoned.removedVolumeCubicLength).toBe(0);
    expect(unzoned.remainingVolumeCubicLength).toBeCloseTo(400, 9);
    expect([unzoned.cells, unzoned.cellsUntouched]).toEqual([1, 1]);
    // computed by hand: the project is 4 × 400 planned, 100 + 200 + 390 removed, 300 + 200 + 10 + 400 remaining
    const project = rollUpCells(stats);
    expect(project.plannedVolumeCubicLength).toBeCloseTo(1600, 9);
    expect(project.removedVolumeCubicLength).toBeCloseTo(690, 9);
    expect(project.remainingVolumeCubicLength).toBeCloseTo(910, 9);
    // invariant: the rows sum to the project for every figure
    for (const key of Object.keys(project) as Array<keyof typeof project>) {
      expect(westRow[key] + middleRow[key] + unzoned[key], key).toBeCloseTo(project[key], 9);
    }
  });

  it("has no Unzoned row when the zones hold every cell", () => {
    expect(rollUpZones(cellGrid, stats, [west, { id: "east", polygon: rectangle(18, 41) }]).map((row) => row.id)).toEqual(["west", "east"]);
  });
});
