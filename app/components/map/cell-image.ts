import { cellIndexAt, fromGridFrame } from "../../../shared/grid/cell-grid";
import { createCrs } from "../../../shared/crs";
import type { CellsData } from "./cell-features";

/**
 * The quick look: a large grid's cells as an image, one pixel per cell, laid on the map by its
 * four corners while MapLibre is still tiling the cell shapes (seconds for a 100,000-cell bay).
 * The grid is regular, so the image is exact at the cell level; only the clip along the work limit
 * waits for the shapes.
 */

/** From this many cells in the limit the map shows the quick look first. */
export const QUICK_LOOK_FROM_CELLS = 20_000;

export function inLimitCellCount(data: CellsData): number {
  let count = 0;
  for (let index = 0; index < data.status.length; index++) if (data.status[index] >= 0) count++;
  return count;
}

function rgb(hex: string): [number, number, number] {
  const value = Number.parseInt(hex.slice(1), 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

/**
 * RGBA pixels, `cols` wide and `rows` high, the northmost grid row (in the grid's frame) on top;
 * cells outside the limit, and outside the zone when one is chosen, are transparent.
 */
export function paintCellImage(data: CellsData, colourOf: (index: number) => string, zone: number | null = null): { width: number; height: number; pixels: Uint8ClampedArray } {
  const grid = data.grid;
  if (!grid) return { width: 0, height: 0, pixels: new Uint8ClampedArray(0) };
  const pixels = new Uint8ClampedArray(grid.cols * grid.rows * 4);
  const cache = new Map<string, [number, number, number]>();
  for (let index = 0; index < data.status.length; index++) {
    if (data.status[index] < 0 || (zone !== null && data.zone[index] !== zone)) continue;
    const hex = colourOf(index);
    let colour = cache.get(hex);
    if (!colour) cache.set(hex, (colour = rgb(hex)));
    const localRow = Math.floor(index / grid.cols);
    const offset = ((grid.rows - 1 - localRow) * grid.cols + (index % grid.cols)) * 4;
    pixels[offset] = colour[0];
    pixels[offset + 1] = colour[1];
    pixels[offset + 2] = colour[2];
    pixels[offset + 3] = 255;
  }
  return { width: grid.cols, height: grid.rows, pixels };
}

/** The image's corners in lon/lat, in MapLibre's order: top left, top right, bottom right, bottom left. */
export function cellImageCorners(data: CellsData): Array<[number, number]> {
  const grid = data.grid!;
  const crs = createCrs(data.crs.definition);
  const corner = (cornerCol: number, cornerRow: number) => {
    const [x, y] = fromGridFrame(grid, (grid.firstCol + cornerCol) * grid.cellSize, (grid.firstRow + cornerRow) * grid.cellSize);
    return crs.toLonLat(x, y) as [number, number];
  };
  return [corner(0, grid.rows), corner(grid.cols, grid.rows), corner(grid.cols, 0), corner(0, 0)];
}

/** The in-limit cell under a lon/lat point, or −1: clicks on the quick look. */
export function cellIndexAtLonLat(data: CellsData, lon: number, lat: number): number {
  const grid = data.grid;
  if (!grid) return -1;
  const [x, y] = createCrs(data.crs.definition).fromLonLat(lon, lat);
  const index = cellIndexAt(grid, x, y);
  if (index < 0) return -1;
  return data.status[index] >= 0 ? index : -1;
}
