import { describe, expect, it } from "vitest";
import { createCellGrid } from "../grid/cell-grid";
import { nodeCells, workLimitMask } from "../grid/work-limit-mask";
import { cellStatusAt, classifyCell, computeCellStats, type CellStatusRules } from "./cell-stats";
import { rollUpCells, rollUpZones } from "./rollup";

const rules: CellStatusRules = { tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };

/** Four 10 × 10 cells in a row on a 1-unit raster; each test paints the surfaces node by node. */
function setup() {
  const limit = [[[[0, 0], [40, 0], [40, 10], [0, 10], [0, 0]] as [number, number][]]];
  const cellGrid = createCellGrid(limit, { cellSize: 10 });
  const grid = { originX: 0, originY: 0, spacing: 1, cols: 40, rows: 10 };
  const nodeCell = nodeCells(cellGrid, grid, workLimitMask(limit, grid));
  const surface = (value: (col: number, row: number) => number) => {
    const values = new Float64Array(400);
    for (let node = 0; node < 400; node++) values[node] = value(node % 40, Math.floor(node / 40));
    return values;
  };
  return { cellGrid, grid, nodeCell, surface };
}

describe("cell stats", () => {
  it("integrates planned, removed, deposited and remaining volumes and sets each status", () => {
    const { cellGrid, grid, nodeCell, surface } = setup();
    const firm = surface(() => -6);
    const muckTop = surface(() => -2); // 4 units of muck everywhere
    const after = surface((col, row) => {
      const cell = Math.floor(col / 10);
      if (cell === 0) return -2.1; // A1: within survey noise of the baseline → untouched
      if (cell === 1) return -4; // B1: half the muck out → in work
      if (cell === 2) return row === 0 && col === 20 ? -5 : -5.9; // C1: 99 % within 0.25 of firm → at firm sand
      return row < 7 ? Number.NaN : -2; // D1: only its top three rows of nodes surveyed
    });
    const stats = computeCellStats(cellGrid, grid, nodeCell, { muckTop, firm, before: muckTop, after }, rules);
    // computed: 100 nodes × 1 × 4 = 400 planned in each fully surveyed cell
    expect(stats.plannedVolumeCubicLength[0]).toBeCloseTo(400, 9);
    expect(stats.removedVolumeCubicLength[1]).toBeCloseTo(200, 9); // computed: 100 × (−2 − −4)
    expect(stats.remainingVolumeCubicLength[1]).toBeCloseTo(200, 9); // computed: 100 × (−4 − −6)
    expect(stats.meanRemainingThickness[1]).toBeCloseTo(2, 12);
    expect(stats.remainingVolumeCubicLength[2]).toBeCloseTo(99 * 0.1 + 1, 9); // computed: 99 nodes × 0.1 + one node × 1
    expect(stats.coverage[3]).toBeCloseTo(0.3, 12); // computed: 30 of 100 nodes surveyed
    expect([0, 1, 2, 3].map((cell) => cellStatusAt(stats, cell))).toEqual(["untouched", "in-work", "at-firm-sand", "no-data"]);
  });

  it("counts deposition separately and keeps removed volume non-negative", () => {
    const { cellGrid, grid, nodeCell, surface } = setup();
    const stats = computeCellStats(cellGrid, grid, nodeCell, { muckTop: surface(() => -2), firm: surface(() => -6), before: surface(() => -2), after: surface(() => -1.5) }, rules);
    expect(stats.depositedVolumeCubicLength[0]).toBeCloseTo(50, 9); // computed: 100 × 0.5
    expect(stats.removedVolumeCubicLength[0]).toBe(0);
  });

  it("status rule order: no data, then firm sand, then untouched, else in work", () => {
    // practice: a cell that is already at firm sand at baseline is done, not untouched.
    expect(classifyCell(0.79, 1, 0, rules)).toBe("no-data");
    expect(classifyCell(Number.NaN, Number.NaN, 0, rules)).toBe("no-data");
    expect(classifyCell(0.8, 0.95, 0, rules)).toBe("at-firm-sand");
    expect(classifyCell(1, 0.94, 0.25, rules)).toBe("untouched");
    expect(classifyCell(1, 0.94, 0.26, rules)).toBe("in-work");
  });

  it("rolls cells up into zones by cell list and by polygon centroid", () => {
    const { cellGrid, grid, nodeCell, surface } = setup();
    const stats = computeCellStats(cellGrid, grid, nodeCell, { muckTop: surface(() => -2), firm: surface(() => -6), before: surface(() => -2), after: surface((col) => (col < 20 ? -3 : -2)) }, rules);
    const project = rollUpCells(stats);
    expect(project.cells).toBe(4);
    expect(project.removedVolumeCubicLength).toBeCloseTo(200, 9); // computed: 200 nodes × 1
    const [west, east] = rollUpZones(cellGrid, stats, [
      { id: "west", cells: [{ row: 0, col: 0 }, { row: 0, col: 1 }, { row: 0, col: 1 }] },
      { id: "east", polygon: [[[[19, -1], [41, -1], [41, 11], [19, 11], [19, -1]]]] },
    ]);
    expect(west.totals.removedVolumeCubicLength).toBeCloseTo(200, 9); // a repeated cell counts once
    expect(east.totals.cells).toBe(2); // centroids (25, 5) and (35, 5)
    expect(east.totals.removedVolumeCubicLength).toBe(0);
    expect(west.totals.plannedVolumeCubicLength + east.totals.plannedVolumeCubicLength).toBeCloseTo(project.plannedVolumeCubicLength, 9); // invariant: zones partition the project
  });
});
