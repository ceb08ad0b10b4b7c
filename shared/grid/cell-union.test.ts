import { describe, expect, it } from "vitest";
import { cellIndex, createCellGrid, type CellGrid } from "./cell-grid";
import { cellsOutline } from "./cell-union";
import { workLimitArea, type ProjectedMultiPolygon } from "./work-limit";
import { zoneCells } from "../volumes/rollup";

const square = (size: number): ProjectedMultiPolygon => [[[[0, 0], [size, 0], [size, size], [0, size], [0, 0]]]];
const grid = (options: { cellSize: number; rotationDegrees?: number }): CellGrid => createCellGrid(square(200), { originX: 0, originY: 0, ...options });

/** Signed shoelace area of a closed ring: positive counter-clockwise. */
function signedArea(ring: Array<[number, number]>): number {
  let sum = 0;
  for (let index = 0; index + 1 < ring.length; index++) sum += ring[index][0] * ring[index + 1][1] - ring[index + 1][0] * ring[index][1];
  return sum / 2;
}

/** The cells a zone drawn with this outline holds, by the one rule of zone membership (cell centre inside). */
function held(cellGrid: CellGrid, outline: ProjectedMultiPolygon): number[] {
  return [...zoneCells(cellGrid, { id: "z", polygon: outline })].sort((a, b) => a - b);
}

describe("cellsOutline: the union of chosen cells' squares", () => {
  it("one cell is its square, counter-clockwise, closed (RFC 7946 winding)", () => {
    const outline = cellsOutline(grid({ cellSize: 10 }), [{ row: 2, col: 3 }]);
    expect(outline).toHaveLength(1);
    expect(outline[0]).toHaveLength(1);
    const ring = outline[0][0];
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    expect(ring).toHaveLength(5); // four corners and the closing repeat
    expect(signedArea(ring)).toBeCloseTo(100, 9); // computed: 10 × 10, positive = counter-clockwise
  });

  it("a 3 × 2 block is one rectangle of four corners (straight runs are one edge)", () => {
    const cells = [0, 1, 2].flatMap((col) => [0, 1].map((row) => ({ row, col })));
    const outline = cellsOutline(grid({ cellSize: 10 }), cells);
    expect(outline).toHaveLength(1);
    expect(outline[0][0]).toHaveLength(5);
    expect(workLimitArea(outline)).toBeCloseTo(600, 9); // computed: 6 cells × 100
  });

  it("a ring of eight cells around an unchosen one is a polygon with a clockwise hole", () => {
    const cells = [];
    for (let row = 0; row < 3; row++) for (let col = 0; col < 3; col++) if (row !== 1 || col !== 1) cells.push({ row, col });
    const outline = cellsOutline(grid({ cellSize: 10 }), cells);
    expect(outline).toHaveLength(1);
    expect(outline[0]).toHaveLength(2);
    expect(signedArea(outline[0][0])).toBeCloseTo(900, 9);
    expect(signedArea(outline[0][1])).toBeCloseTo(-100, 9); // the hole runs clockwise
    expect(workLimitArea(outline)).toBeCloseTo(800, 9); // computed: 9 − 1 cells
  });

  it("two cells meeting only at a corner are two polygons, each a simple square", () => {
    const outline = cellsOutline(grid({ cellSize: 10 }), [{ row: 0, col: 0 }, { row: 1, col: 1 }]);
    expect(outline).toHaveLength(2);
    for (const polygon of outline) {
      expect(polygon).toHaveLength(1);
      expect(polygon[0]).toHaveLength(5);
      expect(signedArea(polygon[0])).toBeCloseTo(100, 9);
    }
  });

  it("a chosen cell given twice counts once", () => {
    const outline = cellsOutline(grid({ cellSize: 10 }), [{ row: 4, col: 4 }, { row: 4, col: 4 }]);
    expect(workLimitArea(outline)).toBeCloseTo(100, 9);
  });

  it("on a rotated grid, a scattered selection with a pinch and a hole holds exactly the chosen cells (invariant: the zone membership rule gives the selection back)", () => {
    const cellGrid = createCellGrid(square(200), { cellSize: 12.5, rotationDegrees: 27, originX: 3, originY: -4 });
    // An L, a diagonal neighbour (corner contact), a 3 × 3 frame with its middle left out, a lone cell.
    const chosen = [
      { row: 2, col: 2 }, { row: 3, col: 2 }, { row: 4, col: 2 }, { row: 4, col: 3 }, { row: 5, col: 4 },
      ...[0, 1, 2].flatMap((dr) => [0, 1, 2].map((dc) => ({ row: 6 + dr, col: 6 + dc }))).filter((cell) => !(cell.row === 7 && cell.col === 7)),
      { row: 1, col: 9 },
    ];
    const outline = cellsOutline(cellGrid, chosen);
    // computed: the union's area is the number of chosen cells times the cell's area.
    expect(workLimitArea(outline)).toBeCloseTo(chosen.length * 12.5 * 12.5, 6);
    const expected = chosen.map((cell) => cellIndex(cellGrid, cell.row, cell.col)).sort((a, b) => a - b);
    expect(held(cellGrid, outline)).toEqual(expected);
    // The left-out middle cell's centre lies in the hole, so no zone made of the frame holds it.
    expect(held(cellGrid, outline)).not.toContain(cellIndex(cellGrid, 7, 7));
  });

  it("no cells, no polygon", () => {
    expect(cellsOutline(grid({ cellSize: 10 }), [])).toEqual([]);
  });
});
