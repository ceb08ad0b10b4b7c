import { cellLabel, cellRowCol } from "../../../shared/grid/cell-grid";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import { computeVolumesFromSurfaces, triangulateSurveys, type EngineResult, type EngineSettings, type ProgressCallback, type SurveyPoints } from "../../../shared/pipeline";
import { cubicToVolumeUnit, type LengthUnit } from "../../../shared/units";
import { CELL_STATUSES, cellStatusCode, type CellStatus } from "../../../shared/cell-status";
import { noSurvey } from "../../../shared/volumes/latest-bottom";
import { zoneCells } from "../../../shared/volumes/rollup";

/**
 * A project's figures from its active surveys: the engine run on the active baseline (muck top,
 * and firm sand from its probe), then progress and closeout surveys oldest first. Gives the latest
 * per-cell figures and one snapshot per survey date (the state after every survey of that date).
 * A cell is `confirmed` when it is at firm sand and a closeout survey supplies most of its latest
 * bottom. Pure: typed arrays in, plain figures out, so it can run in a worker thread unchanged.
 */
export type ComputationSurveyKind = "baseline" | "progress" | "closeout";

export interface ComputationSurvey {
  id: number;
  kind: ComputationSurveyKind;
  surveyedOn: string;
  easting: Float64Array;
  northing: Float64Array;
  /** Bottom elevation (project length unit and datum). */
  elevation: Float64Array;
  /** Refusal elevation from the probe; NaN where a row has none; null without a probe column. */
  refusalElevation: Float64Array | null;
}

export interface ComputationZone {
  id: number;
  name: string;
  polygon: ProjectedMultiPolygon;
}

export interface ProjectComputationInput {
  surveys: ComputationSurvey[];
  workLimit: ProjectedMultiPolygon | null;
  zones: ComputationZone[];
  settings: EngineSettings;
  lengthUnit: LengthUnit;
}

export interface CellFigures {
  row: number;
  col: number;
  label: string;
  zoneId: number | null;
  /** Project volume unit (yd³ or m³). */
  plannedVolume: number;
  removedVolume: number;
  depositedVolume: number;
  remainingVolume: number;
  /** Project length unit; null when nothing in the cell was surveyed. */
  meanRemainingThickness: number | null;
  coverage: number;
  areaInLimit: number;
  status: CellStatus;
  latestSurveyId: number | null;
}

export interface FigureTotals {
  plannedVolume: number;
  removedVolume: number;
  depositedVolume: number;
  remainingVolume: number;
  cells: number;
  cellsAtFirmSand: number;
  cellsConfirmed: number;
  cellsInWork: number;
  cellsUntouched: number;
  cellsNoData: number;
}

export interface SnapshotFigures {
  surveyedOn: string;
  lastSurveyId: number;
  totals: FigureTotals;
  zones: Array<{ zoneId: number; name: string; totals: FigureTotals }>;
  cellCols: number;
  cellRows: number;
  firstCol: number;
  firstRow: number;
  /** Row-major over the cell grid, project volume unit. */
  remainingVolumes: Float32Array;
  removedVolumes: Float32Array;
  /** Codes into CELL_STATUSES. */
  statuses: Uint8Array;
}

export interface ProjectComputation {
  baselineSurveyId: number;
  cells: CellFigures[];
  totals: FigureTotals;
  snapshots: SnapshotFigures[];
  /** Share (0–1) of the in-limit cell area each survey's soundings were the latest bottom of, in the final state. */
  latestShareBySurvey: Record<number, number>;
}

function byDateThenId(a: ComputationSurvey, b: ComputationSurvey): number {
  return a.surveyedOn < b.surveyedOn ? -1 : a.surveyedOn > b.surveyedOn ? 1 : a.id - b.id;
}

/** Firm-sand points from the baseline's probe: the baseline's own arrays when every row has a probe (one triangulation serves both). */
export function firmPoints(baseline: ComputationSurvey): SurveyPoints {
  const refusal = baseline.refusalElevation;
  if (refusal === null) throw new Error("the active baseline has no probe column, so there is no firm-sand surface to measure to");
  let finite = 0;
  for (let index = 0; index < refusal.length; index++) if (Number.isFinite(refusal[index])) finite++;
  if (finite === refusal.length) return { easting: baseline.easting, northing: baseline.northing, elevation: refusal };
  const easting = new Float64Array(finite);
  const northing = new Float64Array(finite);
  const elevation = new Float64Array(finite);
  let next = 0;
  for (let index = 0; index < refusal.length; index++) {
    if (!Number.isFinite(refusal[index])) continue;
    easting[next] = baseline.easting[index];
    northing[next] = baseline.northing[index];
    elevation[next] = refusal[index];
    next++;
  }
  return { easting, northing, elevation };
}

