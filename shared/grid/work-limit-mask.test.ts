import { describe, expect, it } from "vitest";
import { createCellGrid } from "./cell-grid";
import type { ProjectedMultiPolygon } from "./work-limit";
import { isInsideWorkLimit, workLimitArea } from "./work-limit";
import { cellAreasInWorkLimit, nodeCells, workLimitMask } from "./work-limit-mask";
import { nodePosition } from "../surface/raster";

describe("work limit mask", () => {
  const outer: [number, number][] = [[0, 0], [60, 0], [60, 40], [0, 40], [0, 0]];
  const hole: [number, number][] = [[10, 10], [10, 20], [20, 20], [20, 10], [10, 10]];
  const second: [number, number][] = [[80, 0], [100, 0], [90, 30], [80, 0]];
  const limit: ProjectedMultiPolygon = [[outer, hole], [second]];
  const grid = { originX: 0, originY: 0, spacing: 0.5, cols: 200, rows: 80 };

  it("marks the nodes inside (holes and a second polygon respected), matching point-in-polygon", () => {
    const mask = workLimitMask(limit, grid);
    for (let node = 0; node < mask.length; node += 7) {
      const [x, y] = nodePosition(grid, node % grid.cols, Math.floor(node / grid.cols));
      expect(mask[node]).toBe(isInsideWorkLimit(limit, x, y) ? 1 : 0); // invariant: same even-odd rule, two ways
    }
    const inside = mask.reduce((sum, value) => sum + value, 0) * grid.spacing ** 2;
    // computed: 60·40 − 10·10 + ½·20·30 = 2600; the slanted edges cost at most ½ pixel per row crossed.
    expect(workLimitArea(limit)).toBeCloseTo(2600, 9);
    expect(Math.abs(inside - 2600)).toBeLessThan(2 * 60 * grid.spacing * grid.spacing);
  });

  it("measures each cell's area inside the limit", () => {
    const cellGrid = createCellGrid(limit, { cellSize: 20, originX: 0, originY: 0 });
    const mask = workLimitMask(limit, grid);
    const areas = cellAreasInWorkLimit(cellGrid, grid, nodeCells(cellGrid, grid, mask));
    expect(areas[0]).toBeCloseTo(400 - 100, 9); // computed: cell A1 (0–20 × 0–20) minus the 10 × 10 hole
    expect(areas[1]).toBeCloseTo(400, 9); // computed: cell B1 wholly inside
    expect(areas[3]).toBe(0); // computed: cell D1 (60–80) is between the polygons
  });
});
