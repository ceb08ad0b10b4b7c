import type { CellCounts, CellVolumes } from "../../shared/volumes/figure-totals";
import { Op } from "sequelize";
import { RATE_WINDOW_CALENDAR_DAYS, forecastFinish, type ZoneForecast } from "../../shared/progress/forecast";
import { percentCellsAtFirmSand, percentCompleteByVolume } from "../../shared/progress/percent-complete";
import { productionIntervals, type ProductionInterval } from "../../shared/progress/production";
import { progressSeries } from "../../shared/progress/time-series";
import { THIN_INTERVAL_WORKING_DAYS, workingCalendar, type WorkingDayBasis } from "../../shared/progress/working-days";
import { UNZONED_NAME } from "../../shared/volumes/rollup";
import { unitLabel, volumeUnitFor, type VolumeUnit } from "../../shared/units";
import { CellResult, Survey, SurveySnapshot, Zone } from "~/lib/db.server";
import { loggedDiveDates } from "./dives.server";
import { loggedShiftDates } from "./dewatering.server";
import { lostWorkingTime } from "./stoppages.server";
import { loadEndAreaCrossCheck, type EndAreaCrossCheck } from "./end-area-check.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { cachedReadFor } from "~/lib/cache/read-cache.server";

/**
 * The project's progress as the manager reads it: per zone and for the project, the latest
 * figures (from the cell results), the cumulative series (from the snapshots), production per
 * working day and a forecast finish per zone. Plain objects only.
 */

/** Volumes in the project's volume unit. */
export interface ProgressFigures extends Omit<CellVolumes, "depositedVolume">, CellCounts {
  /** 0–100; null without a planned volume. */
  percentCompleteByVolume: number | null;
  /** 0–100; null without cells. */
  percentCellsAtFirmSand: number | null;
  /** Date of the newest survey that supplies any of these cells' latest bottom. */
  lastSurveyOn: string | null;
}

export interface ZoneProgress extends ProgressFigures {
  /** null for the Unzoned row: the cells inside the work limit that no zone holds. */
  zoneId: number | null;
  name: string;
  /** The zone's colour from the palette (shared/zone-colours.ts); null for the Unzoned row. */
  colour: string | null;
  forecast: ZoneForecast;
}

export interface ProgressView {
  projectId: number;
  volumeUnit: VolumeUnit;
  /** "yd³" or "m³", for every volume in this object. */
  volumeLabel: string;
  hasFigures: boolean;
  /** Why there are no figures, when there are none. */
  reason: string | null;
  total: ProgressFigures;
  /** Every zone, then the Unzoned row when any cell lies in no zone: they add up to `total`. */
  zones: ZoneProgress[];
  series: {
    dates: string[];
    totalRemovedVolume: number[];
    zones: Array<{ zoneId: number | null; name: string; colour: string | null; removedVolume: Array<number | null> }>;
  };
  production: ProductionInterval[];
  workingDayBasis: WorkingDayBasis;
  /** The forecast's assumptions, in words, for the screen and the JSON alike. */
  assumptions: string[];
  /** The end-area check of the removed volume, when asked for and there are figures. */
  crossCheck: EndAreaCrossCheck | null;
}

/** Half a cubic unit: below what a survey can resolve over a 20 ft cell, so a zone with less left is done. */
const NEGLIGIBLE_VOLUME = 0.5;
const CHANGE_SHARE = 0.05;

function emptyFigures(): ProgressFigures {
  return {
    plannedVolume: 0, removedVolume: 0, remainingVolume: 0, percentCompleteByVolume: null, percentCellsAtFirmSand: null,
    cells: 0, cellsAtFirmSand: 0, cellsConfirmed: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0, lastSurveyOn: null,
  };
}

type CellRow = Pick<CellResult, "zoneId" | "plannedVolume" | "removedVolume" | "remainingVolume" | "status" | "latestSurveyId">;

