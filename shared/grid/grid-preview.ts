import { cellCount, createCellGrid, toGridFrame, type CellGrid } from "./cell-grid";
import type { Position, ProjectedMultiPolygon } from "./work-limit";
import { nodeCells, rasterGridFor, workLimitMask } from "./work-limit-mask";

/**
 * The grid a manager is typing, laid out before it is saved: the same cell grid the engine lays
 * (createCellGrid) and the same rule for which cells count (a cell counts when a raster node
 * inside the work limit falls in it: workLimitMask and nodeCells over rasterGridFor's raster), so
 * the preview shows the cells the figures will be kept for.
 *
 * A fine raster over a large limit is many nodes; past `nodeBudget` the preview samples every
 * k-th node (k odd, and k nodes no wider than a cell), whose centres are nodes of the full raster,
 * so a cell it counts is one the engine counts too, and every cell wholly inside still holds a
 * node (it may miss a sliver cell along the limit the full raster would catch; `exact` says so).
 * A grid of more than `PREVIEW_MAX_GRID_CELLS`, or one that would still need more than
 * `PREVIEW_MAX_RASTER_NODES` nodes, is not laid out (`inLimit` null): only its count is given.
 */
export interface PreviewGridSettings {
  cellSize: number;
  rotationDegrees: number;
  originX?: number;
  originY?: number;
  rasterResolution: number;
}

export interface PreviewGrid {
  grid: CellGrid;
  /** Cells of the grid's frame (columns × rows), as the saved grid's count. */
  cells: number;
  /** 1 for a cell inside the work limit (row-major over the grid); null when the grid is too large to lay out. */
  inLimit: Uint8Array | null;
  inLimitCount: number | null;
  /** The raster spacing the cells were counted on (project length unit). */
  rasterSpacing: number;
  /** True when counted on the engine's own raster. */
  exact: boolean;
}

/** Raster nodes the preview samples at most. */
export const PREVIEW_RASTER_NODES = 4_000_000;
/** Largest grid (columns × rows) laid out in the browser. */
export const PREVIEW_MAX_GRID_CELLS = 4_000_000;
/** Most raster nodes sampled when the budget would leave cells without a node. */
export const PREVIEW_MAX_RASTER_NODES = 8_000_000;

export function layPreviewGrid(limit: ProjectedMultiPolygon, settings: PreviewGridSettings, nodeBudget = PREVIEW_RASTER_NODES): PreviewGrid {
  const grid = createCellGrid(limit, settings);
  const cells = cellCount(grid);
  if (cells > PREVIEW_MAX_GRID_CELLS) return { grid, cells, inLimit: null, inLimitCount: null, rasterSpacing: settings.rasterResolution, exact: false };
  const full = rasterGridFor(limit, grid, settings.rasterResolution);
  const nodes = full.cols * full.rows;
  let step = Math.max(1, Math.ceil(Math.sqrt(nodes / nodeBudget)));
  if (step % 2 === 0) step++;
  // Never sparser than a node a cell: the widest odd step within the cell size.
  let widest = Math.max(1, Math.floor(settings.cellSize / settings.rasterResolution + 1e-9));
  if (widest % 2 === 0) widest--;
  step = Math.min(step, widest);
  if (nodes / (step * step) > PREVIEW_MAX_RASTER_NODES) return { grid, cells, inLimit: null, inLimitCount: null, rasterSpacing: settings.rasterResolution * step, exact: false };
  const raster = step === 1 ? full : rasterGridFor(limit, grid, settings.rasterResolution * step);
  const nodeCell = nodeCells(grid, raster, workLimitMask(limit, raster));
  const inLimit = new Uint8Array(cells);
  for (let node = 0; node < nodeCell.length; node++) if (nodeCell[node] >= 0) inLimit[nodeCell[node]] = 1;
  let inLimitCount = 0;
  for (let cell = 0; cell < cells; cell++) inLimitCount += inLimit[cell];
  return { grid, cells, inLimit, inLimitCount, rasterSpacing: raster.spacing, exact: step === 1 };
}

/**
 * The cells inside the work limit whose squares fall in a frame (the map's view, its corners in
 * project coordinates): at most `max` of them by grid index, with how many there are in all, so
 * the page draws a bounded number and says when there were more.
 */
export function cellsInFrame(preview: Pick<PreviewGrid, "grid" | "inLimit">, corners: ReadonlyArray<Position>, max: number): { indices: number[]; total: number } {
  const { grid, inLimit } = preview;
  if (!inLimit) return { indices: [], total: 0 };
  let minU = Infinity, minV = Infinity, maxU = -Infinity, maxV = -Infinity;
  for (const [x, y] of corners) {
    const [u, v] = toGridFrame(grid, x, y);
    minU = Math.min(minU, u); maxU = Math.max(maxU, u);
    minV = Math.min(minV, v); maxV = Math.max(maxV, v);
  }
  const colFrom = Math.max(0, Math.floor(minU / grid.cellSize) - grid.firstCol);
  const colTo = Math.min(grid.cols - 1, Math.floor(maxU / grid.cellSize) - grid.firstCol);
  const rowFrom = Math.max(0, Math.floor(minV / grid.cellSize) - grid.firstRow);
  const rowTo = Math.min(grid.rows - 1, Math.floor(maxV / grid.cellSize) - grid.firstRow);
  const indices: number[] = [];
  let total = 0;
  for (let row = rowFrom; row <= rowTo; row++) {
    for (let col = colFrom; col <= colTo; col++) {
      const index = row * grid.cols + col;
      if (inLimit[index] !== 1) continue;
      total++;
      if (indices.length < max) indices.push(index);
    }
  }
  return { indices, total };
}

/** Earth's equatorial radius in the Web Mercator projection (EPSG:3857), metres. */
const WEB_MERCATOR_RADIUS = 6_378_137;
/** MapLibre's tile size: zoom 0 shows the world 512 pixels wide. */
const MAP_TILE_PIXELS = 512;

/** Ground metres per screen pixel at a zoom and latitude (Web Mercator, MapLibre's 512-pixel tiles). */
export function metresPerPixel(zoom: number, latitude: number): number {
  return (2 * Math.PI * WEB_MERCATOR_RADIUS * Math.cos((latitude * Math.PI) / 180)) / (MAP_TILE_PIXELS * 2 ** zoom);
}

/** The zoom from which a cell `cellMetres` wide spans at least `pixels` on screen at `latitude`. */
export function zoomForCellPixels(cellMetres: number, latitude: number, pixels: number): number {
  return Math.log2((2 * Math.PI * WEB_MERCATOR_RADIUS * Math.cos((latitude * Math.PI) / 180) * pixels) / (MAP_TILE_PIXELS * cellMetres));
}
