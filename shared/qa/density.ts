/**
 * A progress grid as Firmsand lays it out (the same convention as ./grid/cell-grid): cells of side
 * `cellSize` counted from the origin, `col` eastwards and `row` northwards before rotation; the
 * whole grid is then turned by the rotation, in degrees counter-clockwise (from east towards
 * north), about the origin. The grid keeps `cols` × `rows` cells starting at column `firstCol` and
 * row `firstRow` (both 0 unless the origin lies inside the work limit); cell (row, col) is stored at
 * index (row − firstRow)·cols + (col − firstCol).
 * The rotation is named as in the cell grid (`rotationDegrees`), so a CellGrid can be passed as it is.
 */
export interface CellGridDefinition {
  originX: number;
  originY: number;
  cellSize: number;
  cols: number;
  rows: number;
  rotationDegrees?: number;
  firstCol?: number;
  firstRow?: number;
}

interface Frame {
  cos: number;
  sin: number;
  firstCol: number;
  firstRow: number;
}

function frameOf(grid: CellGridDefinition): Frame {
  const angle = ((grid.rotationDegrees ?? 0) * Math.PI) / 180;
  return { cos: Math.cos(angle), sin: Math.sin(angle), firstCol: grid.firstCol ?? 0, firstRow: grid.firstRow ?? 0 };
}

function indexIn(grid: CellGridDefinition, frame: Frame, x: number, y: number): number {
  const dx = x - grid.originX;
  const dy = y - grid.originY;
  // Undo the rotation: columns run along (cos, sin), rows along (−sin, cos).
  const col = Math.floor((dx * frame.cos + dy * frame.sin) / grid.cellSize) - frame.firstCol;
  const row = Math.floor((-dx * frame.sin + dy * frame.cos) / grid.cellSize) - frame.firstRow;
  if (col < 0 || row < 0 || col >= grid.cols || row >= grid.rows) return -1;
  return row * grid.cols + col;
}

/** Cell index of a point, or −1 outside the grid. */
export function cellIndexOf(grid: CellGridDefinition, x: number, y: number): number {
  return indexIn(grid, frameOf(grid), x, y);
}

export interface DensityResult {
  /** Soundings per cell, index row·cols + col. */
  counts: Uint32Array<ArrayBuffer>;
  /** Soundings per unit area (per square project unit) in each cell. */
  perArea: Float64Array<ArrayBuffer>;
  /** Soundings that fall in no cell. */
  outsideGrid: number;
}

export function soundingDensity(xs: Float64Array, ys: Float64Array, grid: CellGridDefinition): DensityResult {
  const counts = new Uint32Array(grid.cols * grid.rows);
  const frame = frameOf(grid);
  let outsideGrid = 0;
  for (let i = 0; i < xs.length; i++) {
    const index = indexIn(grid, frame, xs[i], ys[i]);
    if (index < 0) outsideGrid++;
    else counts[index]++;
  }
  const cellArea = grid.cellSize * grid.cellSize;
  const perArea = new Float64Array(counts.length);
  for (let c = 0; c < counts.length; c++) perArea[c] = counts[c] / cellArea;
  return { counts, perArea, outsideGrid };
}

/** Cells with fewer soundings than `minimum` (indices row·cols + col). */
export function sparseCells(counts: Uint32Array, minimum: number): Uint32Array<ArrayBuffer> {
  const sparse: number[] = [];
  for (let c = 0; c < counts.length; c++) if (counts[c] < minimum) sparse.push(c);
  return Uint32Array.from(sparse);
}
