import type { ProjectView } from "~/lib/auth/project-view.server";
import { findProject } from "~/lib/auth/project-view.server";
import { lostWorkingDayShares } from "../../shared/progress/lost-hours";
import { getWaterQualitySettings, listStopWork, type StopWorkView } from "./water-quality.server";
import { listStandDowns, type StandDownView } from "./wildlife.server";
import { minutesOfClock as minutesOf } from "../../shared/local-time";
import { instantOfClock } from "../../shared/daily-report/local-periods";
import { DailyReport } from "~/lib/db.server";
import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { oncePerRequest } from "~/lib/http/request-scope.server";

/**
 * What stops work on the project right now: open turbidity stop-work events and wildlife
 * stand-downs in force. Every project page shows them in one banner; the map's assign panel says
 * work is stopped.
 */
export interface Stoppages {
  stopWork: StopWorkView[];
  standDowns: StandDownView[];
  /**
   * The server's clock when read, so the page's countdown starts from the same instant; null when
   * nothing is in force (no countdown, and a page that shows no stoppage does not change with the clock).
   */
  nowMs: number | null;
  timeZone: string;
}

export async function currentStoppages(project: ProjectView, nowMs = Date.now()): Promise<Stoppages> {
  const [stopWork, standDowns] = await Promise.all([listStopWork(project, { openOnly: true }, nowMs), listStandDowns(project, { activeOnly: true }, nowMs)]);
  return { stopWork, standDowns, nowMs: stopWork.length + standDowns.length > 0 ? nowMs : null, timeZone: project.timeZone };
}

/**
 * `currentStoppages` for a page's loaders, under one key of the read cache and once per request
 * (even with the cache off): the project layout's banner and the map's assign panel share one read.
 */
export function currentStoppagesFor(request: Request, project: ProjectView): Promise<Stoppages> {
  const key = `stoppages:${project.id}`;
  return oncePerRequest(request, key, () => cachedReadFor(request, key, () => currentStoppages(project)));
}

/** One sentence for the assign panel; null when nothing stops work. */
export function workStoppedMessage(stoppages: Stoppages): string | null {
  const reasons = [
    ...stoppages.stopWork.map((event) => `a turbidity exceedance at ${event.station}`),
    ...stoppages.standDowns.map((standDown) => `a ${standDown.species} stand-down`),
  ];
  if (reasons.length === 0) return null;
  return `Work is stopped: ${reasons.join(" and ")}. No cells can be assigned for today until it is cleared (later days may be planned), and no in-water work meanwhile.`;
}

/**
 * The spells of weather downtime entered on the project's daily reports, as instants (local
 * wall-clock times on each report's day, in the project's time zone).
 */
async function weatherDowntimeSpans(project: ProjectView): Promise<Array<{ startMs: number; endMs: number }>> {
  const reports = await DailyReport.findAll({ where: { projectId: project.id }, attributes: ["id", "localDate", "entered"] });
  return reports.flatMap((report) => report.entered.weatherDowntime.flatMap((spell) => {
    const startMs = instantOfClock(report.localDate, spell.start, project.timeZone);
    const endMs = instantOfClock(report.localDate, spell.end, project.timeZone);
    return startMs === null || endMs === null ? [] : [{ startMs, endMs }];
  }));
}

/**
 * The share of each working day lost to turbidity stop-work events, wildlife stand-downs (open
 * ones to now) and the weather downtime entered on the daily reports, within the project's working
 * hours (its setting, else the water-quality work day), for production and forecasts; and the hours
 * that makes in all, for the page to say. An hour lost to two causes counts once.
 */
export async function lostWorkingTime(project: ProjectView, nowMs = Date.now()): Promise<{ shares: Map<number, number>; lostHours: number; workingHours: string }> {
  const [stopWork, standDowns, weather, row, settings] = await Promise.all([listStopWork(project, {}, nowMs), listStandDowns(project, {}, nowMs), weatherDowntimeSpans(project), findProject(project.id), getWaterQualitySettings(project)]);
  const start = row?.workDayStart && row.workDayEnd ? row.workDayStart : settings.workdayStart;
  const end = row?.workDayStart && row.workDayEnd ? row.workDayEnd : settings.workdayEnd;
  const stoppages = [
    ...stopWork.map((event) => ({ startMs: Date.parse(event.openedAt), endMs: event.resumedAt ? Date.parse(event.resumedAt) : nowMs })),
    ...standDowns.map((standDown) => ({ startMs: Date.parse(standDown.startedAt), endMs: standDown.until ? Math.min(Date.parse(standDown.until), nowMs) : nowMs })),
    ...weather.map((spell) => ({ startMs: spell.startMs, endMs: Math.min(spell.endMs, nowMs) })),
  ];
  const hours = { startMinutes: minutesOf(start), endMinutes: minutesOf(end) };
  const shares = lostWorkingDayShares(stoppages, hours, project.timeZone);
  const dayHours = (hours.endMinutes - hours.startMinutes) / 60;
  const lostHours = [...shares.values()].reduce((sum, share) => sum + share * dayHours, 0);
  return { shares, lostHours, workingHours: `${start}–${end}` };
}
