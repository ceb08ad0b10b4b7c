import { addWeekdays, workingDaysBetween, type WorkingCalendar } from "./working-days";

/**
 * A zone's forecast finish from its recent rate. The rate is the zone's removal between its last
 * two measured states (the baseline counts as one): the latest survey date on which its removed
 * volume changed, and the one before it. A survey that does not cover a zone leaves its figures
 * unchanged, so using the project's every interval would spread one zone's work over days spent
 * elsewhere. The remaining volume is then worked off at that rate on weekdays from the latest
 * change. It is an estimate: crews, weather and stand-downs change it.
 */
export type ForecastState = "finished" | "forecast" | "no-rate";

export interface ZoneForecast {
  state: ForecastState;
  /** The interval the rate was measured over. */
  rateFromDate: string | null;
  rateToDate: string | null;
  /** Volume unit per working day. */
  volumePerWorkingDay: number | null;
  workingDaysLeft: number | null;
  finishDate: string | null;
}

export interface ForecastOptions {
  /** Remaining volume at or below which a zone counts as finished (volume unit). */
  finishedBelowVolume: number;
  /** A change in cumulative removal smaller than this is survey noise, not work (volume unit). */
  changeThresholdVolume: number;
  /** Every cell of the zone is at firm sand: what remains lies within the tolerance, so the zone is done. */
  everyCellAtFirmSand?: boolean;
}

export function forecastFinish(
  dates: readonly string[],
  cumulativeRemoved: ArrayLike<number>,
  remainingVolume: number,
  calendar: WorkingCalendar,
  options: ForecastOptions,
): ZoneForecast {
  const none: ZoneForecast = { state: "no-rate", rateFromDate: null, rateToDate: null, volumePerWorkingDay: null, workingDaysLeft: null, finishDate: null };
  if (options.everyCellAtFirmSand || remainingVolume <= options.finishedBelowVolume) return { ...none, state: "finished", workingDaysLeft: 0 };
  // Measured states: the first date, then every date whose removal changed beyond the threshold.
  const measured: number[] = [];
  for (let index = 0; index < dates.length; index++) {
    const value = cumulativeRemoved[index];
    if (!Number.isFinite(value)) continue;
    if (measured.length === 0 || Math.abs(value - cumulativeRemoved[measured[measured.length - 1]]) > options.changeThresholdVolume) measured.push(index);
  }
  if (measured.length < 2) return none;
  const from = measured[measured.length - 2];
  const to = measured[measured.length - 1];
  const workingDays = workingDaysBetween(calendar, dates[from], dates[to]);
  const removed = cumulativeRemoved[to] - cumulativeRemoved[from];
  const base = { rateFromDate: dates[from], rateToDate: dates[to] };
  if (workingDays <= 0 || !(removed > 0)) return { ...none, ...base };
  const rate = removed / workingDays;
  const workingDaysLeft = Math.ceil(remainingVolume / rate);
  return { state: "forecast", ...base, volumePerWorkingDay: rate, workingDaysLeft, finishDate: addWeekdays(dates[to], workingDaysLeft) };
}
