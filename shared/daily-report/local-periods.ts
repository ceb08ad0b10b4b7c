import { instantOfLocal, localClockOf, localDayOf, minutesOfClock } from "../local-time";

/**
 * Periods of a report's local day entered as wall-clock times (weather downtime, a visitor's
 * arrival and leaving), turned into instants in the project's time zone, and the hours they cover.
 * Pure: shared/local-time.ts does the zone arithmetic.
 */

/** A wall-clock time written HH:MM (24-hour clock); the end of a period may also be 24:00, the day's end. */
export const CLOCK_PATTERN = /^([01]\d|2[0-3]):[0-5]\d$/;
export const END_CLOCK_PATTERN = /^(([01]\d|2[0-3]):[0-5]\d|24:00)$/;

/**
 * The instant of wall-clock `clock` on local `date`, or null when the clock does not show that time
 * on that day (the hour skipped when the clocks go forward). "24:00" is the start of the next day.
 * In the hour repeated when the clocks go back, a time is read as its first occurrence.
 */
export function instantOfClock(date: string, clock: string, timeZone: string): number | null {
  const minutes = minutesOfClock(clock);
  const instant = instantOfLocal(date, minutes, timeZone);
  if (minutes === 24 * 60) return instant;
  return localDayOf(instant, timeZone) === date && localClockOf(instant, timeZone) === clock ? instant : null;
}

export interface Span {
  startMs: number;
  endMs: number;
}

/**
 * The spans joined where they overlap or touch, earliest first: the same minute is counted once,
 * whatever stopped the work (a stand-down during a stop-work loses no extra hour).
 */
export function mergeSpans(spans: readonly Span[]): Span[] {
  const merged: Span[] = [];
  for (const span of [...spans].filter((item) => item.endMs > item.startMs).sort((a, b) => a.startMs - b.startMs)) {
    const last = merged[merged.length - 1];
    if (last && span.startMs <= last.endMs) last.endMs = Math.max(last.endMs, span.endMs);
    else merged.push({ ...span });
  }
  return merged;
}

/** Hours covered by the spans together, an overlap counted once. */
export function unionHours(spans: readonly Span[]): number {
  return mergeSpans(spans).reduce((sum, span) => sum + (span.endMs - span.startMs), 0) / 3_600_000;
}
