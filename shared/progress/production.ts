import { THIN_INTERVAL_WORKING_DAYS, intervalBasis, workingDaysBetween, type WorkingCalendar, type WorkingDayBasis } from "./working-days";

/**
 * Production between consecutive surveys: the change in cumulative removed volume divided by the
 * working days between the two survey dates. A survey measures what was done since the previous
 * one, so the rate belongs to the interval, not to a day.
 */
export interface ProductionInterval {
  fromDate: string;
  toDate: string;
  workingDays: number;
  /** Days with a logged dive where the interval has any, else weekdays. */
  basis: WorkingDayBasis;
  /** Fewer than THIN_INTERVAL_WORKING_DAYS working days: the rate rests on too few days to compare with the others. */
  thin: boolean;
  /** Project volume unit. */
  removedVolume: number;
  /** Volume unit per working day; null when the interval holds no working day. */
  volumePerWorkingDay: number | null;
}

export function productionIntervals(dates: readonly string[], cumulativeRemoved: ArrayLike<number>, calendar: WorkingCalendar): ProductionInterval[] {
  if (dates.length !== cumulativeRemoved.length) throw new Error("each survey date needs one cumulative volume");
  const intervals: ProductionInterval[] = [];
  for (let index = 1; index < dates.length; index++) {
    const workingDays = workingDaysBetween(calendar, dates[index - 1], dates[index]);
    const removedVolume = cumulativeRemoved[index] - cumulativeRemoved[index - 1];
    intervals.push({
      fromDate: dates[index - 1],
      toDate: dates[index],
      workingDays,
      basis: intervalBasis(calendar, dates[index - 1], dates[index]),
      thin: workingDays < THIN_INTERVAL_WORKING_DAYS,
      removedVolume,
      volumePerWorkingDay: workingDays > 0 ? removedVolume / workingDays : null,
    });
  }
  return intervals;
}
