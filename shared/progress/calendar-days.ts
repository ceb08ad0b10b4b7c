import { localDayOf } from "../local-time";
/**
 * Calendar dates as ISO strings (YYYY-MM-DD), counted in whole UTC days so that time zones and
 * daylight-saving changes cannot shift a survey date.
 */

const DAY_MS = 86_400_000;
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Days since 1970-01-01 for an ISO date. */
export function dayNumber(isoDate: string): number {
  const match = ISO_DATE.exec(isoDate);
  if (!match) throw new Error(`"${isoDate}" is not a date written as YYYY-MM-DD`);
  return Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])) / DAY_MS;
}

export function isoDateOf(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** Monday to Friday (ISO weekday 1–5). */
export function isWeekday(day: number): boolean {
  const weekday = new Date(day * DAY_MS).getUTCDay(); // 0 Sunday … 6 Saturday
  return weekday >= 1 && weekday <= 5;
}

/** The calendar date at `instant` in an IANA time zone (the project's: "today" is never a UTC date). */
export function localDateIn(timeZone: string, instant: Date = new Date()): string {
  return localDayOf(instant.getTime(), timeZone);
}
