import type { Tin } from "./triangulate";

/**
 * A regular raster over the work limit. Each node sits at the centre of a square pixel of side
 * `spacing`; node (col, row) is at (originX + (col + ½)·spacing, originY + (row + ½)·spacing), row 0
 * in the south. Summing node values × spacing² is then the midpoint rule, which integrates any
 * surface that is planar over a pixel exactly (the reason planar surfaces come out exact).
 */
export interface RasterGrid {
  /** South-west corner of the raster extent, project coordinates. */
  originX: number;
  originY: number;
  /** Pixel side, project length unit. */
  spacing: number;
  cols: number;
  rows: number;
}

export type RasterValues = Float32Array | Float64Array;
export type RasterPrecision = "float32" | "float64";

/** A surface sampled on a raster grid: values[row · cols + col], NaN where there is no data. */
export interface Raster extends RasterGrid {
  values: RasterValues;
}

export function createRasterValues(grid: RasterGrid, precision: RasterPrecision = "float64"): RasterValues {
  const count = grid.cols * grid.rows;
  const values = precision === "float32" ? new Float32Array(count) : new Float64Array(count);
  values.fill(Number.NaN);
  return values;
}

/** Project coordinates of a node's centre. */
export function nodePosition(grid: RasterGrid, col: number, row: number): [number, number] {
  return [grid.originX + (col + 0.5) * grid.spacing, grid.originY + (row + 0.5) * grid.spacing];
}

export interface RasterizeOptions {
  /** 1 for nodes inside the work limit; other nodes stay NaN (the surface is clipped to the limit). */
  mask?: Uint8Array | null;
  precision?: RasterPrecision;
}

// Nodes within this fraction of a pixel of a triangle's edge count as on it, so nodes on shared
// edges and on the hull are not lost to rounding. Both neighbours then agree on the value (linear
// interpolation is continuous across an edge).
const edgeSlack = 1e-9;

/**
 * Sample a TIN onto the raster by linear interpolation inside each triangle. Work goes triangle by
 * triangle: each triangle's plane is solved once, then the nodes inside it are visited row by row
 * between the triangle's left and right edges (a scanline fill), so there is no point location per
 * node and no allocation per node.
 */
export function rasterizeTin(tin: Tin, grid: RasterGrid, options: RasterizeOptions = {}): Raster {
  const values = createRasterValues(grid, options.precision);
  rasterizeTinInto(tin, grid, values, options.mask ?? null);
  return { ...grid, values };
}

export function rasterizeTinInto(tin: Tin, grid: RasterGrid, values: RasterValues, mask: Uint8Array | null): void {
  const { xy, z, triangles } = tin;
  const { spacing, cols, rows } = grid;
  // Node positions in the TIN's local frame: node (c, r) is at (baseX + c·spacing, baseY + r·spacing).
  const baseX = grid.originX - tin.offsetX + 0.5 * spacing;
  const baseY = grid.originY - tin.offsetY + 0.5 * spacing;
  const inverseSpacing = 1 / spacing;

  for (let corner = 0; corner < triangles.length; corner += 3) {
    const a = triangles[corner];
    const b = triangles[corner + 1];
    const c = triangles[corner + 2];
    const ax = xy[2 * a], ay = xy[2 * a + 1], az = z[a];
    const bx = xy[2 * b], by = xy[2 * b + 1], bz = z[b];
    const cx = xy[2 * c], cy = xy[2 * c + 1], cz = z[c];
    const determinant = (bx - ax) * (cy - ay) - (cx - ax) * (by - ay);
    if (determinant === 0) continue; // zero-area triangle: no plane and no area
    const slopeX = ((bz - az) * (cy - ay) - (cz - az) * (by - ay)) / determinant;
    const slopeY = ((bx - ax) * (cz - az) - (cx - ax) * (bz - az)) / determinant;

    const minY = Math.min(ay, by, cy);
    const maxY = Math.max(ay, by, cy);
    let rowStart = Math.ceil((minY - baseY) * inverseSpacing - edgeSlack);
    let rowEnd = Math.floor((maxY - baseY) * inverseSpacing + edgeSlack);
    if (rowStart < 0) rowStart = 0;
    if (rowEnd > rows - 1) rowEnd = rows - 1;

    for (let row = rowStart; row <= rowEnd; row++) {
      const nodeY = baseY + row * spacing;
      // The triangle's extent along this row: where the row's line crosses the three edges.
      let left = Number.POSITIVE_INFINITY;
      let right = Number.NEGATIVE_INFINITY;
      if ((ay - nodeY) * (by - nodeY) <= 0) {
        if (ay === by) { left = Math.min(left, ax, bx); right = Math.max(right, ax, bx); }
        else { const crossing = ax + ((nodeY - ay) * (bx - ax)) / (by - ay); left = Math.min(left, crossing); right = Math.max(right, crossing); }
      }
      if ((by - nodeY) * (cy - nodeY) <= 0) {
        if (by === cy) { left = Math.min(left, bx, cx); right = Math.max(right, bx, cx); }
        else { const crossing = bx + ((nodeY - by) * (cx - bx)) / (cy - by); left = Math.min(left, crossing); right = Math.max(right, crossing); }
      }
      if ((cy - nodeY) * (ay - nodeY) <= 0) {
        if (cy === ay) { left = Math.min(left, cx, ax); right = Math.max(right, cx, ax); }
        else { const crossing = cx + ((nodeY - cy) * (ax - cx)) / (ay - cy); left = Math.min(left, crossing); right = Math.max(right, crossing); }
      }
      if (left > right) {
        // The row only grazes a vertex within the slack: take the nearest vertex's extent.
        continue;
      }
      let colStart = Math.ceil((left - baseX) * inverseSpacing - edgeSlack);
      let colEnd = Math.floor((right - baseX) * inverseSpacing + edgeSlack);
      if (colStart < 0) colStart = 0;
      if (colEnd > cols - 1) colEnd = cols - 1;
      const rowOffset = row * cols;
      const rowValue = az + slopeY * (nodeY - ay) - slopeX * ax;
      for (let col = colStart; col <= colEnd; col++) {
        const node = rowOffset + col;
        if (mask !== null && mask[node] === 0) continue;
        values[node] = rowValue + slopeX * (baseX + col * spacing);
      }
    }
  }
}
