import { cellStatusCode } from "../cell-status";

/**
 * Totals of a set of cells (a zone, or the project) as the project reports them: volumes in the
 * project's volume unit (yd³ or m³), cell counts by status. A confirmed cell is also counted at
 * firm sand: the closeout proves what the surfaces already showed.
 */
export interface FigureTotals extends CellVolumes, CellCounts {}

/** Volumes of a cell or a set of cells in the project's volume unit: the one list of them. */
export interface CellVolumes {
  plannedVolume: number;
  removedVolume: number;
  depositedVolume: number;
  remainingVolume: number;
}

/** Cells of a set, by status (a confirmed cell is also at firm sand). */
export interface CellCounts {
  cells: number;
  cellsAtFirmSand: number;
  cellsConfirmed: number;
  cellsInWork: number;
  cellsUntouched: number;
  cellsNoData: number;
}

export function emptyFigureTotals(): FigureTotals {
  return { plannedVolume: 0, removedVolume: 0, depositedVolume: 0, remainingVolume: 0, cells: 0, cellsAtFirmSand: 0, cellsConfirmed: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0 };
}

/** Adds one cell with its status code (shared/cell-status). */
export function addCellToTotals(totals: FigureTotals, cell: CellVolumes, status: number): void {
  totals.plannedVolume += cell.plannedVolume;
  totals.removedVolume += cell.removedVolume;
  totals.depositedVolume += cell.depositedVolume;
  totals.remainingVolume += cell.remainingVolume;
  totals.cells++;
  if (status === cellStatusCode.confirmed) {
    totals.cellsConfirmed++;
    totals.cellsAtFirmSand++;
  } else if (status === cellStatusCode["at-firm-sand"]) totals.cellsAtFirmSand++;
  else if (status === cellStatusCode["in-work"]) totals.cellsInWork++;
  else if (status === cellStatusCode.untouched) totals.cellsUntouched++;
  else totals.cellsNoData++;
}