function emptyTotals(): FigureTotals {
  return { plannedVolume: 0, removedVolume: 0, depositedVolume: 0, remainingVolume: 0, cells: 0, cellsAtFirmSand: 0, cellsConfirmed: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0 };
}

function addCell(totals: FigureTotals, cell: { plannedVolume: number; removedVolume: number; depositedVolume: number; remainingVolume: number }, status: number) {
  totals.plannedVolume += cell.plannedVolume;
  totals.removedVolume += cell.removedVolume;
  totals.depositedVolume += cell.depositedVolume;
  totals.remainingVolume += cell.remainingVolume;
  totals.cells++;
  if (status === cellStatusCode.confirmed) {
    totals.cellsConfirmed++;
    totals.cellsAtFirmSand++; // a confirmed cell is at firm sand, proven by the closeout
  } else if (status === cellStatusCode["at-firm-sand"]) totals.cellsAtFirmSand++;
  else if (status === cellStatusCode["in-work"]) totals.cellsInWork++;
  else if (status === cellStatusCode.untouched) totals.cellsUntouched++;
  else totals.cellsNoData++;
}

interface StateFigures {
  result: EngineResult;
  /** Per cell: CELL_STATUSES code. */
  status: Uint8Array;
  /** Per cell: id of the survey supplying most of the latest bottom, or -1. */
  latestSurvey: Int32Array;
}

/** Statuses with `confirmed`, and which survey supplies each cell's latest bottom. */
function stateFigures(result: EngineResult, newestFirst: ComputationSurvey[]): StateFigures {
  const cellCount = result.cells.count;
  const surveysCount = newestFirst.length;
  // Node counts per (cell, source survey), source = index into the newest-first list.
  const counts = new Uint32Array(cellCount * surveysCount);
  const { nodeCell, latestSource } = result;
  for (let node = 0; node < nodeCell.length; node++) {
    const cell = nodeCell[node];
    const source = latestSource[node];
    if (cell < 0 || source === noSurvey) continue;
    counts[cell * surveysCount + source]++;
  }
  const status = new Uint8Array(cellCount);
  const latestSurvey = new Int32Array(cellCount).fill(-1);
  for (let cell = 0; cell < cellCount; cell++) {
    let bestSource = -1;
    let bestCount = 0;
    for (let source = 0; source < surveysCount; source++) {
      const count = counts[cell * surveysCount + source];
      if (count > bestCount) {
        bestCount = count;
        bestSource = source;
      }
    }
    const engineStatus = result.cells.status[cell];
    const supplier = bestSource >= 0 ? newestFirst[bestSource] : null;
    latestSurvey[cell] = supplier ? supplier.id : -1;
    status[cell] = engineStatus === cellStatusCode["at-firm-sand"] && supplier?.kind === "closeout" ? cellStatusCode.confirmed : engineStatus;
  }
  return { result, status, latestSurvey };
}

