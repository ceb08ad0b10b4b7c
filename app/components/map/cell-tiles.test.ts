import { geoJSONToTile, type GeoJSONToTileOptions } from "@maplibre/geojson-vt";
import type { FeatureCollection, Geometry } from "geojson";
import { describe, expect, it } from "vitest";
import { cellCentroid, createCellGrid } from "../../../shared/grid/cell-grid";
import { createCrs } from "../../../shared/crs";
import { isInsideWorkLimit, type ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import { buildCellFeatures, buildCellLabelPoints, type CellsData } from "./cell-features";
import { CELL_SOURCES, TILE_EXTENT, TILE_SIZE } from "./cell-sources";

// Regression: "column AC drawn split in two, every label doubled (AC4 AC4)". MapLibre cuts every
// GeoJSON feature at its tile edges (with @maplibre/geojson-vt, the tiler it ships); a column of
// cells straddling a tile edge was drawn as two pieces. With no tile buffer the cut lay on the tile
// edge, where the grid-line layer drew it, and the label layer placed a label on each piece.
// These tests tile the cells as MapLibre does (same tiler, same options) and look at the tiles.

const UTM17 = "+proj=utm +zone=17 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs";
const crs = createCrs(UTM17);
const E0 = 343_000, N0 = 3_198_000;
/** MapLibre's default maxzoom for a GeoJSON source: deeper zooms draw these tiles, enlarged. */
const TILE_ZOOM = 18;

/** A 600 m × 160 m reach with a slanted end, cut into 20 m cells: it crosses several zoom-18 tile edges (about 135 m apart here). */
function reach(): { cells: ReturnType<typeof buildCellFeatures>; data: CellsData } {
  const ring: Array<[number, number]> = [[0, 0], [600, 0], [560, 160], [0, 160], [0, 0]];
  const projected: ProjectedMultiPolygon = [[ring.map(([x, y]) => [E0 + x, N0 + y] as [number, number])]];
  const grid = createCellGrid(projected, { cellSize: 20 });
  const count = grid.cols * grid.rows;
  const status = new Array<number>(count).fill(-1);
  for (let row = 0; row < grid.rows; row++) for (let col = 0; col < grid.cols; col++) {
    const [x, y] = cellCentroid(grid, grid.firstRow + row, grid.firstCol + col);
    if (isInsideWorkLimit(projected, x, y)) status[row * grid.cols + col] = 1;
  }
  const data = {
    projectId: 1, crs: { code: "EPSG:26917", definition: UTM17 }, lengthUnit: "m", labels: { length: "m", volume: "m³" }, grid,
    statuses: [], zones: [], computedAt: null, status, remainingThickness: new Array(count).fill(null), removedVolume: new Array(count).fill(0),
    remainingVolume: new Array(count).fill(0), plannedVolume: new Array(count).fill(0), coverage: new Array(count).fill(0), zone: new Array(count).fill(-1),
  } as unknown as CellsData;
  const limit = { type: "Polygon" as const, coordinates: [ring.map(([x, y]) => crs.toLonLat(E0 + x, N0 + y))] };
  return { cells: buildCellFeatures(data, limit), data };
}

/** MapLibre's tiler options for a GeoJSON source (buffer and tolerance are given in pixels of a 512 px tile). */
function tilerOptions(bufferPixels: number | undefined): GeoJSONToTileOptions {
  const unitsPerPixel = TILE_EXTENT / TILE_SIZE;
  // clip: cut at the tile's edges plus the buffer, as MapLibre's tile index does.
  return { maxZoom: TILE_ZOOM, extent: TILE_EXTENT, buffer: (bufferPixels ?? 128) * unitsPerPixel, tolerance: 0.375 * unitsPerPixel, clip: true };
}

/** Every zoom-18 tile the collection touches, with what the tiler puts in it. */
function tiles(collection: FeatureCollection<Geometry>, options: GeoJSONToTileOptions) {
  const scale = 2 ** TILE_ZOOM;
  let west = Infinity, east = -Infinity, south = Infinity, north = -Infinity;
  const visit = (value: unknown): void => {
    if (typeof (value as number[])[0] === "number") {
      const [lon, lat] = value as number[];
      west = Math.min(west, lon); east = Math.max(east, lon); south = Math.min(south, lat); north = Math.max(north, lat);
    } else for (const inner of value as unknown[]) visit(inner);
  };
  for (const feature of collection.features) visit((feature.geometry as { coordinates: unknown }).coordinates);
  const tileX = (lon: number) => Math.floor(((lon + 180) / 360) * scale);
  const tileY = (lat: number) => Math.floor(((1 - Math.log(Math.tan((lat * Math.PI) / 180) + 1 / Math.cos((lat * Math.PI) / 180)) / Math.PI) / 2) * scale);
  const found = [];
  for (let x = tileX(west); x <= tileX(east); x++) for (let y = tileY(north); y <= tileY(south); y++) found.push({ x, y, tile: geoJSONToTile(collection, TILE_ZOOM, x, y, options) });
  return found;
}

const insideTile = ([x, y]: [number, number]) => x >= 0 && x < TILE_EXTENT && y >= 0 && y < TILE_EXTENT;

/** How many tiles show a label for each cell: a point label is placed where it lies inside the tile; a shape gets one per piece. */
function labelsPlaced(collection: FeatureCollection<Geometry>, options: GeoJSONToTileOptions): Map<string, number> {
  const placed = new Map<string, number>();
  for (const { tile } of tiles(collection, options)) {
    for (const feature of tile.features) {
      const points = feature.type === 1 ? feature.geometry : feature.geometry.flat();
      if (!points.some(insideTile)) continue;
      const label = String(feature.tags?.label);
      placed.set(label, (placed.get(label) ?? 0) + 1);
    }
  }
  return placed;
}

/** Outline segments drawn along a tile's own edge, inside the square the tile shows. */
function segmentsOnTileEdges(collection: FeatureCollection<Geometry>, options: GeoJSONToTileOptions): number {
  let count = 0;
  const onEdge = (a: number, b: number) => (a === 0 && b === 0) || (a === TILE_EXTENT && b === TILE_EXTENT);
  for (const { tile } of tiles(collection, options)) {
    for (const feature of tile.features) {
      if (feature.type === 1) continue;
      for (const ring of feature.geometry) {
        for (let index = 0; index + 1 < ring.length; index++) {
          const [[x0, y0], [x1, y1]] = [ring[index], ring[index + 1]];
          if (onEdge(x0, x1) || onEdge(y0, y1)) count++;
        }
      }
    }
  }
  return count;
}

describe("cells cut at tile edges (column AC drawn split, labels doubled)", () => {
  it("the reach crosses tile edges: some cells are cut in two by the tiler (computed; so the checks below can fail)", () => {
    const { cells } = reach();
    const pieces = labelsPlaced(cells as FeatureCollection<Geometry>, tilerOptions(0));
    expect([...pieces.values()].filter((count) => count > 1).length).toBeGreaterThan(5);
  });

  it("every cell's label is placed once, in one tile (invariant)", () => {
    const { cells } = reach();
    const points = buildCellLabelPoints(cells);
    expect(points.features.length).toBe(cells.features.length);
    const placed = labelsPlaced(points as FeatureCollection<Geometry>, tilerOptions((CELL_SOURCES["cell-label-points"] as { buffer?: number }).buffer));
    expect(placed.size).toBe(cells.features.length);
    expect([...placed].filter(([, count]) => count !== 1)).toEqual([]);
  });

  it("no cell outline is drawn along a tile edge (invariant; with no buffer, the old source, it was)", () => {
    const { cells } = reach();
    const collection = cells as FeatureCollection<Geometry>;
    expect(segmentsOnTileEdges(collection, tilerOptions(CELL_SOURCES.cells.buffer))).toBe(0);
    // Negative control: the source as it was (buffer 0) draws the cut as a line.
    expect(segmentsOnTileEdges(collection, tilerOptions(0))).toBeGreaterThan(0);
  });

  it("each label point lies inside the cell it names, clipped cells included (invariant)", () => {
    const { cells } = reach();
    const points = buildCellLabelPoints(cells);
    for (const [index, point] of points.features.entries()) {
      const cell = cells.features[index];
      expect(point.properties.label).toBe(cell.properties.label);
      const rings = cell.geometry.type === "Polygon" ? [cell.geometry.coordinates] : cell.geometry.coordinates;
      const [lon, lat] = point.geometry.coordinates;
      const inside = rings.some((polygon) => {
        let crossings = 0;
        const ring = polygon[0];
        for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
          if ((ring[i][1] > lat) !== (ring[j][1] > lat) && lon < ((ring[j][0] - ring[i][0]) * (lat - ring[i][1])) / (ring[j][1] - ring[i][1]) + ring[i][0]) crossings++;
        }
        return crossings % 2 === 1;
      });
      expect(inside, `label point of ${cell.properties.label}`).toBe(true);
    }
  });
});
