import type { Position, ProjectedMultiPolygon } from "./work-limit";

/**
 * The project's cell grid: square cells of `cellSize` laid from an origin, optionally rotated
 * (degrees counter-clockwise from east) to follow a canal or shoreline. Column numbers grow along
 * the grid's own x axis, rows along its y axis, both from 0 at the origin.
 *
 * The grid covers the work limit's extent: `firstCol`/`firstRow` are the lowest column and row that
 * touch it (negative when the origin lies inside the limit), and `cols` × `rows` cells are kept.
 *
 * Labels read like spreadsheet cells: column letters then row number, "A1" for column 0, row 0;
 * column 25 is "Z", column 26 "AA"; row numbers start at 1. A cell west or south of the origin gets
 * a "-" before that part: column −1 is "-A", row −1 is "-1" (so "-B-2" is column −2, row −2).
 */
export interface CellGrid {
  originX: number;
  originY: number;
  cellSize: number;
  rotationDegrees: number;
  firstCol: number;
  firstRow: number;
  cols: number;
  rows: number;
}

export interface CellGridOptions {
  cellSize: number;
  /** Grid origin in project coordinates; default: the south-west corner of the work limit (in the grid's rotated frame). */
  originX?: number;
  originY?: number;
  rotationDegrees?: number;
}

function frame(rotationDegrees: number) {
  const radians = (rotationDegrees * Math.PI) / 180;
  return { cos: Math.cos(radians), sin: Math.sin(radians) };
}

/** Project coordinates → grid frame (along-column u, along-row v) relative to the origin. */
export function toGridFrame(grid: Pick<CellGrid, "originX" | "originY" | "rotationDegrees">, easting: number, northing: number): Position {
  const { cos, sin } = frame(grid.rotationDegrees);
  const dx = easting - grid.originX;
  const dy = northing - grid.originY;
  return [dx * cos + dy * sin, -dx * sin + dy * cos];
}

export function fromGridFrame(grid: Pick<CellGrid, "originX" | "originY" | "rotationDegrees">, u: number, v: number): Position {
  const { cos, sin } = frame(grid.rotationDegrees);
  return [grid.originX + u * cos - v * sin, grid.originY + u * sin + v * cos];
}

export function createCellGrid(workLimit: ProjectedMultiPolygon, options: CellGridOptions): CellGrid {
  const rotationDegrees = options.rotationDegrees ?? 0;
  const cellSize = options.cellSize;
  if (!(cellSize > 0)) throw new Error("cell size must be a positive number");
  let minU = Infinity, minV = Infinity, maxU = -Infinity, maxV = -Infinity;
  const unrotated = { originX: 0, originY: 0, rotationDegrees };
  for (const polygon of workLimit) {
    for (const position of polygon[0] ?? []) {
      const [u, v] = toGridFrame(unrotated, position[0], position[1]);
      minU = Math.min(minU, u); maxU = Math.max(maxU, u);
      minV = Math.min(minV, v); maxV = Math.max(maxV, v);
    }
  }
  if (!Number.isFinite(minU)) throw new Error("the work limit has no outer ring");
  const [defaultX, defaultY] = fromGridFrame(unrotated, minU, minV);
  const originX = options.originX ?? defaultX;
  const originY = options.originY ?? defaultY;
  const [originU, originV] = toGridFrame(unrotated, originX, originY);
  // A tiny slack so a limit edge that lies exactly on a cell line does not add an empty row.
  const slack = 1e-9 * cellSize;
  const firstCol = Math.floor((minU - originU + slack) / cellSize);
  const firstRow = Math.floor((minV - originV + slack) / cellSize);
  const lastCol = Math.ceil((maxU - originU - slack) / cellSize) - 1;
  const lastRow = Math.ceil((maxV - originV - slack) / cellSize) - 1;
  return {
    originX,
    originY,
    cellSize,
    rotationDegrees,
    firstCol,
    firstRow,
    cols: Math.max(1, lastCol - firstCol + 1),
    rows: Math.max(1, lastRow - firstRow + 1),
  };
}

