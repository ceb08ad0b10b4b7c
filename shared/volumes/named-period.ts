/**
 * A named pay period: a calendar month ("2026-10") taken as the surveys that close it. A contractor
 * paid monthly is paid for what was removed between the survey that closed the month before and
 * the last survey of the month: `from` is the last survey in force before the month begins (the
 * baseline when the project began within or after it), `to` the last survey in force on or before
 * the month's last day. A month with no survey of its own after `from` has no period.
 */

export const MONTH_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

const MONTH_NAMES = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

/** "2026-10" → "October 2026". */
export function monthName(month: string): string {
  const match = MONTH_PATTERN.exec(month);
  if (!match) return month;
  return `${MONTH_NAMES[Number(match[2]) - 1]} ${match[1]}`;
}

/** The month's last day as YYYY-MM-DD (calendar arithmetic: 28, 29, 30 or 31 days). */
export function lastDayOfMonth(month: string): string {
  const match = MONTH_PATTERN.exec(month)!;
  const year = Number(match[1]);
  const monthIndex = Number(match[2]);
  const days = new Date(Date.UTC(year, monthIndex, 0)).getUTCDate();
  return `${month}-${String(days).padStart(2, "0")}`;
}

export type MonthPeriod = { from: number; to: number; error?: never } | { error: string; from?: never; to?: never };

/**
 * The positions (in `surveys`, ordered by date as they are in force) of the surveys bounding the
 * month, or why the month has no period, in words.
 */
export function monthPeriod(surveys: ReadonlyArray<{ surveyedOn: string }>, month: string): MonthPeriod {
  if (!MONTH_PATTERN.test(month)) return { error: "must be a month written YYYY-MM, for example 2026-10" };
  const first = `${month}-01`;
  const last = lastDayOfMonth(month);
  let to = -1;
  let before = -1;
  surveys.forEach((survey, index) => {
    if (survey.surveyedOn <= last) to = index;
    if (survey.surveyedOn < first) before = index;
  });
  const from = Math.max(before, 0);
  if (to < 0) return { error: `no survey in force was made by the end of ${monthName(month)}` };
  if (to <= from) {
    return { error: `no survey in force was made in ${monthName(month)} after the one of ${surveys[from]!.surveyedOn}: the month has no period of its own` };
  }
  return { from, to };
}

/** The months, newest first, that have a period of their own (a survey in force within them after the baseline). */
export function monthsWithPeriods(surveys: ReadonlyArray<{ surveyedOn: string }>): string[] {
  const months = [...new Set(surveys.slice(1).map((survey) => survey.surveyedOn.slice(0, 7)))];
  return months.filter((month) => monthPeriod(surveys, month).error === undefined).sort().reverse();
}
