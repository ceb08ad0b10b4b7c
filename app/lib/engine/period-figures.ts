import { cellLabel, cellRowCol } from "../../../shared/grid/cell-grid";
import type { EngineSettings } from "../../../shared/pipeline";
import type { LengthUnit } from "../../../shared/units";
import { cubicToVolumeUnit } from "../../../shared/units";
import { PERIOD_VOLUME_KEYS, computePeriod, periodCellVolumes, rollUpPeriod, type PeriodGrids, type PeriodRasters, type PeriodVolumes } from "../../../shared/volumes/period";
import { cellElevations, removedVolumeBand, type BandSurvey, type RemovedBand } from "../../../shared/volumes/period-uncertainty";
import { NO_ZONE, UNZONED_NAME, zoneOfEachCell } from "../../../shared/volumes/rollup";
import type { ProjectSurfaces } from "./latest-surfaces";
import type { ComputationZone } from "./project-figures";
import type { PeriodSurfaces } from "./project-state";

/**
 * A pay period's figures from a project's engine state: the rasters the state already holds, so
 * no soundings are read. Pure (typed arrays in, plain figures out); one pass over the raster per
 * period, as a period can run between any two of the surveys in force. It runs as an engine
 * pool job (`EngineWorkerPool.computePeriodFigures`): its input is only what the pass reads
 * (`periodFiguresInput`), copied to the thread, so the request thread never makes the pass.
 */
export interface PeriodFiguresInput {
  /** The raster and cell grids and each raster node's cell. */
  grids: PeriodGrids;
  /** The baseline's bottom, firm sand and the later surveys' bottoms up to `to` (oldest first). */
  rasters: PeriodRasters;
  /** Per survey in force (as `PeriodSurfaces.surveys`), its soundings per grid cell. */
  soundingsPerCell: Uint32Array[];
  /** Positions in the surveys in force (0 = the baseline), from < to. */
  from: number;
  to: number;
  /** In the order the figures were computed with (the project's zone order). */
  zones: ComputationZone[];
  settings: EngineSettings;
  overDredgeAllowance: number;
  lengthUnit: LengthUnit;
  /** Per survey in force (as `periods.surveys`): its IHO S-44 coefficients and where its depths are measured from (project length unit). */
  uncertainty: Array<Omit<BandSurvey, "soundingsPerCell">>;
}

/** The removed volume's 95 % band from the surveys' vertical uncertainty (shared/volumes/period-uncertainty). */
export interface PeriodBand {
  /** ± half-width, project volume unit. */
  removedBandVolume: number;
  /** The removed volume's shift per unit of vertical-reference bias (project volume unit per length unit): the changed area. */
  biasVolumePerUnit: number;
}

export interface PeriodZoneRow extends PeriodVolumes, PeriodBand {
  /** Null for the Unzoned row. */
  zoneId: number | null;
  name: string;
  cells: number;
}

export interface PeriodCellRow extends PeriodVolumes {
  label: string;
  row: number;
  col: number;
  zoneId: number | null;
}

/**
 * The cells' figures as columns, one entry per cell inside the work limit (engine order): typed
 * arrays, so they come back from the engine thread by transfer rather than as a hundred thousand
 * objects the request thread would rebuild. `periodCellRows` gives them as rows.
 */
export interface PeriodCellColumns {
  row: Int32Array;
  col: Int32Array;
  /** The cell's zone id; NaN for a cell in no zone. */
  zoneId: Float64Array;
  removedVolume: Float64Array;
  paidVolume: Float64Array;
  overDredgeVolume: Float64Array;
  depositedVolume: Float64Array;
  remainingVolume: Float64Array;
}

export interface PeriodFigures {
  /** The project's row: the zone rows (with Unzoned) add up to it in every column. */
  total: PeriodVolumes & PeriodBand & { cells: number };
  zones: PeriodZoneRow[];
  cells: PeriodCellColumns;
}

const cellRows = new WeakMap<PeriodCellColumns, PeriodCellRow[]>();

/** The period's cells as rows (label, row, column, zone and volumes), built once per figures and kept with them. */
export function periodCellRows(figures: PeriodFigures): PeriodCellRow[] {
  const columns = figures.cells;
  let rows = cellRows.get(columns);
  if (!rows) {
    rows = Array.from(columns.row, (row, index) => {
      const col = columns.col[index];
      const zoneId = columns.zoneId[index];
      return {
        label: cellLabel(row, col), row, col, zoneId: Number.isNaN(zoneId) ? null : zoneId,
        removedVolume: columns.removedVolume[index], paidVolume: columns.paidVolume[index], overDredgeVolume: columns.overDredgeVolume[index],
        depositedVolume: columns.depositedVolume[index], remainingVolume: columns.remainingVolume[index],
      };
    });
    cellRows.set(columns, rows);
  }
  return rows;
}

