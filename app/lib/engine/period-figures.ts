import { cellLabel, cellRowCol } from "../../../shared/grid/cell-grid";
import type { EngineSettings } from "../../../shared/pipeline";
import type { LengthUnit } from "../../../shared/units";
import { cubicToVolumeUnit } from "../../../shared/units";
import { computePeriod, periodCellVolumes, rollUpPeriod, type PeriodVolumes } from "../../../shared/volumes/period";
import { cellElevations, removedVolumeBand, type BandSurvey, type RemovedBand } from "../../../shared/volumes/period-uncertainty";
import { NO_ZONE, UNZONED_NAME, zoneOfEachCell } from "../../../shared/volumes/rollup";
import type { ProjectSurfaces } from "./latest-surfaces";
import type { ComputationZone } from "./project-figures";
import type { PeriodSurfaces } from "./project-state";

/**
 * A pay period's figures from a project's engine state: the rasters the state already holds, so
 * no soundings are read. Pure (typed arrays in, plain figures out); one pass over the raster per
 * request, as a period can run between any two of the surveys in force.
 */
export interface PeriodFiguresInput {
  surfaces: ProjectSurfaces;
  periods: PeriodSurfaces;
  /** Positions in `periods.surveys` (0 = the baseline), from < to. */
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

export interface PeriodFigures {
  /** The project's row: the zone rows (with Unzoned) add up to it in every column. */
  total: PeriodVolumes & PeriodBand & { cells: number };
  zones: PeriodZoneRow[];
  cells: PeriodCellRow[];
}

export function computePeriodFigures(input: PeriodFiguresInput): PeriodFigures {
  const { result } = input.surfaces;
  const { muckTop, firm } = result.rasters;
  const { stats, before, after } = computePeriod(
    result,
    { muckTop: muckTop.values, firm: firm.values, progress: input.periods.progress },
    input.from,
    input.to,
    input.settings,
    input.overDredgeAllowance,
    input.settings.rasterPrecision ?? "float64",
  );
  const zoneOfCell = zoneOfEachCell(result.cellGrid, input.zones.map((zone) => ({ id: String(zone.id), polygon: zone.polygon })));
  const rows = rollUpPeriod(stats, zoneOfCell, input.zones.length, input.lengthUnit);
  const bandSurveys = input.uncertainty.map((survey, position) => ({ ...survey, soundingsPerCell: input.periods.soundingsPerCell[position] }));
  const bottoms = { from: cellElevations(result.nodeCell, before, stats.count), to: cellElevations(result.nodeCell, after, stats.count) };
  const bands = removedVolumeBand(stats, bandSurveys, input.from, input.to, zoneOfCell, input.zones.length, bottoms);
  const band = ({ bandCubicLength, changedArea }: RemovedBand): PeriodBand => ({
    removedBandVolume: cubicToVolumeUnit(bandCubicLength, input.lengthUnit),
    biasVolumePerUnit: cubicToVolumeUnit(changedArea, input.lengthUnit),
  });
  const cellCounts = new Uint32Array(input.zones.length + 1); // the last: Unzoned
  const cells: PeriodCellRow[] = [];
  for (let cell = 0; cell < stats.count; cell++) {
    if (!(stats.areaInLimit[cell] > 0)) continue;
    const zone = zoneOfCell[cell];
    cellCounts[zone === NO_ZONE ? input.zones.length : zone]++;
    const { row, col } = cellRowCol(result.cellGrid, cell);
    cells.push({ label: cellLabel(row, col), row, col, zoneId: zone === NO_ZONE ? null : input.zones[zone].id, ...periodCellVolumes(stats, cell, input.lengthUnit) });
  }
  const zones: PeriodZoneRow[] = input.zones.map((zone, position) => ({ zoneId: zone.id, name: zone.name, cells: cellCounts[position], ...rows.zones[position], ...band(bands.zones[position]) }));
  if (rows.unzoned) zones.push({ zoneId: null, name: UNZONED_NAME, cells: cellCounts[input.zones.length], ...rows.unzoned, ...band(bands.unzoned!) });
  return { total: { ...rows.project, cells: cells.length, ...band(bands.project) }, zones, cells };
}
