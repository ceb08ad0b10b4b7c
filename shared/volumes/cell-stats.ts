import type { CellGrid } from "../grid/cell-grid";
import { CELL_STATUSES, cellStatusCode, type MeasuredCellStatus } from "../cell-status";
import type { RasterGrid, RasterValues } from "../surface/raster";

/**
 * Per-cell quantities from the raster surfaces. Every integral is the midpoint rule over the
 * raster nodes that fall in the cell (node value × spacing²), so volumes are in the project's
 * cubic length unit (ft³ or m³); conversion to cubic yards happens at the output.
 *
 * A node counts as surveyed when the muck top, the firm-sand surface, the before surface and the
 * latest bottom all have data there; the volumes and thickness shares use surveyed nodes only.
 */
export interface CellStatusRules {
  /** Remaining muck at most this thick (project length unit) counts as down to firm sand. */
  tolerance: number;
  /** Share (0–1) of the cell's surveyed area that must be within the tolerance for `at-firm-sand`. */
  firmShare: number;
  /** Share (0–1) of the cell's in-limit area that must be surveyed; below it the cell is `no-data`. */
  minCoverage: number;
  /** Mean removed thickness (project length unit) at or below which the cell is `untouched`: survey noise, not dredging. */
  surveyNoise: number;
}

export interface CellSurfaces {
  /** Top of muck at the baseline survey. */
  muckTop: RasterValues;
  /** Refusal (firm-sand) elevation. */
  firm: RasterValues;
  /** The surface removal is measured from (the baseline, or an earlier progress bottom). */
  before: RasterValues;
  /** The latest bottom (newest survey per node). */
  after: RasterValues;
}

/** Flat per-cell arrays, index = (row − firstRow) · cols + (col − firstCol) as in `cellIndex`. */
export interface CellStats {
  count: number;
  /** Area inside the work limit (length²); 0 for grid cells outside it. */
  areaInLimit: Float64Array;
  surveyedArea: Float64Array;
  /** Volumes in the project's cubic length unit (ft³ or m³, see shared/units): the engine's own unit. */
  plannedVolumeCubicLength: Float64Array;
  removedVolumeCubicLength: Float64Array;
  /** The part of `removed` down to the pay surface (firm sand less the over-dredge allowance): what pay practice pays. */
  paidVolumeCubicLength: Float64Array;
  /** The part of `removed` below the pay surface (usually not paid); paid + over-dredge = removed. */
  overDredgeVolumeCubicLength: Float64Array;
  depositedVolumeCubicLength: Float64Array;
  remainingVolumeCubicLength: Float64Array;
  /** remainingVolumeCubicLength ÷ surveyedArea (length); NaN where nothing is surveyed. */
  meanRemainingThickness: Float64Array;
  /** surveyedArea ÷ areaInLimit (0–1); NaN outside the limit. */
  coverage: Float64Array;
  /** Share of surveyed area within the firm-sand tolerance (0–1); NaN where nothing is surveyed. */
  firmShare: Float64Array;
  /** Codes of `CELL_STATUSES` (shared/cell-status), never `confirmed`. */
  status: Uint8Array;
}

