import { describe, expect, it } from "vitest";
import { cellCentroid, cellIndexAt, cellLabel, cellPolygon, cellRowCol, createCellGrid, parseCellLabel } from "./cell-grid";
import { workLimitArea } from "./work-limit";

describe("cell grid", () => {
  it("labels cells spreadsheet-style: column letters, then row number from 1", () => {
    // practice: the same A1 scheme spreadsheets use, so crews can read labels off a plan sheet.
    expect(cellLabel(0, 0)).toBe("A1");
    expect(cellLabel(11, 2)).toBe("C12");
    expect(cellLabel(0, 25)).toBe("Z1");
    expect(cellLabel(0, 26)).toBe("AA1");
    expect(cellLabel(0, 701)).toBe("ZZ1");
    expect(cellLabel(0, 702)).toBe("AAA1");
    expect(cellLabel(-1, -1)).toBe("-A-1");
    expect(cellLabel(-2, -2)).toBe("-B-2");
  });

  it("covers the work limit from its south-west corner by default", () => {
    const limit = [[[[1000, 2000], [1100, 2000], [1100, 2050], [1000, 2050], [1000, 2000]] as [number, number][]]];
    const grid = createCellGrid(limit, { cellSize: 20 });
    expect([grid.originX, grid.originY]).toEqual([1000, 2000]);
    expect([grid.cols, grid.rows, grid.firstCol, grid.firstRow]).toEqual([5, 3, 0, 0]); // computed: 100/20, ceil(50/20)
    const index = cellIndexAt(grid, 1045, 2021);
    expect(cellRowCol(grid, index)).toEqual({ row: 1, col: 2 });
  });

  it("rotated grids: points map to the right cell and cells keep their area", () => {
    const limit = [[[[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]] as [number, number][]]];
    const grid = createCellGrid(limit, { cellSize: 10, rotationDegrees: 30, originX: 0, originY: 0 });
    const [x, y] = cellCentroid(grid, 2, 3);
    expect(cellRowCol(grid, cellIndexAt(grid, x, y))).toEqual({ row: 2, col: 3 });
    // computed: a square cell of side 10 has area 100 whatever its rotation.
    expect(workLimitArea([[cellPolygon(grid, 2, 3)]])).toBeCloseTo(100, 9);
    // The first row/col are negative when the limit extends west/south of the origin in the rotated frame.
    expect(grid.firstRow).toBeLessThan(0);
  });
});

describe("parseCellLabel", () => {
  it("inverts cellLabel, negative rows and columns included (invariant)", () => {
    for (const row of [-30, -2, -1, 0, 1, 9, 99]) for (const col of [-28, -1, 0, 25, 26, 701, 702]) expect(parseCellLabel(cellLabel(row, col))).toEqual({ row, col });
    expect(parseCellLabel("A0")).toBeNull();
    expect(parseCellLabel("1A")).toBeNull();
  });
});
