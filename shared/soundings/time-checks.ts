import { instantOfLocal, localClockOf, localDayOf } from "../local-time";
import type { RowProblem } from "./row-checks";

/**
 * The time column, row by row: a time must be a date and time someone can read back later, never
 * a word relative to the day it was typed ("yesterday", "today", "now"), and never later than now
 * in the project's time zone (a field computer's clock or a mistyped year). Accepted forms: ISO 8601
 * (`2026-09-08T06:50:00-04:00`, `2026-09-08 06:50`, `2026-09-08`), US month/day/year
 * (`9/8/2026 6:50 AM`), and a time of day alone (`06:50:00`, on the survey date). A time without
 * an offset is read in the time zone given for the file's times. Pure: strings in, problems out.
 */
export interface TimeCheckInput {
  sourceRow: Uint32Array;
  time: readonly string[];
  header: string;
  /** The time zone the file's times are written in (the upload's choice). */
  fileTimeZone: string;
  /** The project's time zone: "today" and "now" are the project's. */
  projectTimeZone: string;
  /** The survey date (YYYY-MM-DD), for the example in the message. */
  surveyedOn: string;
  /** Now, milliseconds since 1970 (the caller's clock); null checks the forms only. */
  now: number | null;
}

const RELATIVE = /^(yesterday|today|tonight|tomorrow|now|just now|this (morning|afternoon|evening)|last (night|week)|(\d+|a|an|one|two|three) (min(ute)?s?|hours?|hrs?|days?|weeks?) ago|[+-]\s*\d+\s*(d|h|days?|hours?))$/i;
const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?\s*(Z|[+-]\d{2}:?\d{2})?)?$/i;
const US = /^(\d{1,2})\/(\d{1,2})\/(\d{4})(?:\s+(\d{1,2}):(\d{2})(?::(\d{2}))?\s*([AP]M)?)?$/i;
const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?$/;

/** Minutes of slack before a time counts as in the future (clocks drift; a file is exported a moment after its last sounding). */
const FUTURE_SLACK_MS = 10 * 60_000;

interface ReadTime {
  day: string;
  /** Minutes after local midnight, or null for a date alone. */
  minutes: number | null;
  /** Offset written in the value, minutes east of UTC; null when none was written. */
  offset: number | null;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function validDay(year: number, month: number, day: number): boolean {
  if (month < 1 || month > 12 || day < 1) return false;
  const leap = month === 2 && ((year % 4 === 0 && year % 100 !== 0) || year % 400 === 0);
  return day <= DAYS_IN_MONTH[month - 1] + (leap ? 1 : 0);
}

function readTime(text: string, surveyedOn: string): ReadTime | "relative" | null {
  if (RELATIVE.test(text)) return "relative";
  const pad = (value: number) => String(value).padStart(2, "0");
  let match = ISO.exec(text);
  if (match) {
    const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
    if (!validDay(year, month, day)) return null;
    if (match[4] === undefined) return { day: `${match[1]}-${match[2]}-${match[3]}`, minutes: null, offset: null };
    const [hour, minute, second] = [Number(match[4]), Number(match[5]), Number(match[6] ?? 0)];
    if (hour > 23 || minute > 59 || second > 60) return null;
    let offset: number | null = null;
    if (match[7]) {
      const zone = match[7].toUpperCase();
      offset = zone === "Z" ? 0 : (zone.startsWith("-") ? -1 : 1) * (Number(zone.slice(1, 3)) * 60 + Number(zone.slice(-2)));
    }
    return { day: `${match[1]}-${match[2]}-${match[3]}`, minutes: hour * 60 + minute + second / 60, offset };
  }
  match = US.exec(text);
  if (match) {
    const [month, day, year] = [Number(match[1]), Number(match[2]), Number(match[3])];
    if (!validDay(year, month, day)) return null;
    const iso = `${year}-${pad(month)}-${pad(day)}`;
    if (match[4] === undefined) return { day: iso, minutes: null, offset: null };
    let hour = Number(match[4]);
    const minute = Number(match[5]);
    const meridiem = match[7]?.toUpperCase();
    if (meridiem && (hour < 1 || hour > 12)) return null;
    if (meridiem === "PM" && hour < 12) hour += 12;
    if (meridiem === "AM" && hour === 12) hour = 0;
    if (hour > 23 || minute > 59) return null;
    return { day: iso, minutes: hour * 60 + minute + Number(match[6] ?? 0) / 60, offset: null };
  }
  match = CLOCK.exec(text);
  if (match) {
    const [hour, minute] = [Number(match[1]), Number(match[2])];
    if (hour > 23 || minute > 59) return null;
    return { day: surveyedOn, minutes: hour * 60 + minute, offset: null };
  }
  return null;
}

export function checkTimes(input: TimeCheckInput): RowProblem[] {
  const problems: RowProblem[] = [];
  // A file's times fall on few local days and hours: the zone's offset is worked out once for each.
  const hourStarts = new Map<string, number>();
  const localInstant = (day: string, minutes: number) => {
    const hour = Math.floor(minutes / 60);
    const key = `${day} ${hour}`;
    let start = hourStarts.get(key);
    if (start === undefined) {
      start = instantOfLocal(day, hour * 60, input.fileTimeZone);
      hourStarts.set(key, start);
    }
    return start + (minutes - hour * 60) * 60_000;
  };
  const now = input.now;
  const today = now === null ? "" : localDayOf(now, input.projectTimeZone);
  const example = `${input.surveyedOn}T07:30:00 or ${input.surveyedOn} 07:30`;
  // Only a time on or after yesterday's date can be in the future: earlier ones skip the clock work.
  const twoDaysAgo = now === null ? "" : localDayOf(now - 86_400_000 * 2, "UTC");
  for (let index = 0; index < input.time.length; index++) {
    const text = input.time[index];
    if (text === "") continue;
    const row = input.sourceRow[index];
    const read = readTime(text, input.surveyedOn);
    if (read === "relative") {
      problems.push({
        row, column: input.header, value: text, rule: "date and time",
        message: `time "${text}" is a word relative to the day it was typed, not a date and time: once stored, nobody can tell which day it meant. Write the date and time, such as ${example}`,
      });
      continue;
    }
    if (read === null) {
      problems.push({ row, column: input.header, value: text, rule: "date and time", message: `time "${text}" is not a date and time Firmsand can read; write it as ${example} (year-month-day)` });
      continue;
    }
    if (now === null || read.day < twoDaysAgo) continue;
    let future = false;
    if (read.minutes === null) future = read.day > today;
    else {
      const instant = read.offset !== null
        ? Date.UTC(Number(read.day.slice(0, 4)), Number(read.day.slice(5, 7)) - 1, Number(read.day.slice(8, 10))) + (read.minutes - read.offset) * 60_000
        : localInstant(read.day, read.minutes);
      future = instant > now + FUTURE_SLACK_MS;
    }
    if (future) {
      problems.push({
        row, column: input.header, value: text, rule: "not in the future",
        message: `time "${text}" is in the future: it is now ${today} ${localClockOf(now, input.projectTimeZone)} in the project's time zone (${input.projectTimeZone}). Check the date and the field computer's clock`,
      });
    }
  }
  return problems;
}

/** The survey date may not be later than today in the project's time zone. */
export function surveyDateProblem(surveyedOn: string, projectTimeZone: string, now: number): string | null {
  const today = localDayOf(now, projectTimeZone);
  if (surveyedOn <= today) return null;
  return `The survey date ${surveyedOn} is after today (${today} in the project's time zone, ${projectTimeZone}): a survey cannot be dated in the future. Check the date on the upload form.`;
}
