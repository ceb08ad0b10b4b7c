import type { FeatureCollection, MultiPolygon, Polygon } from "geojson";
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
 */
export function buildCellFeatures(data: CellsData, workLimit?: LonLatWorkLimit | null): FeatureCollection<Polygon | MultiPolygon, CellProperties> {
  const grid = data.grid;
  if (!grid) return { type: "FeatureCollection", features: [] };
  const crs = createCrs(data.crs.definition);
  const cornerCols = grid.cols + 1;
  const cornerRows = grid.rows + 1;
  const projected = new Float64Array(cornerCols * cornerRows * 2);
  for (let cornerRow = 0; cornerRow < cornerRows; cornerRow++) {
    for (let cornerCol = 0; cornerCol < cornerCols; cornerCol++) {
      const [x, y] = fromGridFrame(grid, (grid.firstCol + cornerCol) * grid.cellSize, (grid.firstRow + cornerRow) * grid.cellSize);
      const offset = (cornerRow * cornerCols + cornerCol) * 2;
      projected[offset] = x;
      projected[offset + 1] = y;
    }
  }
  const lonLat = crs.toLonLatArray(projected);
  const corner = (cornerRow: number, cornerCol: number): [number, number] => {
    const offset = (cornerRow * cornerCols + cornerCol) * 2;
    return [lonLat[offset], lonLat[offset + 1]];
  };
  const features: FeatureCollection<Polygon | MultiPolygon, CellProperties>["features"] = [];
  for (let index = 0; index < data.status.length; index++) {
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
