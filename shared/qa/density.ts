/**
 * A progress grid as Firmsand lays it out: cells of side `cellSize` counted from the origin,
 * `col` eastwards and `row` northwards before rotation; the whole grid is then turned by
 * `rotationDeg` counter-clockwise (from east towards north) about the origin. Cell (row, col)
 * is stored at index row·cols + col.
 */
export interface CellGridDefinition {
  originX: number;
  originY: number;
  cellSize: number;
  cols: number;
  rows: number;
  rotationDeg: number;
}

/** Cell index of a point, or −1 outside the grid. */
export function cellIndexOf(grid: CellGridDefinition, x: number, y: number): number {
  const angle = (grid.rotationDeg * Math.PI) / 180;
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  const dx = x - grid.originX;
  const dy = y - grid.originY;
  // Undo the rotation: grid axes are (cos, sin) for columns and (−sin, cos) for rows.
  const along = (dx * cos + dy * sin) / grid.cellSize;
  const across = (-dx * sin + dy * cos) / grid.cellSize;
  const col = Math.floor(along);
  const row = Math.floor(across);
  if (col < 0 || row < 0 || col >= grid.cols || row >= grid.rows) return -1;
  return row * grid.cols + col;
}

export interface DensityResult {
  /** Soundings per cell, index row·cols + col. */
  counts: Uint32Array;
  /** Soundings per unit area (per square project unit) in each cell. */
  perArea: Float64Array;
  /** Soundings that fall in no cell. */
  outsideGrid: number;
}

export function soundingDensity(xs: Float64Array, ys: Float64Array, grid: CellGridDefinition): DensityResult {
  const counts = new Uint32Array(grid.cols * grid.rows);
  const angle = (grid.rotationDeg * Math.PI) / 180;
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  let outsideGrid = 0;
  for (let i = 0; i < xs.length; i++) {
    const dx = xs[i] - grid.originX;
    const dy = ys[i] - grid.originY;
    const col = Math.floor((dx * cos + dy * sin) / grid.cellSize);
    const row = Math.floor((-dx * sin + dy * cos) / grid.cellSize);
    if (col < 0 || row < 0 || col >= grid.cols || row >= grid.rows) outsideGrid++;
    else counts[row * grid.cols + col]++;
  }
  const cellArea = grid.cellSize * grid.cellSize;
  const perArea = new Float64Array(counts.length);
  for (let c = 0; c < counts.length; c++) perArea[c] = counts[c] / cellArea;
  return { counts, perArea, outsideGrid };
}

/** Cells with fewer soundings than `minimum` (indices row·cols + col). */
export function sparseCells(counts: Uint32Array, minimum: number): Uint32Array {
  const sparse: number[] = [];
  for (let c = 0; c < counts.length; c++) if (counts[c] < minimum) sparse.push(c);
  return Uint32Array.from(sparse);
}