export function cellCount(grid: CellGrid): number {
  return grid.cols * grid.rows;
}

/** Index into per-cell arrays, or −1 outside the grid. */
export function cellIndex(grid: CellGrid, row: number, col: number): number {
  const localRow = row - grid.firstRow;
  const localCol = col - grid.firstCol;
  if (localRow < 0 || localRow >= grid.rows || localCol < 0 || localCol >= grid.cols) return -1;
  return localRow * grid.cols + localCol;
}

export function cellRowCol(grid: CellGrid, index: number): { row: number; col: number } {
  return { row: Math.floor(index / grid.cols) + grid.firstRow, col: (index % grid.cols) + grid.firstCol };
}

/** The cell containing a point, or −1 outside the grid. */
export function cellIndexAt(grid: CellGrid, easting: number, northing: number): number {
  const [u, v] = toGridFrame(grid, easting, northing);
  return cellIndex(grid, Math.floor(v / grid.cellSize), Math.floor(u / grid.cellSize));
}

function columnLetters(col: number): string {
  let letters = "";
  let remaining = col + 1; // bijective base 26: 1 → A, 26 → Z, 27 → AA
  while (remaining > 0) {
    const digit = (remaining - 1) % 26;
    letters = String.fromCharCode(65 + digit) + letters;
    remaining = Math.floor((remaining - 1) / 26);
  }
  return letters;
}

export function cellLabel(row: number, col: number): string {
  const columnPart = col >= 0 ? columnLetters(col) : `-${columnLetters(-col - 1)}`;
  const rowPart = row >= 0 ? String(row + 1) : `-${-row}`;
  return columnPart + rowPart;
}

/** The inverse of cellLabel ("B12" → row 11, col 1; "-A-2" → row −2, col −1); null for anything else. */
export function parseCellLabel(label: string): { row: number; col: number } | null {
  const match = /^(-?)([A-Z]{1,4})(-?)(\d{1,7})$/.exec(label.trim().toUpperCase());
  if (!match) return null;
  let letters = 0;
  for (const letter of match[2]) letters = letters * 26 + (letter.charCodeAt(0) - 64);
  const number = Number(match[4]);
  if (number === 0) return null;
  const col = match[1] ? -letters : letters - 1;
  const row = match[3] ? -number : number - 1;
  return { row, col };
}

/** The cell's outline as a closed counter-clockwise ring in project coordinates. */
export function cellPolygon(grid: Pick<CellGrid, "originX" | "originY" | "rotationDegrees" | "cellSize">, row: number, col: number): Position[] {
  const size = grid.cellSize;
  const u = col * size;
  const v = row * size;
  const ring = [
    fromGridFrame(grid, u, v),
    fromGridFrame(grid, u + size, v),
    fromGridFrame(grid, u + size, v + size),
    fromGridFrame(grid, u, v + size),
  ];
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

export function cellCentroid(grid: CellGrid, row: number, col: number): Position {
  return fromGridFrame(grid, (col + 0.5) * grid.cellSize, (row + 0.5) * grid.cellSize);
}

/**
 * The grid origin a project gets when none is given: the work limit's south-west corner in the
 * grid's (rotated) frame, moved down and left onto a multiple of the cell size, so cell lines fall
 * on round coordinates and every cell of the limit lies at or above and right of the origin.
 */
export function defaultGridOrigin(workLimit: ProjectedMultiPolygon, cellSize: number, rotationDegrees = 0): Position {
  const corner = createCellGrid(workLimit, { cellSize, rotationDegrees });
  const unrotated = { originX: 0, originY: 0, rotationDegrees };
  const [u, v] = toGridFrame(unrotated, corner.originX, corner.originY);
  return fromGridFrame(unrotated, Math.floor(u / cellSize) * cellSize, Math.floor(v / cellSize) * cellSize);
}
