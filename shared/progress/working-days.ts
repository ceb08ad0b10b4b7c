import { dayNumber, isWeekday, isoDateOf } from "./calendar-days";

/**
 * Working days between two survey dates: the days after `fromDate` up to and including `toDate`
 * (the work a survey on `toDate` measures happened after the previous survey). Dive-plan dates
 * are the record of the days crews actually worked; an interval with none (before plans were kept
 * in Firmsand, or a project without them) counts Monday to Friday instead.
 */
export type WorkingDayBasis = "dive-plans" | "weekdays";

export interface WorkingCalendar {
  basis: WorkingDayBasis;
  /** Sorted day numbers of planned dive days (basis "dive-plans" only). */
  plannedDays: Float64Array;
}

/** The calendar to count with: dive-plan dates where there are any, else weekdays. */
export function workingCalendar(divePlanDates: readonly string[]): WorkingCalendar {
  if (divePlanDates.length === 0) return { basis: "weekdays", plannedDays: new Float64Array(0) };
  const days = Float64Array.from(new Set(divePlanDates.map(dayNumber))).sort();
  return { basis: "dive-plans", plannedDays: days };
}

/** Index of the first element of sorted `days` greater than `day`. */
function upperBound(days: Float64Array, day: number): number {
  let low = 0;
  let high = days.length;
  while (low < high) {
    const middle = (low + high) >> 1;
    if (days[middle] <= day) low = middle + 1;
    else high = middle;
  }
  return low;
}

export function workingDaysBetween(calendar: WorkingCalendar, fromDate: string, toDate: string): number {
  const from = dayNumber(fromDate);
  const to = dayNumber(toDate);
  if (to <= from) return 0;
  if (calendar.basis === "dive-plans") {
    const planned = upperBound(calendar.plannedDays, to) - upperBound(calendar.plannedDays, from);
    if (planned > 0) return planned;
  }
  // Whole weeks hold five weekdays each; walk only the remainder.
  const span = to - from;
  const weeks = Math.floor(span / 7);
  let count = weeks * 5;
  for (let day = from + weeks * 7 + 1; day <= to; day++) if (isWeekday(day)) count++;
  return count;
}

/** What an interval's working days were counted from. */
export function intervalBasis(calendar: WorkingCalendar, fromDate: string, toDate: string): WorkingDayBasis {
  if (calendar.basis === "weekdays") return "weekdays";
  const planned = upperBound(calendar.plannedDays, dayNumber(toDate)) - upperBound(calendar.plannedDays, dayNumber(fromDate));
  return planned > 0 ? "dive-plans" : "weekdays";
}

/**
 * The date on which `count` more working days after `fromDate` are done. Forecasts always count
 * weekdays forward: dive plans exist only for days already planned.
 */
export function addWeekdays(fromDate: string, count: number): string {
  if (!(count >= 0) || !Number.isFinite(count)) throw new Error("the number of working days must be finite and not negative");
  let day = dayNumber(fromDate);
  let left = Math.ceil(count);
  const weeks = Math.floor(Math.max(0, left - 1) / 5);
  day += weeks * 7;
  left -= weeks * 5;
  while (left > 0) {
    day++;
    if (isWeekday(day)) left--;
  }
  return isoDateOf(day);
}
