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

function emptyVolumeTotals(): VolumeTotals {
  return {
    plannedVolumeCubicLength: 0, removedVolumeCubicLength: 0, depositedVolumeCubicLength: 0, remainingVolumeCubicLength: 0,
    areaInLimit: 0, surveyedArea: 0,
    cells: 0, cellsAtFirmSand: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0,
  };
}

/** Adds one cell inside the work limit to `totals`. */
function addCellStats(totals: VolumeTotals, stats: CellStats, cell: number): void {
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
}

/** Roll cells up; without `cells`, every cell of the grid that touches the work limit. */
export function rollUpCells(stats: CellStats, cells?: ArrayLike<number>): VolumeTotals {
  const totals = emptyVolumeTotals();
  const visit = (cell: number) => {
    if (stats.areaInLimit[cell] > 0) addCellStats(totals, stats, cell);
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

/**
 * The name of the row that holds the cells inside the work limit that no zone holds. Every such
 * cell belongs to exactly one zone or to this row, so the zone rows always add up to the project.
 */
export const UNZONED_NAME = "Unzoned";
/** What the Unzoned row is, in words, wherever it is shown. */
export const UNZONED_NOTE = "Unzoned: the cells inside the work limit that no zone holds, listed so the zone rows add up to the project.";

/** `zoneOfEachCell`'s mark for a cell that no zone holds (it counts in the Unzoned row). */
export const NO_ZONE = -1;

/**
 * Each cell's zone, as its position in `zones`, or NO_ZONE: the one rule of zone membership.
 * A cell that two overlapping zones hold belongs to the first of them in the zones' order (the
 * order the manager gave them), so no cell is counted in two zone rows.
 */
export function zoneOfEachCell(cellGrid: CellGrid, zones: ReadonlyArray<ZoneDefinition>): Int32Array {
  const zoneOfCell = new Int32Array(cellGrid.cols * cellGrid.rows).fill(NO_ZONE);
  zones.forEach((zone, position) => {
    for (const cell of zoneCells(cellGrid, zone)) if (zoneOfCell[cell] === NO_ZONE) zoneOfCell[cell] = position;
  });
  return zoneOfCell;
}

/**
 * Rolls the cells inside the work limit up into the project, each zone (by `zoneOfCell`) and the
 * Unzoned row, which is null when every such cell lies in a zone. `isInLimit` picks the cells;
 * `add` adds one cell to a set's totals. Every cell goes into exactly one row, so the rows sum to
 * the project for every figure.
 */
export function rollUpByZone<Totals>(
  zoneOfCell: Int32Array,
  zoneCount: number,
  isInLimit: (cell: number) => boolean,
  empty: () => Totals,
  add: (totals: Totals, cell: number) => void,
): { project: Totals; zones: Totals[]; unzoned: Totals | null } {
  const project = empty();
  const zones = Array.from({ length: zoneCount }, empty);
  let unzoned: Totals | null = null;
  for (let cell = 0; cell < zoneOfCell.length; cell++) {
    if (!isInLimit(cell)) continue;
    add(project, cell);
    const zone = zoneOfCell[cell];
    if (zone === NO_ZONE) add((unzoned ??= empty()), cell);
    else add(zones[zone], cell);
  }
  return { project, zones, unzoned };
}

/** Each zone's totals, then the Unzoned row (id null) when any cell inside the work limit lies in no zone. */
export function rollUpZones(cellGrid: CellGrid, stats: CellStats, zones: ReadonlyArray<ZoneDefinition>): Array<{ id: string | null; totals: VolumeTotals }> {
  const rows = rollUpByZone(zoneOfEachCell(cellGrid, zones), zones.length, (cell) => stats.areaInLimit[cell] > 0, emptyVolumeTotals, (totals, cell) => addCellStats(totals, stats, cell));
  return [
    ...zones.map((zone, position) => ({ id: zone.id, totals: rows.zones[position] })),
    ...(rows.unzoned ? [{ id: null, totals: rows.unzoned }] : []),
  ];
}
