import type { CellGrid } from "../grid/cell-grid";
import { cubicToVolumeUnit, type LengthUnit } from "../units";
import type { RasterGrid, RasterPrecision, RasterValues } from "../surface/raster";
import { computeCellStats, type CellStats, type CellStatusRules } from "./cell-stats";
import { stackLatestBottom } from "./latest-bottom";
import { rollUpByZone } from "./rollup";

/**
 * A pay period: the figures between two surveys in force. The bottom "as of" a survey is the
 * stack of that survey and every earlier one in force down to the baseline (each node from the
 * newest of them with data), exactly as the latest bottom is stacked from all of them; so the
 * period from the baseline to the latest survey is today's figures, and consecutive periods add
 * up to the whole. The per-cell integrals are the engine's one `computeCellStats`, with the
 * period's two bottoms as its before and after surfaces.
 */

/** The rasters a period needs, sampled and clipped on one raster grid. */
export interface PeriodRasters {
  muckTop: RasterValues;
  firm: RasterValues;
  /** The progress and closeout surveys in force, oldest first (the order they are stacked in). */
  progress: readonly RasterValues[];
}

/**
 * The bottom as of the survey at `position` in the surveys in force (0 = the baseline, k = the
 * k-th later survey): the later surveys up to it stacked newest first over the baseline.
 */
export function bottomAsOf(grid: RasterGrid, rasters: PeriodRasters, position: number, precision: RasterPrecision): RasterValues {
  if (!(position >= 0 && position <= rasters.progress.length)) throw new Error(`no survey in force at position ${position}`);
  return stackLatestBottom(grid, rasters.progress.slice(0, position).reverse().concat([rasters.muckTop]), precision).values;
}

export interface PeriodGrids {
  cellGrid: CellGrid;
  rasterGrid: RasterGrid;
  nodeCell: Int32Array;
}

/**
 * Per-cell figures of the period from the survey at position `from` to the one at `to` (positions
 * as in `bottomAsOf`, `from` < `to`), in the project's cubic length unit: removed, paid and
 * over-dredge (split at firm sand less `overDredgeAllowance`), deposited, and remaining at the end.
 */
export function computePeriodCells(
  grids: PeriodGrids,
  rasters: PeriodRasters,
  from: number,
  to: number,
  rules: CellStatusRules,
  overDredgeAllowance: number,
  precision: RasterPrecision = "float64",
): CellStats {
  return computePeriod(grids, rasters, from, to, rules, overDredgeAllowance, precision).stats;
}

/** `computePeriodCells` with the period's two bottoms it integrated between (what the band's depths are read from). */
export function computePeriod(
  grids: PeriodGrids,
  rasters: PeriodRasters,
  from: number,
  to: number,
  rules: CellStatusRules,
  overDredgeAllowance: number,
  precision: RasterPrecision = "float64",
): { stats: CellStats; before: RasterValues; after: RasterValues } {
  if (!(from < to)) throw new Error("a period runs from an earlier survey to a later one");
  const before = bottomAsOf(grids.rasterGrid, rasters, from, precision);
  const after = bottomAsOf(grids.rasterGrid, rasters, to, precision);
  const stats = computeCellStats(grids.cellGrid, grids.rasterGrid, grids.nodeCell, { muckTop: rasters.muckTop, firm: rasters.firm, before, after }, rules, overDredgeAllowance);
  return { stats, before, after };
}

/** A period's volumes of a cell or a set of cells, in the project's volume unit (yd³ or m³). */
export interface PeriodVolumes {
  removedVolume: number;
  paidVolume: number;
  overDredgeVolume: number;
  depositedVolume: number;
  /** At the end of the period: the bottom then down to firm sand. */
  remainingVolume: number;
}

/** The period's volume columns in the order every table and export lists them. */
export const PERIOD_VOLUME_KEYS = ["removedVolume", "paidVolume", "overDredgeVolume", "depositedVolume", "remainingVolume"] as const satisfies ReadonlyArray<keyof PeriodVolumes>;

export function emptyPeriodVolumes(): PeriodVolumes {
  return { removedVolume: 0, paidVolume: 0, overDredgeVolume: 0, depositedVolume: 0, remainingVolume: 0 };
}

/** One cell's period volumes in the project's volume unit. */
export function periodCellVolumes(stats: CellStats, cell: number, unit: LengthUnit): PeriodVolumes {
  return {
    removedVolume: cubicToVolumeUnit(stats.removedVolumeCubicLength[cell], unit),
    paidVolume: cubicToVolumeUnit(stats.paidVolumeCubicLength[cell], unit),
    overDredgeVolume: cubicToVolumeUnit(stats.overDredgeVolumeCubicLength[cell], unit),
    depositedVolume: cubicToVolumeUnit(stats.depositedVolumeCubicLength[cell], unit),
    remainingVolume: cubicToVolumeUnit(stats.remainingVolumeCubicLength[cell], unit),
  };
}

/**
 * The period rolled up into the project, each zone (`zoneOfCell`, as shared/volumes/rollup gives
 * it) and the Unzoned row: every cell inside the work limit in exactly one row, so they add up.
 */
export function rollUpPeriod(stats: CellStats, zoneOfCell: Int32Array, zoneCount: number, unit: LengthUnit) {
  return rollUpByZone(zoneOfCell, zoneCount, (cell) => stats.areaInLimit[cell] > 0, emptyPeriodVolumes, (totals, cell) => {
    const volumes = periodCellVolumes(stats, cell, unit);
    for (const key of PERIOD_VOLUME_KEYS) totals[key] += volumes[key];
  });
}