export function computeProjectFigures(input: ProjectComputationInput, onProgress?: ProgressCallback): ProjectComputation | null {
  const baselines = input.surveys.filter((survey) => survey.kind === "baseline").sort(byDateThenId);
  if (baselines.length === 0) return null;
  const baseline = baselines[baselines.length - 1]; // the newest active baseline is the one in force
  const later = input.surveys.filter((survey) => survey.kind !== "baseline").sort(byDateThenId);
  const surfaces = triangulateSurveys(
    { baseline, progress: later, firm: firmPoints(baseline) },
    input.settings.maxEdge,
    onProgress,
  );
  const volume = (cubic: number) => cubicToVolumeUnit(cubic, input.lengthUnit);

  // Snapshot dates: the baseline's, then each later survey date; each state includes every survey up to it.
  const dates = [...new Set([baseline.surveyedOn, ...later.map((survey) => survey.surveyedOn)])].sort();
  const snapshots: SnapshotFigures[] = [];
  let finalState: StateFigures | null = null;
  let zoneCellLists: Array<{ zone: ComputationZone; cells: Uint32Array }> | null = null;
  dates.forEach((date, dateIndex) => {
    const included = later.filter((survey) => survey.surveyedOn <= date);
    const result = computeVolumesFromSurfaces(
      { baseline: surfaces.baseline, firm: surfaces.firm, progress: surfaces.progress.slice(0, included.length) },
      input.workLimit,
      input.settings,
      (stage, fraction) => onProgress?.(`${stage} (${date})`, (dateIndex + fraction) / dates.length),
    );
    const newestFirst = [...included].reverse().concat([baseline]);
    const state = stateFigures(result, newestFirst);
    zoneCellLists ??= input.zones.map((zone) => ({ zone, cells: zoneCells(result.cellGrid, { id: String(zone.id), polygon: zone.polygon }) }));
    const { cells } = result;
    const totals = emptyTotals();
    const remainingVolumes = new Float32Array(cells.count);
    const removedVolumes = new Float32Array(cells.count);
    for (let cell = 0; cell < cells.count; cell++) {
      remainingVolumes[cell] = volume(cells.remainingVolume[cell]);
      removedVolumes[cell] = volume(cells.removedVolume[cell]);
      if (!(cells.areaInLimit[cell] > 0)) continue;
      addCell(totals, cellVolumes(cells, cell, volume), state.status[cell]);
    }
    const zones = zoneCellLists.map(({ zone, cells: members }) => {
      const zoneTotals = emptyTotals();
      for (const cell of members) if (cells.areaInLimit[cell] > 0) addCell(zoneTotals, cellVolumes(cells, cell, volume), state.status[cell]);
      return { zoneId: zone.id, name: zone.name, totals: zoneTotals };
    });
    const lastSurvey = included.length > 0 ? included[included.length - 1] : baseline;
    snapshots.push({
      surveyedOn: date,
      lastSurveyId: lastSurvey.surveyedOn === date ? lastSurvey.id : baseline.id,
      totals,
      zones,
      cellCols: result.cellGrid.cols,
      cellRows: result.cellGrid.rows,
      firstCol: result.cellGrid.firstCol,
      firstRow: result.cellGrid.firstRow,
      remainingVolumes,
      removedVolumes,
      statuses: state.status,
    });
    finalState = state;
  });

  const state = finalState as StateFigures | null;
  if (!state) return null;
  const { result } = state;
  const zoneOfCell = new Map<number, number>();
  for (const { zone, cells } of (zoneCellLists as Array<{ zone: ComputationZone; cells: Uint32Array }> | null) ?? []) for (const cell of cells) if (!zoneOfCell.has(cell)) zoneOfCell.set(cell, zone.id);
  const cellFigures: CellFigures[] = [];
  const latestArea = new Map<number, number>();
  let areaInLimitTotal = 0;
  for (let cell = 0; cell < result.cells.count; cell++) {
    const area = result.cells.areaInLimit[cell];
    if (!(area > 0)) continue;
    const { row, col } = cellRowCol(result.cellGrid, cell);
    const thickness = result.cells.meanRemainingThickness[cell];
    const latestSurveyId = state.latestSurvey[cell] >= 0 ? state.latestSurvey[cell] : null;
    areaInLimitTotal += area;
    if (latestSurveyId !== null) latestArea.set(latestSurveyId, (latestArea.get(latestSurveyId) ?? 0) + area);
    cellFigures.push({
      row,
      col,
      label: cellLabel(row, col),
      zoneId: zoneOfCell.get(cell) ?? null,
      ...cellVolumes(result.cells, cell, volume),
      meanRemainingThickness: Number.isNaN(thickness) ? null : thickness,
      coverage: result.cells.coverage[cell],
      areaInLimit: area,
      status: CELL_STATUSES[state.status[cell]],
      latestSurveyId,
    });
  }
  const latestShareBySurvey: Record<number, number> = {};
  for (const [surveyId, area] of latestArea) latestShareBySurvey[surveyId] = areaInLimitTotal > 0 ? area / areaInLimitTotal : 0;
  return { baselineSurveyId: baseline.id, cells: cellFigures, totals: snapshots[snapshots.length - 1].totals, snapshots, latestShareBySurvey };
}

function cellVolumes(cells: EngineResult["cells"], cell: number, volume: (cubic: number) => number) {
  return {
    plannedVolume: volume(cells.plannedVolume[cell]),
    removedVolume: volume(cells.removedVolume[cell]),
    depositedVolume: volume(cells.depositedVolume[cell]),
    remainingVolume: volume(cells.remainingVolume[cell]),
  };
}
