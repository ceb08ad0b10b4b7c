import { CELL_STATUSES, cellStatusCode, type CellStatus } from "../../../shared/cell-status";
import { cellLabel, cellRowCol } from "../../../shared/grid/cell-grid";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import { computeVolumesFromRasters, type EngineGrids, type EngineResult, type EngineSettings, type ProgressCallback, type SampledSurveys } from "../../../shared/pipeline";
import type { DatedSurvey, SurveysInForce } from "../../../shared/surveys-in-force";
import { cubicToVolumeUnit, type LengthUnit } from "../../../shared/units";
import { addCellToTotals, emptyFigureTotals, type CellVolumes, type FigureTotals } from "../../../shared/volumes/figure-totals";
import { noSurvey } from "../../../shared/volumes/latest-bottom";
import { NO_ZONE, UNZONED_NAME, rollUpByZone, zoneOfEachCell } from "../../../shared/volumes/rollup";

/**
 * A project's figures from the surveys in force, already sampled on the project's raster: the
 * latest per-cell figures and one snapshot per survey date (the state after every survey of that
 * date). A cell is `confirmed` when it is at firm sand and a closeout survey supplies most of its
 * latest bottom. The grids are laid once; each date stacks the bottoms of the surveys up to it.
 * Pure: typed arrays in, plain figures out, so it runs in an engine thread unchanged.
 */
export interface ComputationZone {
  id: number;
  name: string;
  polygon: ProjectedMultiPolygon;
}

/** One cell's figures as a recompute stores them (a cell_results row): volumes in the project's volume unit. */
export interface CellResultFigures extends CellVolumes {
  row: number;
  col: number;
  label: string;
  zoneId: number | null;
  /** Project length unit; null when nothing in the cell was surveyed. */
  meanRemainingThickness: number | null;
  coverage: number;
  areaInLimit: number;
  status: CellStatus;
  latestSurveyId: number | null;
}

export interface SnapshotFigures {
  surveyedOn: string;
  lastSurveyId: number;
  totals: FigureTotals;
  /** Every zone in the zones' order, then the Unzoned row (zoneId null) when any cell inside the work limit lies in no zone: they sum to `totals`. */
  zones: Array<{ zoneId: number | null; name: string; totals: FigureTotals }>;
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

export interface ProjectFigures {
  cells: CellResultFigures[];
  totals: FigureTotals;
  snapshots: SnapshotFigures[];
}

export interface FiguresInput {
  inForce: SurveysInForce<DatedSurvey>;
  grids: EngineGrids;
  /** Every survey in force sampled and clipped on `grids`; `progress` in the order of `inForce.later`. */
  sampled: SampledSurveys;
  zones: ComputationZone[];
  settings: EngineSettings;
  lengthUnit: LengthUnit;
}

interface StateFigures {
  result: EngineResult;
  /** Per cell: CELL_STATUSES code. */
  status: Uint8Array;
  /** Per cell: id of the survey supplying most of the latest bottom, or -1. */
  latestSurvey: Int32Array;
}

/** Statuses with `confirmed`, and which survey supplies each cell's latest bottom. */
function stateFigures(result: EngineResult, newestFirst: DatedSurvey[]): StateFigures {
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

/** The figures of every survey date, and the engine's latest state (the last date's). */
export function computeProjectFigures(input: FiguresInput, onProgress?: ProgressCallback): { figures: ProjectFigures; latest: EngineResult } {
  const { inForce, grids, sampled, settings } = input;
  const { baseline, later } = inForce;
  const volume = (cubic: number) => cubicToVolumeUnit(cubic, input.lengthUnit);

  // Snapshot dates: the baseline's, then each later survey date; each state includes every survey up to it.
  const dates = [...new Set([baseline.surveyedOn, ...later.map((survey) => survey.surveyedOn)])].sort();
  const snapshots: SnapshotFigures[] = [];
  const zoneOfCell = zoneOfEachCell(grids.cellGrid, input.zones.map((zone) => ({ id: String(zone.id), polygon: zone.polygon })));
  let finalState: StateFigures | null = null;
  dates.forEach((date, dateIndex) => {
    // `later` is in date order, so the surveys up to a date are a prefix of it.
    const included = later.filter((survey) => survey.surveyedOn <= date);
    const result = computeVolumesFromRasters(grids, { ...sampled, progress: sampled.progress.slice(0, included.length) }, settings);
    const state = stateFigures(result, [...included].reverse().concat([baseline]));
    const { cells } = result;
    const remainingVolumes = new Float32Array(cells.count);
    const removedVolumes = new Float32Array(cells.count);
    for (let cell = 0; cell < cells.count; cell++) {
      remainingVolumes[cell] = volume(cells.remainingVolumeCubicLength[cell]);
      removedVolumes[cell] = volume(cells.removedVolumeCubicLength[cell]);
    }
    const rows = rollUpByZone(zoneOfCell, input.zones.length, (cell) => cells.areaInLimit[cell] > 0, emptyFigureTotals,
      (totals, cell) => addCellToTotals(totals, cellVolumes(cells, cell, volume), state.status[cell]));
    const totals = rows.project;
    const zones: SnapshotFigures["zones"] = input.zones.map((zone, position) => ({ zoneId: zone.id, name: zone.name, totals: rows.zones[position] }));
    if (rows.unzoned) zones.push({ zoneId: null, name: UNZONED_NAME, totals: rows.unzoned });
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
    onProgress?.(`figures (${date})`, (dateIndex + 1) / dates.length);
  });

  const state = finalState as unknown as StateFigures; // there is always the baseline's date
  const { result } = state;
  const cellFigures: CellResultFigures[] = [];
  for (let cell = 0; cell < result.cells.count; cell++) {
    const area = result.cells.areaInLimit[cell];
    if (!(area > 0)) continue;
    const { row, col } = cellRowCol(result.cellGrid, cell);
    const thickness = result.cells.meanRemainingThickness[cell];
    cellFigures.push({
      row,
      col,
      label: cellLabel(row, col),
      zoneId: zoneOfCell[cell] === NO_ZONE ? null : input.zones[zoneOfCell[cell]].id,
      ...cellVolumes(result.cells, cell, volume),
      meanRemainingThickness: Number.isNaN(thickness) ? null : thickness,
      coverage: result.cells.coverage[cell],
      areaInLimit: area,
      status: CELL_STATUSES[state.status[cell]],
      latestSurveyId: state.latestSurvey[cell] >= 0 ? state.latestSurvey[cell] : null,
    });
  }
  return { figures: { cells: cellFigures, totals: snapshots[snapshots.length - 1].totals, snapshots }, latest: result };
}

function cellVolumes(cells: EngineResult["cells"], cell: number, volume: (cubic: number) => number): CellVolumes {
  return {
    plannedVolume: volume(cells.plannedVolumeCubicLength[cell]),
    removedVolume: volume(cells.removedVolumeCubicLength[cell]),
    depositedVolume: volume(cells.depositedVolumeCubicLength[cell]),
    remainingVolume: volume(cells.remainingVolumeCubicLength[cell]),
  };
}