function addCell(figures: ProgressFigures, cell: CellRow, surveyDate: string | null) {
  figures.plannedVolume += cell.plannedVolume;
  figures.removedVolume += cell.removedVolume;
  figures.remainingVolume += cell.remainingVolume;
  figures.cells++;
  if (cell.status === "confirmed") {
    figures.cellsConfirmed++;
    figures.cellsAtFirmSand++; // confirmed cells are at firm sand, proven by a closeout survey
  } else if (cell.status === "at-firm-sand") figures.cellsAtFirmSand++;
  else if (cell.status === "in-work") figures.cellsInWork++;
  else if (cell.status === "untouched") figures.cellsUntouched++;
  else figures.cellsNoData++;
  if (surveyDate && (figures.lastSurveyOn === null || surveyDate > figures.lastSurveyOn)) figures.lastSurveyOn = surveyDate;
}

function finish(figures: ProgressFigures): ProgressFigures {
  figures.percentCompleteByVolume = percentCompleteByVolume(figures.plannedVolume, figures.remainingVolume);
  figures.percentCellsAtFirmSand = percentCellsAtFirmSand(figures.cellsAtFirmSand, figures.cells);
  return figures;
}

export async function loadProgress(project: ProjectView, options: { crossCheck?: boolean } = {}): Promise<ProgressView> {
  const volumeUnit = volumeUnitFor(project.lengthUnit);
  const volumeLabel = unitLabel(project.lengthUnit, "volume");
  const [zones, cells, snapshots, surveys, diveDates, lost, shiftDates] = await Promise.all([
    Zone.findAll({ where: { projectId: project.id }, order: [["sortOrder", "ASC"], ["name", "ASC"]], attributes: ["id", "name", "colour"] }),
    CellResult.findAll({
      where: { projectId: project.id, areaInLimit: { [Op.gt]: 0 } },
      attributes: ["zoneId", "plannedVolume", "removedVolume", "remainingVolume", "status", "latestSurveyId"],
      raw: true,
    }),
    SurveySnapshot.findAll({ where: { projectId: project.id }, attributes: ["surveyedOn", "totals", "zones"], order: [["surveyedOn", "ASC"]] }),
    Survey.findAll({ where: { projectId: project.id, status: "active" }, attributes: ["id", "surveyedOn"], raw: true }),
    loggedDiveDates(project.id),
    lostWorkingTime(project),
    loggedShiftDates(project.id),
  ]);
  const crossCheck = options.crossCheck && cells.length > 0 ? await loadEndAreaCrossCheck(project) : null;
  const surveyDate = new Map(surveys.map((survey) => [survey.id, String(survey.surveyedOn)]));

  const total = emptyFigures();
  const byZone = new Map(zones.map((zone) => [zone.id, emptyFigures()]));
  const unzoned = emptyFigures();
  for (const cell of cells as unknown as CellRow[]) {
    const date = cell.latestSurveyId === null ? null : surveyDate.get(Number(cell.latestSurveyId)) ?? null;
    addCell(total, cell, date);
    // The engine gave each cell its one zone (shared/volumes/rollup.ts); a cell in none is Unzoned.
    addCell((cell.zoneId === null ? undefined : byZone.get(Number(cell.zoneId))) ?? unzoned, cell, date);
  }
  const rows: Array<{ zoneId: number | null; name: string; colour: string | null; figures: ProgressFigures }> = zones.map((zone) => ({ zoneId: zone.id, name: zone.name, colour: zone.colour, figures: byZone.get(zone.id)! }));
  if (unzoned.cells > 0) rows.push({ zoneId: null, name: UNZONED_NAME, colour: null, figures: unzoned });

  const series = progressSeries(
    snapshots.map((snapshot) => ({
      surveyedOn: String(snapshot.surveyedOn),
      removedVolume: snapshot.totals.removedVolume,
      remainingVolume: snapshot.totals.remainingVolume,
      zones: snapshot.zones.map((zone) => ({ zoneId: zone.zoneId, removedVolume: zone.totals.removedVolume, remainingVolume: zone.totals.remainingVolume })),
    })),
    rows.map((row) => row.zoneId),
  );
  const calendar = workingCalendar([...diveDates, ...shiftDates], lost.shares);

  const zoneProgress: ZoneProgress[] = rows.map((zone, index) => {
    const figures = finish(zone.figures);
    const zoneSeries = series.zones[index];
    // A change smaller than 5 % of the zone's planned volume is survey noise (edge lines of passes over
    // a neighbouring zone), not a day's work: it must not set the zone's rate.
    const forecastOptions = { finishedBelowVolume: NEGLIGIBLE_VOLUME, changeThresholdVolume: Math.max(NEGLIGIBLE_VOLUME, CHANGE_SHARE * figures.plannedVolume),
      everyCellAtFirmSand: figures.cells > 0 && figures.cellsAtFirmSand === figures.cells, lostShares: lost.shares,
    };
    return { zoneId: zone.zoneId, name: zone.name, colour: zone.colour, ...figures, forecast: forecastFinish(series.dates, zoneSeries.removedVolume, figures.remainingVolume, forecastOptions) };
  });
  const basisWords = calendar.basis === "days-logged"
    ? "Working days are the days on which dives or dewatering shifts were logged between two survey dates; where an interval has neither, its weekdays (Monday to Friday). Each interval says which it rests on."
    : "No dives or dewatering shifts are logged yet, so working days are weekdays (Monday to Friday) between two survey dates.";
  return {
    projectId: project.id,
    volumeUnit,
    volumeLabel,
    hasFigures: cells.length > 0,
    reason: cells.length > 0 ? null : "No figures yet: they appear once a baseline survey with a probe column is imported for a project with a work limit.",
    total: finish(total),
    zones: zoneProgress,
    series: {
      dates: series.dates,
      totalRemovedVolume: [...series.totalRemovedVolume],
      zones: series.zones.map((zoneSeries, index) => ({
        zoneId: zoneSeries.zoneId,
        name: rows[index].name,
        colour: rows[index].colour,
        removedVolume: [...zoneSeries.removedVolume].map((value) => (Number.isFinite(value) ? value : null)),
      })),
    },
    production: productionIntervals(series.dates, series.totalRemovedVolume, calendar),
    workingDayBasis: calendar.basis,
    assumptions: [
      "Removed volume is measured against the baseline survey; each survey date's figures include every survey up to that date.",
      "Production per working day is the removed volume between two survey dates divided by the working days between them.",
      lost.lostHours > 0
        ? `Hours lost to turbidity stop-work, wildlife stand-downs and the weather downtime entered on the daily reports (${Math.round(lost.lostHours * 10) / 10} h in all, within the working hours ${lost.workingHours}; an hour lost to two causes counts once) are taken out of those working days, for production and forecasts alike; forecasts assume no further stoppages.`
        : "No working hours have been lost to turbidity stop-work, wildlife stand-downs or weather downtime; were any lost, they would come out of the working days.",
      basisWords,
      `An interval resting on fewer than ${THIN_INTERVAL_WORKING_DAYS} working days is thin: its rate is drawn lighter, since one good or bad day swings it.`,
      `A zone's rate is taken over a window of ${RATE_WINDOW_CALENDAR_DAYS} calendar days before the latest survey date: its intervals between surveys that showed a change (of at least 5 % of its planned volume, so edge soundings of a pass over a neighbouring zone do not count) and that end in the window. The mean rate is their removal divided by their weekdays (not the days dives were logged: the finish is counted on weekdays, and a dive log begun part way through an interval would make its rate many times too fast); the range runs from the slowest to the fastest of them.`,
      `The forecast counts weekdays from the latest survey date of the project (never before it) until the remaining volume is gone: the finish at the mean rate, the earliest at the fastest, the latest at the slowest. A zone with no removal measured in the window has no recent rate and no date; a zone with every cell at firm sand, or less than ${NEGLIGIBLE_VOLUME} ${volumeLabel} left, counts as finished.`,
      "A forecast is an estimate, not a schedule: crews, weather, wildlife stand-downs and water-quality holds change it.",
    ],
    crossCheck,
  };
}

/**
 * The progress figures with the end-area check, as the overview and the progress API read them:
 * kept between reading requests until something is written (app/lib/cache/read-cache.server.ts).
 */
export function keptProgress(request: Request, project: ProjectView): Promise<ProgressView> {
  return cachedReadFor(request, `progress-checked:${project.id}`, () => loadProgress(project, { crossCheck: true }));
}
