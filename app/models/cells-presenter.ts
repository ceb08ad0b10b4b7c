import type { CellVolumes } from "../../shared/volumes/figure-totals";
import { cellIndex, type CellGrid } from "../../shared/grid/cell-grid";
import { CELL_STATUSES, type CellStatus } from "../../shared/cell-status";
import { OUTSIDE_WORK_LIMIT } from "../../shared/palette";
import { unitLabel, type LengthUnit } from "../../shared/units";

/**
 * The map's cell data: the grid definition and compact per-cell arrays laid row-major over the
 * grid (index = (row − firstRow) · cols + (col − firstCol)). The browser builds the cell outlines
 * from the definition, so the payload grows by a few bytes per cell, never by a polygon per cell.
 */
export interface CellsPayload {
  projectId: number;
  crs: { code: string; definition: string };
  lengthUnit: LengthUnit;
  labels: { length: string; volume: string };
  grid: CellGrid | null;
  statuses: readonly CellStatus[];
  zones: Array<{ id: number; name: string }>;
  computedAt: string | null;
  /** Status codes into `statuses`; −1 outside the work limit. */
  status: number[];
  /** Mean remaining thickness (length unit), 0.01; null where nothing was surveyed. */
  remainingThickness: Array<number | null>;
  /** Volumes in the project volume unit, 0.1. */
  removedVolume: number[];
  remainingVolume: number[];
  plannedVolume: number[];
  /** Surveyed share of the cell, 0.001. */
  coverage: number[];
  /** Index into `zones`; −1 for none. */
  zone: number[];
}

/** One stored cell's figures, as the database gives them. */
export interface CellFigures {
  row: number;
  col: number;
  status: CellStatus;
  meanRemainingThickness: number | null;
  removedVolume: number;
  remainingVolume: number;
  plannedVolume: number;
  coverage: number;
  zoneId: number | null;
  computedAt: Date | string;
}

export interface CellsPresenterInput {
  projectId: number;
  crs: { code: string; definition: string };
  lengthUnit: LengthUnit;
  grid: CellGrid | null;
  zones: Array<{ id: number; name: string }>;
  cells: readonly CellFigures[];
}

// Math.round over a power of ten, not Number(toFixed()): a tenth of the time at 100,000 cells, and
// the quotient of an integer by 10ⁿ is the double nearest the decimal, so JSON prints it short.
const roundTo = (digits: number) => {
  const scale = 10 ** digits;
  return (value: number) => Math.round(value * scale) / scale;
};

/** The payload from the stored figures: pure, so the benchmark runs it on a synthetic bay. */
export function presentCellsPayload(input: CellsPresenterInput): CellsPayload {
  const { grid } = input;
  const zoneIndex = new Map(input.zones.map((zone, index) => [zone.id, index]));
  const count = grid ? grid.cols * grid.rows : 0;
  const status = new Array<number>(count).fill(OUTSIDE_WORK_LIMIT);
  const remainingThickness = new Array<number | null>(count).fill(null);
  const removedVolume = new Array<number>(count).fill(0);
  const remainingVolume = new Array<number>(count).fill(0);
  const plannedVolume = new Array<number>(count).fill(0);
  const coverage = new Array<number>(count).fill(0);
  const zone = new Array<number>(count).fill(-1);
  let computedAt: Date | null = null;
  if (grid) {
    const two = roundTo(2), one = roundTo(1), three = roundTo(3);
    for (const cell of input.cells) {
      const index = cellIndex(grid, cell.row, cell.col);
      if (index < 0) continue;
      status[index] = CELL_STATUSES.indexOf(cell.status);
      remainingThickness[index] = cell.meanRemainingThickness === null ? null : two(cell.meanRemainingThickness);
      removedVolume[index] = one(cell.removedVolume);
      remainingVolume[index] = one(cell.remainingVolume);
      plannedVolume[index] = one(cell.plannedVolume);
      coverage[index] = three(cell.coverage);
      zone[index] = cell.zoneId === null ? -1 : zoneIndex.get(cell.zoneId) ?? -1;
      const at = new Date(cell.computedAt);
      if (!computedAt || at > computedAt) computedAt = at;
    }
  }
  return {
    projectId: input.projectId,
    crs: input.crs,
    lengthUnit: input.lengthUnit,
    labels: { length: unitLabel(input.lengthUnit), volume: unitLabel(input.lengthUnit, "volume") },
    grid,
    statuses: CELL_STATUSES,
    zones: input.zones,
    computedAt: computedAt ? computedAt.toISOString() : null,
    status,
    remainingThickness,
    removedVolume,
    remainingVolume,
    plannedVolume,
    coverage,
    zone,
  };
}

/** A stored cell's figures as every cell view shows them (inspector, quantities export). */
export interface StoredCellFigures<Status extends string = string> extends CellVolumes {
  label: string;
  row: number;
  col: number;
  status: Status;
  meanRemainingThickness: number | null;
  coverage: number;
  areaInLimit: number;
}

/** Picks the figures out of a stored cell row (a plain object, never the model instance). */
export function presentStoredCellFigures<Status extends string>(cell: StoredCellFigures<Status>): StoredCellFigures<Status> {
  return {
    label: cell.label,
    row: cell.row,
    col: cell.col,
    status: cell.status,
    plannedVolume: cell.plannedVolume,
    removedVolume: cell.removedVolume,
    depositedVolume: cell.depositedVolume,
    remainingVolume: cell.remainingVolume,
    meanRemainingThickness: cell.meanRemainingThickness,
    coverage: cell.coverage,
    areaInLimit: cell.areaInLimit,
  };
}

/** GET /api/projects/<id>/cells/<label>: one cell's figures, soundings, history and assignments. */
export interface CellDetail extends StoredCellFigures<CellStatus> {
  zone: string | null;
  soundings: number | null;
  workingDepth: number | null;
  history: Array<{ date: string; remainingVolume: number; removedVolume: number; status: CellStatus | null }>;
  assignments: Array<{ date: string; team: string; hose: string; notes: string }>;
}