/** What a period's pass reads of the engine state, and nothing else (what crosses to the engine thread). */
export function periodFiguresInput(
  state: { surfaces: ProjectSurfaces; periods: PeriodSurfaces },
  from: number,
  to: number,
  inputs: Pick<PeriodFiguresInput, "zones" | "settings" | "overDredgeAllowance" | "lengthUnit" | "uncertainty">,
): PeriodFiguresInput {
  const { result } = state.surfaces;
  return {
    grids: { cellGrid: result.cellGrid, rasterGrid: result.rasterGrid, nodeCell: result.nodeCell },
    // The bottom as of `to` stacks the later surveys up to it: the newer ones are not read.
    rasters: { muckTop: result.rasters.muckTop.values, firm: result.rasters.firm.values, progress: state.periods.progress.slice(0, to) },
    soundingsPerCell: state.periods.soundingsPerCell,
    from, to, ...inputs,
  };
}

export function computePeriodFigures(input: PeriodFiguresInput): PeriodFigures {
  const { grids } = input;
  const { stats, before, after } = computePeriod(
    grids,
    input.rasters,
    input.from,
    input.to,
    input.settings,
    input.overDredgeAllowance,
    input.settings.rasterPrecision ?? "float64",
  );
  const zoneOfCell = zoneOfEachCell(grids.cellGrid, input.zones.map((zone) => ({ id: String(zone.id), polygon: zone.polygon })));
  const rows = rollUpPeriod(stats, zoneOfCell, input.zones.length, input.lengthUnit);
  const bandSurveys = input.uncertainty.map((survey, position) => ({ ...survey, soundingsPerCell: input.soundingsPerCell[position] }));
  const bottoms = { from: cellElevations(grids.nodeCell, before, stats.count), to: cellElevations(grids.nodeCell, after, stats.count) };
  const bands = removedVolumeBand(stats, bandSurveys, input.from, input.to, zoneOfCell, input.zones.length, bottoms);
  const band = ({ bandCubicLength, changedArea }: RemovedBand): PeriodBand => ({
    removedBandVolume: cubicToVolumeUnit(bandCubicLength, input.lengthUnit),
    biasVolumePerUnit: cubicToVolumeUnit(changedArea, input.lengthUnit),
  });
  const cellCounts = new Uint32Array(input.zones.length + 1); // the last: Unzoned
  let inLimit = 0;
  for (let cell = 0; cell < stats.count; cell++) if (stats.areaInLimit[cell] > 0) inLimit++;
  const cells: PeriodCellColumns = {
    row: new Int32Array(inLimit), col: new Int32Array(inLimit), zoneId: new Float64Array(inLimit),
    removedVolume: new Float64Array(inLimit), paidVolume: new Float64Array(inLimit), overDredgeVolume: new Float64Array(inLimit),
    depositedVolume: new Float64Array(inLimit), remainingVolume: new Float64Array(inLimit),
  };
  let index = 0;
  for (let cell = 0; cell < stats.count; cell++) {
    if (!(stats.areaInLimit[cell] > 0)) continue;
    const zone = zoneOfCell[cell];
    cellCounts[zone === NO_ZONE ? input.zones.length : zone]++;
    const { row, col } = cellRowCol(grids.cellGrid, cell);
    cells.row[index] = row;
    cells.col[index] = col;
    cells.zoneId[index] = zone === NO_ZONE ? Number.NaN : input.zones[zone].id;
    const volumes = periodCellVolumes(stats, cell, input.lengthUnit);
    for (const key of PERIOD_VOLUME_KEYS) cells[key][index] = volumes[key];
    index++;
  }
  const zones: PeriodZoneRow[] = input.zones.map((zone, position) => ({ zoneId: zone.id, name: zone.name, cells: cellCounts[position], ...rows.zones[position], ...band(bands.zones[position]) }));
  if (rows.unzoned) zones.push({ zoneId: null, name: UNZONED_NAME, cells: cellCounts[input.zones.length], ...rows.unzoned, ...band(bands.unzoned!) });
  return { total: { ...rows.project, cells: inLimit, ...band(bands.project) }, zones, cells };
}
