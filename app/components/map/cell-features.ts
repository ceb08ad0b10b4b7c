import { pointOnFeature } from "@turf/turf";
import type { FeatureCollection, MultiPolygon, Point, Polygon } from "geojson";
import { clipEdgeCells, type LonLatWorkLimit } from "./clip-cells";
import { cellLabel, fromGridFrame, type CellGrid } from "../../../shared/grid/cell-grid";
import { createCrs } from "../../../shared/crs";
import type { CellsPayload } from "~/models/cells-presenter";

/** What the browser receives from GET /api/projects/<id>/cells (shaped by app/models/cells-presenter.ts). */
export type CellsData = CellsPayload;

export interface CellProperties {
  label: string;
  /** Status code; thickness (null → −1); removed volume; zone index. */
  s: number;
  t: number;
  r: number;
  z: number;
}

/**
 * Cell outlines built in the browser from the grid definition: the (cols + 1) × (rows + 1) grid
 * corners are converted to lon/lat once (shared corners, one proj4 call per corner), then each
 * in-limit cell becomes a quadrilateral. Feature ids are the grid indices, for feature-state.
 * Given the work limit (lon/lat), cells along it are clipped to the part inside (clip-cells.ts).
 * Given `only` (grid indices), just those cells are built, and only the corners of the rows and
 * columns they span are converted (the settings page's preview of a large grid draws a view's worth).
 */
export function buildCellFeatures(data: CellsData, workLimit?: LonLatWorkLimit | null, only?: ArrayLike<number>): FeatureCollection<Polygon | MultiPolygon, CellProperties> {
  const grid = data.grid;
  if (!grid) return { type: "FeatureCollection", features: [] };
  const crs = createCrs(data.crs.definition);
  // The block of corners to convert: the whole grid, or the rows and columns `only` spans.
  let rowFrom = 0, colFrom = 0, rowTo = grid.rows - 1, colTo = grid.cols - 1;
  if (only) {
    rowFrom = colFrom = Infinity;
    rowTo = colTo = -Infinity;
    for (let position = 0; position < only.length; position++) {
      const row = Math.floor(only[position] / grid.cols), col = only[position] % grid.cols;
      rowFrom = Math.min(rowFrom, row); rowTo = Math.max(rowTo, row);
      colFrom = Math.min(colFrom, col); colTo = Math.max(colTo, col);
    }
    if (only.length === 0) return { type: "FeatureCollection", features: [] };
  }
  const cornerCols = colTo - colFrom + 2;
  const cornerRows = rowTo - rowFrom + 2;
  const projected = new Float64Array(cornerCols * cornerRows * 2);
  for (let cornerRow = 0; cornerRow < cornerRows; cornerRow++) {
    for (let cornerCol = 0; cornerCol < cornerCols; cornerCol++) {
      const [x, y] = fromGridFrame(grid, (grid.firstCol + colFrom + cornerCol) * grid.cellSize, (grid.firstRow + rowFrom + cornerRow) * grid.cellSize);
      const offset = (cornerRow * cornerCols + cornerCol) * 2;
      projected[offset] = x;
      projected[offset + 1] = y;
    }
  }
  const lonLat = crs.toLonLatArray(projected);
  const corner = (localRow: number, localCol: number): [number, number] => {
    const offset = ((localRow - rowFrom) * cornerCols + (localCol - colFrom)) * 2;
    return [lonLat[offset], lonLat[offset + 1]];
  };
  const features: FeatureCollection<Polygon | MultiPolygon, CellProperties>["features"] = [];
  const count = only ? only.length : data.status.length;
  for (let position = 0; position < count; position++) {
    const index = only ? only[position] : position;
    if (data.status[index] < 0) continue;
    const localRow = Math.floor(index / grid.cols);
    const localCol = index % grid.cols;
    const first = corner(localRow, localCol);
    features.push({
      type: "Feature",
      id: index,
      properties: {
        label: cellLabel(localRow + grid.firstRow, localCol + grid.firstCol),
        s: data.status[index],
        t: data.remainingThickness[index] ?? -1,
        r: data.removedVolume[index],
        z: data.zone[index],
      },
      geometry: { type: "Polygon", coordinates: [[first, corner(localRow, localCol + 1), corner(localRow + 1, localCol + 1), corner(localRow + 1, localCol), first]] },
    });
  }
  if (workLimit) clipEdgeCells(features, grid, crs, workLimit);
  return { type: "FeatureCollection", features };
}

export interface CellLabelProperties {
  label: string;
  z: number;
}

/**
 * One point per drawn cell to hang its label on. Labels are not placed on the cell shapes
 * themselves: MapLibre cuts every shape at the tile edges and places a label on each piece, so a
 * column straddling a tile edge showed every label twice ("AC4 AC4"). A point lies in one tile.
 * A whole square's point is its centre; a clipped cell's is a point inside what is drawn of it.
 */
export function buildCellLabelPoints(cells: FeatureCollection<Polygon | MultiPolygon, CellProperties>): FeatureCollection<Point, CellLabelProperties> {
  const features: FeatureCollection<Point, CellLabelProperties>["features"] = [];
  for (const cell of cells.features) {
    const geometry = cell.geometry;
    let at: number[];
    if (geometry.type === "Polygon" && geometry.coordinates[0].length === 5 && geometry.coordinates.length === 1) {
      const ring = geometry.coordinates[0];
      at = [(ring[0][0] + ring[1][0] + ring[2][0] + ring[3][0]) / 4, (ring[0][1] + ring[1][1] + ring[2][1] + ring[3][1]) / 4];
    } else at = pointOnFeature(cell).geometry.coordinates;
    features.push({ type: "Feature", id: cell.id, properties: { label: cell.properties.label, z: cell.properties.z }, geometry: { type: "Point", coordinates: at } });
  }
  return { type: "FeatureCollection", features };
}

/** Label → grid index for every in-limit cell. */
export function labelIndex(data: CellsData): Map<string, number> {
  const map = new Map<string, number>();
  const grid = data.grid;
  if (!grid) return map;
  for (let index = 0; index < data.status.length; index++) {
    if (data.status[index] < 0) continue;
    map.set(cellLabel(Math.floor(index / grid.cols) + grid.firstRow, (index % grid.cols) + grid.firstCol), index);
  }
  return map;
}

/** The lon/lat centre of a cell, for flying to it and for tests. */
export function cellCentreLonLat(data: CellsData, index: number): [number, number] {
  const grid = data.grid!;
  const crs = createCrs(data.crs.definition);
  const localRow = Math.floor(index / grid.cols), localCol = index % grid.cols;
  const [x, y] = fromGridFrame(grid, (grid.firstCol + localCol + 0.5) * grid.cellSize, (grid.firstRow + localRow + 0.5) * grid.cellSize);
  return crs.toLonLat(x, y);
}
