import { instantOfLocal, localDayOf } from "../local-time";
import { mergeSpans } from "../daily-report/local-periods";
import { dayNumber } from "./calendar-days";

/**
 * Working time lost to what stops work (turbidity stop-work events, wildlife stand-downs), as a
 * share of each day's working hours, so that production and forecasts divide a survey interval's
 * removal by the working days crews could actually work. Overlapping stoppages count once (a
 * stand-down during a stop-work loses no extra hour); only the part inside the day's working hours
 * counts (a stop-work left open overnight loses nothing while nobody works), read in the project's
 * time zone.
 */
export interface Stoppage {
  startMs: number;
  /** The end, or the moment of reading while it is still open. */
  endMs: number;
}

export interface WorkingHours {
  /** Local wall-clock minutes after midnight (07:00 → 420). */
  startMinutes: number;
  endMinutes: number;
}

/** Lost share of each day's working hours (0 to 1), keyed by day number (days since 1970-01-01). */
export function lostWorkingDayShares(stoppages: readonly Stoppage[], hours: WorkingHours, timeZone: string): Map<number, number> {
  const lost = new Map<number, number>();
  const dayMinutes = hours.endMinutes - hours.startMinutes;
  if (!(dayMinutes > 0)) return lost;
  // Merge first: the same minute is lost once whatever stopped it.
  for (const stoppage of mergeSpans(stoppages)) {
    const firstDay = localDayOf(stoppage.startMs, timeZone);
    const lastDay = localDayOf(stoppage.endMs, timeZone);
    for (let day = dayNumber(firstDay); day <= dayNumber(lastDay); day++) {
      const iso = new Date(day * 86_400_000).toISOString().slice(0, 10);
      const workFromMs = instantOfLocal(iso, hours.startMinutes, timeZone);
      const workToMs = instantOfLocal(iso, hours.endMinutes, timeZone);
      const overlapMs = Math.min(workToMs, stoppage.endMs) - Math.max(workFromMs, stoppage.startMs);
      if (overlapMs <= 0) continue;
      const share = overlapMs / (workToMs - workFromMs);
      lost.set(day, Math.min(1, (lost.get(day) ?? 0) + share));
    }
  }
  return lost;
}
