import type { RasterGrid } from "../surface/raster";
import { toGridFrame, type CellGrid } from "./cell-grid";
import { workLimitBounds, type ProjectedMultiPolygon } from "./work-limit";

/**
 * Which raster nodes lie inside the work limit (1) and which outside (0). A scanline fill: for
 * each raster row the crossings of every ring edge with the row's centre line are collected
 * (compressed per row, no per-node work), sorted, and the spans between pairs filled — the even-odd
 * rule, so holes and several polygons come out right.
 */
export function workLimitMask(limit: ProjectedMultiPolygon, grid: RasterGrid): Uint8Array {
  const { originX, originY, spacing, cols, rows } = grid;
  const mask = new Uint8Array(cols * rows);
  const rowY = (row: number) => originY + (row + 0.5) * spacing;

  // First pass counts the crossings per row, second pass stores them (compressed sparse rows).
  const crossingsPerRow = new Uint32Array(rows + 1);
  const forEachEdge = (visit: (x1: number, y1: number, x2: number, y2: number) => void) => {
    for (const polygon of limit) {
      for (const ring of polygon) {
        for (let current = 0, previous = ring.length - 1; current < ring.length; previous = current++) {
          visit(ring[previous][0], ring[previous][1], ring[current][0], ring[current][1]);
        }
      }
    }
  };
  const rowRange = (y1: number, y2: number): [number, number] => {
    const low = Math.min(y1, y2);
    const high = Math.max(y1, y2);
    // Rows whose centre y satisfies low ≤ y < high (half-open, so a vertex is counted once).
    const first = Math.max(0, Math.ceil((low - originY) / spacing - 0.5));
    const last = Math.min(rows - 1, Math.ceil((high - originY) / spacing - 0.5) - 1);
    return [first, last];
  };
  forEachEdge((x1, y1, x2, y2) => {
    if (y1 === y2) return;
    const [first, last] = rowRange(y1, y2);
    for (let row = first; row <= last; row++) {
      const y = rowY(row);
      if (y >= Math.min(y1, y2) && y < Math.max(y1, y2)) crossingsPerRow[row + 1]++;
    }
  });
  for (let row = 0; row < rows; row++) crossingsPerRow[row + 1] += crossingsPerRow[row];
  const crossings = new Float64Array(crossingsPerRow[rows]);
  const filled = crossingsPerRow.slice(0, rows);
  forEachEdge((x1, y1, x2, y2) => {
    if (y1 === y2) return;
    const [first, last] = rowRange(y1, y2);
    for (let row = first; row <= last; row++) {
      const y = rowY(row);
      if (y >= Math.min(y1, y2) && y < Math.max(y1, y2)) crossings[filled[row]++] = x1 + ((y - y1) * (x2 - x1)) / (y2 - y1);
    }
  });

  for (let row = 0; row < rows; row++) {
    const rowCrossings = crossings.subarray(crossingsPerRow[row], crossingsPerRow[row + 1]).sort();
    for (let pair = 0; pair + 1 < rowCrossings.length; pair += 2) {
      // Nodes whose centre x lies in [left, right).
      const first = Math.max(0, Math.ceil((rowCrossings[pair] - originX) / spacing - 0.5));
      const last = Math.min(cols - 1, Math.ceil((rowCrossings[pair + 1] - originX) / spacing - 0.5) - 1);
      mask.fill(1, row * cols + first, row * cols + last + 1);
    }
  }
  return mask;
}

/**
 * The cell each raster node belongs to (by the node's centre), or −1 for nodes outside the work
 * limit or the cell grid. Computed once per project set-up and shared by every surface.
 */
export function nodeCells(cellGrid: CellGrid, grid: RasterGrid, mask: Uint8Array): Int32Array {
  const { cols, rows, spacing } = grid;
  const assignment = new Int32Array(cols * rows).fill(-1);
  const inverseCell = 1 / cellGrid.cellSize;
  // Step through the grid frame incrementally: moving one node east or north is a fixed step in (u, v).
  const [u0, v0] = toGridFrame(cellGrid, grid.originX + 0.5 * spacing, grid.originY + 0.5 * spacing);
  const [uEast, vEast] = toGridFrame(cellGrid, cellGrid.originX + spacing, cellGrid.originY);
  const [uNorth, vNorth] = toGridFrame(cellGrid, cellGrid.originX, cellGrid.originY + spacing);
  for (let row = 0; row < rows; row++) {
    const rowOffset = row * cols;
    for (let col = 0; col < cols; col++) {
      const node = rowOffset + col;
      if (mask[node] === 0) continue;
      const u = u0 + col * uEast + row * uNorth;
      const v = v0 + col * vEast + row * vNorth;
      const cellCol = Math.floor(u * inverseCell) - cellGrid.firstCol;
      const cellRow = Math.floor(v * inverseCell) - cellGrid.firstRow;
      if (cellCol >= 0 && cellCol < cellGrid.cols && cellRow >= 0 && cellRow < cellGrid.rows) {
        assignment[node] = cellRow * cellGrid.cols + cellCol;
      }
    }
  }
  return assignment;
}

/**
 * Each cell's area inside the work limit (project length unit squared), measured on the raster:
 * in-limit nodes × spacing². Measuring it on the same nodes that carry the volumes keeps coverage
 * (surveyed nodes ÷ in-limit nodes) an honest share between 0 and 1.
 */
export function cellAreasInWorkLimit(cellGrid: CellGrid, grid: RasterGrid, assignment: Int32Array): Float64Array {
  const areas = new Float64Array(cellGrid.cols * cellGrid.rows);
  const pixelArea = grid.spacing * grid.spacing;
  for (let node = 0; node < assignment.length; node++) {
    const cell = assignment[node];
    if (cell >= 0) areas[cell] += pixelArea;
  }
  return areas;
}

/** The raster grid over the limit, aligned with the cell grid when it is not rotated so pixels do not straddle cell lines. */
export function rasterGridFor(workLimit: ProjectedMultiPolygon, cellGrid: CellGrid, resolution: number): RasterGrid {
  const bounds = workLimitBounds(workLimit);
  const anchorX = cellGrid.rotationDegrees === 0 ? cellGrid.originX : bounds.minX;
  const anchorY = cellGrid.rotationDegrees === 0 ? cellGrid.originY : bounds.minY;
  const firstCol = Math.floor((bounds.minX - anchorX) / resolution + 1e-9);
  const firstRow = Math.floor((bounds.minY - anchorY) / resolution + 1e-9);
  const lastCol = Math.ceil((bounds.maxX - anchorX) / resolution - 1e-9);
  const lastRow = Math.ceil((bounds.maxY - anchorY) / resolution - 1e-9);
  return {
    originX: anchorX + firstCol * resolution,
    originY: anchorY + firstRow * resolution,
    spacing: resolution,
    cols: Math.max(1, lastCol - firstCol),
    rows: Math.max(1, lastRow - firstRow),
  };
}
