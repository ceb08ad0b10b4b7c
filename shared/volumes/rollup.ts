import { cellCentroid, cellIndex, cellRowCol, type CellGrid } from "../grid/cell-grid";
import { isInsideWorkLimit, type ProjectedMultiPolygon } from "../grid/work-limit";
import { cellStatusCode } from "../cell-status";
import type { CellStats } from "./cell-stats";

/** Sums over a set of cells (a zone, or the whole project). Volumes in the project's cubic length unit. */
export interface VolumeTotals {
  plannedVolumeCubicLength: number;
  removedVolumeCubicLength: number;
  depositedVolumeCubicLength: number;
  remainingVolumeCubicLength: number;
  areaInLimit: number;
  surveyedArea: number;
  /** Cells with any area inside the work limit. */
  cells: number;
  cellsAtFirmSand: number;
  cellsInWork: number;
  cellsUntouched: number;
  cellsNoData: number;
}

/** Roll cells up; without `cells`, every cell of the grid that touches the work limit. */
export function rollUpCells(stats: CellStats, cells?: ArrayLike<number>): VolumeTotals {
  const totals: VolumeTotals = {
    plannedVolumeCubicLength: 0, removedVolumeCubicLength: 0, depositedVolumeCubicLength: 0, remainingVolumeCubicLength: 0,
    areaInLimit: 0, surveyedArea: 0,
    cells: 0, cellsAtFirmSand: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0,
  };
  const visit = (cell: number) => {
    if (!(stats.areaInLimit[cell] > 0)) return;
    totals.plannedVolumeCubicLength += stats.plannedVolumeCubicLength[cell];
    totals.removedVolumeCubicLength += stats.removedVolumeCubicLength[cell];
    totals.depositedVolumeCubicLength += stats.depositedVolumeCubicLength[cell];
    totals.remainingVolumeCubicLength += stats.remainingVolumeCubicLength[cell];
    totals.areaInLimit += stats.areaInLimit[cell];
    totals.surveyedArea += stats.surveyedArea[cell];
    totals.cells++;
    const status = stats.status[cell];
    if (status === cellStatusCode["at-firm-sand"]) totals.cellsAtFirmSand++;
    else if (status === cellStatusCode["in-work"]) totals.cellsInWork++;
    else if (status === cellStatusCode.untouched) totals.cellsUntouched++;
    else totals.cellsNoData++;
  };
  if (cells === undefined) for (let cell = 0; cell < stats.count; cell++) visit(cell);
  else for (let position = 0; position < cells.length; position++) visit(cells[position]);
  return totals;
}

/** A zone is drawn by the project manager either as a list of cells or as a polygon (project coordinates). */
export type ZoneDefinition =
  | { id: string; cells: ReadonlyArray<{ row: number; col: number }> }
  | { id: string; polygon: ProjectedMultiPolygon };

/** The cells of a zone: listed cells that exist in the grid, or cells whose centroid lies inside the zone polygon. */
export function zoneCells(cellGrid: CellGrid, zone: ZoneDefinition): Uint32Array {
  const found: number[] = [];
  if ("cells" in zone) {
    const seen = new Set<number>();
    for (const { row, col } of zone.cells) {
      const index = cellIndex(cellGrid, row, col);
      if (index >= 0 && !seen.has(index)) {
        seen.add(index);
        found.push(index);
      }
    }
  } else {
    for (let index = 0; index < cellGrid.cols * cellGrid.rows; index++) {
      const { row, col } = cellRowCol(cellGrid, index);
      const [easting, northing] = cellCentroid(cellGrid, row, col);
      if (isInsideWorkLimit(zone.polygon, easting, northing)) found.push(index);
    }
  }
  return Uint32Array.from(found);
}

export function rollUpZones(cellGrid: CellGrid, stats: CellStats, zones: ReadonlyArray<ZoneDefinition>): Array<{ id: string; totals: VolumeTotals }> {
  return zones.map((zone) => ({ id: zone.id, totals: rollUpCells(stats, zoneCells(cellGrid, zone)) }));
}
