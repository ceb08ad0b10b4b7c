import { describe, expect, it } from "vitest";
import type { CellGrid } from "../../shared/grid/cell-grid";
import { CELL_STATUSES } from "../../shared/cell-status";
import { presentCellsPayload, type CellFigures } from "./cells-presenter";

const grid: CellGrid = { originX: 0, originY: 0, cellSize: 20, rotationDegrees: 0, firstCol: -1, firstRow: 2, cols: 3, rows: 2 };
const cell = (row: number, col: number, figures: Partial<CellFigures>): CellFigures => ({
  row, col, status: "in-work", meanRemainingThickness: 0.5, removedVolume: 1, remainingVolume: 2, plannedVolume: 3, coverage: 1, zoneId: null, computedAt: "2026-11-24T18:00:00.000Z", ...figures,
});

describe("presentCellsPayload", () => {
  const payload = presentCellsPayload({
    projectId: 7, crs: { code: "EPSG:2237", definition: "+proj=tmerc" }, lengthUnit: "us-ft", grid,
    zones: [{ id: 40, name: "Vent" }, { id: 41, name: "Run" }],
    cells: [
      cell(2, -1, { status: "confirmed", zoneId: 41, meanRemainingThickness: 0.126, removedVolume: 12.34, coverage: 0.12345, computedAt: "2026-11-24T18:00:00.000Z" }),
      cell(3, 1, { status: "no-data", meanRemainingThickness: null, computedAt: new Date("2026-11-25T08:00:00.000Z") }),
      cell(9, 9, { status: "untouched" }), // outside the grid: left out
    ],
  });

  it("lays the cells row-major from the grid's first row and column (invariant: index = (row − firstRow) · cols + (col − firstCol))", () => {
    expect(payload.status).toHaveLength(6);
    expect(payload.status).toEqual([CELL_STATUSES.indexOf("confirmed"), -1, -1, -1, -1, CELL_STATUSES.indexOf("no-data")]);
    expect(payload.zone).toEqual([1, -1, -1, -1, -1, -1]);
  });

  it("rounds thickness to 0.01, volumes to 0.1 and coverage to 0.001, and keeps an unsurveyed thickness null (computed by hand)", () => {
    expect(payload.remainingThickness[0]).toBe(0.13);
    expect(payload.removedVolume[0]).toBe(12.3);
    expect(payload.coverage[0]).toBe(0.123);
    expect(payload.remainingThickness[5]).toBeNull();
    expect(JSON.stringify(payload.coverage)).toBe("[0.123,0,0,0,0,1]");
  });

  it("reports the newest computation time and the project's unit labels (US survey feet → ftUS and yd³)", () => {
    expect(payload.computedAt).toBe("2026-11-25T08:00:00.000Z");
    expect(payload.labels).toEqual({ length: "ftUS", volume: "yd³" });
  });
});
