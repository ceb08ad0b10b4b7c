import { instantOfLocal } from "../local-time";

/**
 * Missed sampling intervals: on a day work is active (a shift or a dive was logged), the work day
 * is cut into the permit's sampling intervals from its start, and an interval with no compliance
 * reading is a gap. The work day's hours are a project setting, read in the project time zone.
 */

export interface SamplingRoutine {
  /** The longest the permit lets pass between compliance readings while work is active (e.g. 360 for every 6 h). */
  intervalMinutes: number;
  /** The work day, local wall-clock minutes after midnight (07:00 → 420). */
  workdayStartMinutes: number;
  workdayEndMinutes: number;
}

export interface MissedInterval {
  /** Local day, YYYY-MM-DD. */
  day: string;
  fromMs: number;
  toMs: number;
}

/** Every interval of every active day with no compliance reading in it (`[from, to)`, the last one cut at the day's end). */
export function missedIntervals(activeDays: readonly string[], complianceTakenAtMs: readonly number[], routine: SamplingRoutine, timeZone: string): MissedInterval[] {
  if (!(routine.intervalMinutes > 0) || routine.workdayEndMinutes <= routine.workdayStartMinutes) return [];
  const times = [...complianceTakenAtMs].sort((a, b) => a - b);
  const missed: MissedInterval[] = [];
  for (const day of [...new Set(activeDays)].sort()) {
    for (let start = routine.workdayStartMinutes; start < routine.workdayEndMinutes; start += routine.intervalMinutes) {
      const fromMs = instantOfLocal(day, start, timeZone);
      const toMs = instantOfLocal(day, Math.min(start + routine.intervalMinutes, routine.workdayEndMinutes), timeZone);
      if (!times.some((time) => time >= fromMs && time < toMs)) missed.push({ day, fromMs, toMs });
    }
  }
  return missed;
}
