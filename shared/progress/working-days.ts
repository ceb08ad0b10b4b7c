import { dayNumber, isWeekday, isoDateOf } from "./calendar-days";

/**
 * Working days between two survey dates: the days after `fromDate` up to and including `toDate`
 * (the work a survey on `toDate` measures happened after the previous survey). The days on which
 * dives or dewatering shifts were logged are the record of the days crews actually worked (a plan
 * may be called off; a shift pumps what the divers loosen); an interval with none logged (before
 * the logs were kept in Firmsand, or a project without them) counts Monday to Friday instead.
 */
export type WorkingDayBasis = "days-logged" | "weekdays";

/** An interval resting on fewer working days than this is thin: one good or bad day swings its rate. */
export const THIN_INTERVAL_WORKING_DAYS = 3;

export interface WorkingCalendar {
  basis: WorkingDayBasis;
  /** Sorted day numbers of days with a logged dive or shift (basis "days-logged" only). */
  loggedDays: Float64Array;
  /**
   * The share of a day's working hours lost to stop-work events and stand-downs, by day number
   * (lost-hours.ts): a working day counts as one less its lost share. Days absent lost nothing.
   */
  lostShares?: ReadonlyMap<number, number>;
}

/**
 * The calendar to count with: days with a logged dive or dewatering shift where there are any
 * (`loggedDates` holds both, a day twice counts once), else weekdays; less the hours lost to stoppages.
 */
export function workingCalendar(loggedDates: readonly string[], lostShares?: ReadonlyMap<number, number>): WorkingCalendar {
  const lost = lostShares && lostShares.size > 0 ? { lostShares } : {};
  if (loggedDates.length === 0) return { basis: "weekdays", loggedDays: new Float64Array(0), ...lost };
  const days = Float64Array.from(new Set(loggedDates.map(dayNumber))).sort();
  return { basis: "days-logged", loggedDays: days, ...lost };
}

/** The lost shares of the days counted in (from, to]: each counted day's share once. */
function lostIn(calendar: WorkingCalendar, from: number, to: number, counted: (day: number) => boolean): number {
  if (!calendar.lostShares) return 0;
  let lost = 0;
  for (const [day, share] of calendar.lostShares) if (day > from && day <= to && counted(day)) lost += share;
  return lost;
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
  if (calendar.basis === "days-logged") {
    const logged = upperBound(calendar.loggedDays, to) - upperBound(calendar.loggedDays, from);
    if (logged > 0) {
      const loggedDay = (day: number) => upperBound(calendar.loggedDays, day) - upperBound(calendar.loggedDays, day - 1) > 0;
      return logged - lostIn(calendar, from, to, loggedDay);
    }
  }
  // Whole weeks hold five weekdays each; walk only the remainder.
  const span = to - from;
  const weeks = Math.floor(span / 7);
  let count = weeks * 5;
  for (let day = from + weeks * 7 + 1; day <= to; day++) if (isWeekday(day)) count++;
  return count - lostIn(calendar, from, to, isWeekday);
}

/** What an interval's working days were counted from. */
export function intervalBasis(calendar: WorkingCalendar, fromDate: string, toDate: string): WorkingDayBasis {
  if (calendar.basis === "weekdays") return "weekdays";
  const logged = upperBound(calendar.loggedDays, dayNumber(toDate)) - upperBound(calendar.loggedDays, dayNumber(fromDate));
  return logged > 0 ? "days-logged" : "weekdays";
}

/**
 * The date on which `count` more working days after `fromDate` are done. Forecasts always count
 * weekdays forward: dives are logged only for days already worked.
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
