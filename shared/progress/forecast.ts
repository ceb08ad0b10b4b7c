import { dayNumber, isoDateOf } from "./calendar-days";
import { addWeekdays, workingCalendar, workingDaysBetween } from "./working-days";

/**
 * A zone's forecast finish from its recent rate. The zone's measured states are the first survey
 * date and every date on which its removed volume changed (a survey that does not cover a zone
 * leaves its figures unchanged, so the project's every interval would spread one zone's work over
 * days spent elsewhere); the intervals between them that end within the window before the latest
 * survey date give the rate. The mean rate is their removal over their working days, so it lies
 * between the slowest and the fastest interval's rate, which give the range. The remaining volume
 * is worked off on weekdays from the latest survey date of the project: nothing is known of the
 * days before it that a survey could have shown, so a finish is never dated before it. The rate is
 * per weekday too, whatever days dives were logged on: a rate per dive day counted forward on every
 * weekday would assume crews dive daily, and an interval whose log began part way through (two
 * logged days in ten weeks of work) would give a rate many times too fast. It is an estimate:
 * crews, weather and stand-downs change it.
 */
export type ForecastState = "finished" | "forecast" | "no-recent-rate" | "no-rate";

/** Calendar days before the latest survey date in which a measured interval must end to set the rate. */
export const RATE_WINDOW_CALENDAR_DAYS = 42;

const WEEKDAYS = workingCalendar([]);

export interface RateInterval {
  fromDate: string;
  toDate: string;
  workingDays: number;
  removedVolume: number;
  volumePerWorkingDay: number;
}

export interface ZoneForecast {
  state: ForecastState;
  /** The window the rate was taken over: its first day and the latest survey date. */
  windowFromDate: string | null;
  windowToDate: string | null;
  /** The zone's measured intervals ending in the window (those with at least one working day). */
  intervals: RateInterval[];
  /** The first and last date of those intervals. */
  rateFromDate: string | null;
  rateToDate: string | null;
  /** Mean rate: the intervals' removal over their weekdays (volume unit per weekday). */
  volumePerWorkingDay: number | null;
  slowestVolumePerWorkingDay: number | null;
  fastestVolumePerWorkingDay: number | null;
  /** Weekdays after the latest survey date at the mean rate. */
  workingDaysLeft: number | null;
  finishDate: string | null;
  /** At the fastest interval's rate. */
  earliestFinishDate: string | null;
  /** At the slowest interval's rate; null when an interval in the window removed nothing (no bound). */
  latestFinishDate: string | null;
}

export interface ForecastOptions {
  /** Remaining volume at or below which a zone counts as finished (volume unit). */
  finishedBelowVolume: number;
  /** A change in cumulative removal smaller than this is survey noise, not work (volume unit). */
  changeThresholdVolume: number;
  /** Every cell of the zone is at firm sand: what remains lies within the tolerance, so the zone is done. */
  everyCellAtFirmSand?: boolean;
  /** Defaults to RATE_WINDOW_CALENDAR_DAYS. */
  windowCalendarDays?: number;
  /** Shares of working days lost to stop-work and stand-downs (lost-hours.ts): the rate is per weekday actually workable. */
  lostShares?: ReadonlyMap<number, number>;
}

/**
 * `dates` are the project's survey dates in order (the last is the latest survey date);
 * `cumulativeRemoved` the zone's removed volume on each (NaN where the zone had no figures yet).
 */
export function forecastFinish(
  dates: readonly string[],
  cumulativeRemoved: ArrayLike<number>,
  remainingVolume: number,
  options: ForecastOptions,
): ZoneForecast {
  const latest = dates.length > 0 ? dates[dates.length - 1] : null;
  const windowDays = options.windowCalendarDays ?? RATE_WINDOW_CALENDAR_DAYS;
  const windowFrom = latest === null ? null : isoDateOf(dayNumber(latest) - windowDays);
  const none: ZoneForecast = {
    state: "no-rate", windowFromDate: windowFrom, windowToDate: latest, intervals: [], rateFromDate: null, rateToDate: null,
    volumePerWorkingDay: null, slowestVolumePerWorkingDay: null, fastestVolumePerWorkingDay: null,
    workingDaysLeft: null, finishDate: null, earliestFinishDate: null, latestFinishDate: null,
  };
  if (options.everyCellAtFirmSand || remainingVolume <= options.finishedBelowVolume) return { ...none, state: "finished", workingDaysLeft: 0 };
  // Measured states: the first date, then every date whose removal changed beyond the threshold.
  const measured: number[] = [];
  for (let index = 0; index < dates.length; index++) {
    const value = cumulativeRemoved[index];
    if (!Number.isFinite(value)) continue;
    if (measured.length === 0 || Math.abs(value - cumulativeRemoved[measured[measured.length - 1]]) > options.changeThresholdVolume) measured.push(index);
  }
  if (measured.length < 2 || latest === null || windowFrom === null) return none;
  const weekdays = options.lostShares ? workingCalendar([], options.lostShares) : WEEKDAYS;
  const intervals: RateInterval[] = [];
  for (let k = 1; k < measured.length; k++) {
    const fromDate = dates[measured[k - 1]];
    const toDate = dates[measured[k]];
    if (toDate < windowFrom) continue;
    const workingDays = workingDaysBetween(weekdays, fromDate, toDate);
    if (workingDays <= 0) continue; // no working day to divide by (e.g. surveys a weekend apart)
    const removedVolume = cumulativeRemoved[measured[k]] - cumulativeRemoved[measured[k - 1]];
    intervals.push({ fromDate, toDate, workingDays, removedVolume, volumePerWorkingDay: removedVolume / workingDays });
  }
  const removed = intervals.reduce((sum, interval) => sum + interval.removedVolume, 0);
  const workingDays = intervals.reduce((sum, interval) => sum + interval.workingDays, 0);
  if (intervals.length === 0 || !(removed > 0)) return { ...none, state: "no-recent-rate", intervals };
  const rate = removed / workingDays;
  const rates = intervals.map((interval) => interval.volumePerWorkingDay);
  const slowest = Math.min(...rates);
  const fastest = Math.max(...rates);
  const workingDaysLeft = Math.ceil(remainingVolume / rate);
  return {
    ...none,
    state: "forecast",
    intervals,
    rateFromDate: intervals[0].fromDate,
    rateToDate: intervals[intervals.length - 1].toDate,
    volumePerWorkingDay: rate,
    slowestVolumePerWorkingDay: slowest,
    fastestVolumePerWorkingDay: fastest,
    workingDaysLeft,
    finishDate: addWeekdays(latest, workingDaysLeft),
    earliestFinishDate: addWeekdays(latest, Math.ceil(remainingVolume / fastest)),
    latestFinishDate: slowest > 0 ? addWeekdays(latest, Math.ceil(remainingVolume / slowest)) : null,
  };
}