export function computeCellStats(
  cellGrid: CellGrid,
  grid: RasterGrid,
  nodeCell: Int32Array,
  surfaces: CellSurfaces,
  rules: CellStatusRules,
  /** How far below firm sand (project length unit) removal is still paid; 0 pays down to firm sand. */
  overDredgeAllowance = 0,
): CellStats {
  const count = cellGrid.cols * cellGrid.rows;
  const inLimitNodes = new Uint32Array(count);
  const surveyedNodes = new Uint32Array(count);
  const firmNodes = new Uint32Array(count);
  const planned = new Float64Array(count);
  const removed = new Float64Array(count);
  const paid = new Float64Array(count);
  const overDredge = new Float64Array(count);
  const deposited = new Float64Array(count);
  const remaining = new Float64Array(count);
  const { muckTop, firm, before, after } = surfaces;
  const tolerance = rules.tolerance;

  for (let node = 0; node < nodeCell.length; node++) {
    const cell = nodeCell[node];
    if (cell < 0) continue;
    inLimitNodes[cell]++;
    const top = muckTop[node];
    const sand = firm[node];
    const from = before[node];
    const to = after[node];
    // NaN in any surface: the node is in the limit but not surveyed (x !== x is the NaN test).
    if (top !== top || sand !== sand || from !== from || to !== to) continue;
    surveyedNodes[cell]++;
    if (top > sand) planned[cell] += top - sand;
    if (from > to) {
      removed[cell] += from - to;
      // The removed column [to, from] split at the pay surface: above it paid, below it over-dredge.
      const payLevel = sand - overDredgeAllowance;
      const paidPart = from <= payLevel ? 0 : from - (to > payLevel ? to : payLevel);
      paid[cell] += paidPart;
      overDredge[cell] += from - to - paidPart;
    } else deposited[cell] += to - from;
    const left = to - sand;
    if (left > 0) remaining[cell] += left;
    if (left <= tolerance) firmNodes[cell]++;
  }

  const pixelArea = grid.spacing * grid.spacing;
  const stats: CellStats = {
    count,
    areaInLimit: new Float64Array(count),
    surveyedArea: new Float64Array(count),
    plannedVolumeCubicLength: planned,
    removedVolumeCubicLength: removed,
    paidVolumeCubicLength: paid,
    overDredgeVolumeCubicLength: overDredge,
    depositedVolumeCubicLength: deposited,
    remainingVolumeCubicLength: remaining,
    meanRemainingThickness: new Float64Array(count),
    coverage: new Float64Array(count),
    firmShare: new Float64Array(count),
    status: new Uint8Array(count),
  };
  for (let cell = 0; cell < count; cell++) {
    planned[cell] *= pixelArea;
    removed[cell] *= pixelArea;
    paid[cell] *= pixelArea;
    overDredge[cell] *= pixelArea;
    deposited[cell] *= pixelArea;
    remaining[cell] *= pixelArea;
    const areaInLimit = inLimitNodes[cell] * pixelArea;
    const surveyedArea = surveyedNodes[cell] * pixelArea;
    stats.areaInLimit[cell] = areaInLimit;
    stats.surveyedArea[cell] = surveyedArea;
    stats.coverage[cell] = areaInLimit > 0 ? surveyedArea / areaInLimit : Number.NaN;
    stats.meanRemainingThickness[cell] = surveyedArea > 0 ? remaining[cell] / surveyedArea : Number.NaN;
    stats.firmShare[cell] = surveyedNodes[cell] > 0 ? firmNodes[cell] / surveyedNodes[cell] : Number.NaN;
    stats.status[cell] = cellStatusCode[classifyCell(stats.coverage[cell], stats.firmShare[cell], surveyedArea > 0 ? removed[cell] / surveyedArea : 0, rules)];
  }
  return stats;
}

/**
 * Status rules, in order: too little surveyed → `no-data`; remaining thickness within the
 * tolerance over at least the firm share of the surveyed area → `at-firm-sand` (also when the
 * baseline was already there); mean removed thickness within survey noise → `untouched`;
 * otherwise `in-work`. The surveyed-area share is used for the firm test because the coverage rule
 * already decides whether a cell has enough data to be judged at all.
 */
export function classifyCell(coverage: number, firmShare: number, meanRemovedThickness: number, rules: CellStatusRules): MeasuredCellStatus {
  if (!(coverage >= rules.minCoverage) || coverage === 0) return "no-data";
  if (firmShare >= rules.firmShare) return "at-firm-sand";
  if (meanRemovedThickness <= rules.surveyNoise) return "untouched";
  return "in-work";
}

export function cellStatusAt(stats: CellStats, cell: number): MeasuredCellStatus {
  return CELL_STATUSES[stats.status[cell]] as MeasuredCellStatus;
}
