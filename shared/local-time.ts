/**
 * Instants and the project's local calendar. The project time zone (IANA, `projects.time_zone`)
 * decides which local day a field record belongs to: a reading at 23:30 local time counts on that
 * local day even though it is already the next day in UTC. Pure: Intl only, no clock.
 */

const DAY_MS = 86_400_000;
const MINUTE_MS = 60_000;

/** Minutes after midnight of a wall-clock time written HH:MM (or HH:MM:SS; the seconds are not counted). */
export const minutesOfClock = (clock: string): number => Number(clock.slice(0, 2)) * 60 + Number(clock.slice(3, 5));

const formatters = new Map<string, Intl.DateTimeFormat>();

/**
 * One Intl.DateTimeFormat per locale and options, made once and kept: making one costs far more
 * than formatting with it (a page of dated rows built a formatter per row, tens of ms while the
 * page started).
 */
export function dateTimeFormat(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let formatter = formatters.get(key);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat(locale, options);
    formatters.set(key, formatter);
  }
  return formatter;
}

/** The wall-clock formatter of each zone, looked up by zone alone: wallClock runs per record, and the key above costs a JSON text. */
const wallClockFormatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let formatter = wallClockFormatters.get(timeZone);
  if (!formatter) {
    formatter = dateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" });
    wallClockFormatters.set(timeZone, formatter);
  }
  return formatter;
}

/** The wall-clock fields of `instantMs` in `timeZone`. */
function wallClock(instantMs: number, timeZone: string): { year: number; month: number; day: number; hour: number; minute: number; second: number } {
  const parts = Object.fromEntries(formatterFor(timeZone).formatToParts(new Date(instantMs)).map((part) => [part.type, part.value]));
  return { year: Number(parts.year), month: Number(parts.month), day: Number(parts.day), hour: Number(parts.hour), minute: Number(parts.minute), second: Number(parts.second) };
}

/** The local calendar day (YYYY-MM-DD) of an instant in `timeZone`. */
export function localDayOf(instantMs: number, timeZone: string): string {
  const clock = wallClock(instantMs, timeZone);
  return `${String(clock.year).padStart(4, "0")}-${String(clock.month).padStart(2, "0")}-${String(clock.day).padStart(2, "0")}`;
}

/** Local wall-clock time of an instant as HH:MM. */
export function localClockOf(instantMs: number, timeZone: string): string {
  const clock = wallClock(instantMs, timeZone);
  return `${String(clock.hour).padStart(2, "0")}:${String(clock.minute).padStart(2, "0")}`;
}

/** The zone's offset from UTC at `instantMs`, in minutes (east positive). */
export function offsetMinutesAt(instantMs: number, timeZone: string): number {
  const clock = wallClock(instantMs, timeZone);
  const asUtc = Date.UTC(clock.year, clock.month - 1, clock.day, clock.hour, clock.minute, clock.second);
  return Math.round((asUtc - Math.floor(instantMs / 1000) * 1000) / MINUTE_MS);
}

/**
 * The instant of local wall-clock `minutesAfterMidnight` on local `day` in `timeZone`. Two passes
 * settle the offset across a daylight-saving change; a wall time skipped by the spring change
 * lands an hour later, as a clock on the wall would show it.
 */
export function instantOfLocal(day: string, minutesAfterMidnight: number, timeZone: string): number {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  if (!match) throw new Error(`"${day}" is not a date written as YYYY-MM-DD`);
  const wallAsUtc = Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])) + minutesAfterMidnight * MINUTE_MS;
  let guess = wallAsUtc - offsetMinutesAt(wallAsUtc, timeZone) * MINUTE_MS;
  guess = wallAsUtc - offsetMinutesAt(guess, timeZone) * MINUTE_MS;
  return guess;
}

export { DAY_MS, MINUTE_MS };

/**
 * Whether local `day` (YYYY-MM-DD) lies after the local day of `instantMs` in `timeZone`: a record
 * of work done (a dive) cannot be dated later than the project's today.
 */
export function isAfterLocalDay(day: string, instantMs: number, timeZone: string): boolean {
  return day > localDayOf(instantMs, timeZone);
}
