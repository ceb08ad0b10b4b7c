import { instantOfLocal } from "../local-time";

/**
 * Missed sampling on the days work is active (a shift or a dive was logged), read in the project
 * time zone over the project's work day. A permit states its routine one of two ways:
 * - an interval ("every 6 hours"): the work day is cut into intervals from its start, and an
 *   interval with no compliance reading is a gap;
 * - so many samples a day, with a spacing the permit words one of two ways:
 *   - at least so long apart ("twice daily, at least 4 hours apart", spread over the day): the
 *     day's readings are counted, each only if it is at least the gap after the last one counted
 *     (taken earliest first, which counts the most such samples a day's readings can give); a day
 *     short of samples shows as gaps where a missing sample could still have been taken: the work
 *     day less the gap either side of every sample counted (the whole work day when nothing is left);
 *   - no more than so long apart ("twice daily, no more than 4 hours apart", a pair taken close
 *     together): the longest run of the day's readings each within the gap of the one before counts
 *     (the earliest such run on a tie); a day short of samples shows as the gap before the run's
 *     first sample and after its last, within the work day (the whole work day when none was taken).
 */
export type SampleGapRule = "at-least" | "at-most";

export interface SamplingRoutine {
  /** The longest the permit lets pass between compliance readings while work is active (e.g. 360 for every 6 h). */
  intervalMinutes: number;
  /** The work day, local wall-clock minutes after midnight (07:00 → 420). */
  workdayStartMinutes: number;
  workdayEndMinutes: number;
  /** Set: the routine is so many samples a day (and `intervalMinutes` is not used). */
  samplesPerDay?: number | null;
  /** With `samplesPerDay`: the time between two samples that both count (0 with "at-least": any). */
  minimumGapMinutes?: number | null;
  /** How the gap binds: "at-least" (the default) so long apart or more, "at-most" no more than so long apart. */
  gapRule?: SampleGapRule | null;
}

export interface MissedInterval {
  /** Local day, YYYY-MM-DD. */
  day: string;
  fromMs: number;
  toMs: number;
  /** Samples-a-day routine: how many samples the day is short of (the same on each of its gaps). */
  samplesShort?: number;
}

/** Every gap of every active day (`[from, to)`), by the routine's kind. */
export function missedIntervals(activeDays: readonly string[], complianceTakenAtMs: readonly number[], routine: SamplingRoutine, timeZone: string): MissedInterval[] {
  if (routine.workdayEndMinutes <= routine.workdayStartMinutes) return [];
  const times = [...complianceTakenAtMs].sort((a, b) => a - b);
  const days = [...new Set(activeDays)].sort();
  if (routine.samplesPerDay != null) {
    return routine.gapRule === "at-most"
      ? shortDaysWithin(days, times, routine.samplesPerDay, routine.minimumGapMinutes ?? 0, routine, timeZone)
      : shortDays(days, times, routine.samplesPerDay, routine.minimumGapMinutes ?? 0, routine, timeZone);
  }
  if (!(routine.intervalMinutes > 0)) return [];
  const missed: MissedInterval[] = [];
  for (const day of days) {
    for (let start = routine.workdayStartMinutes; start < routine.workdayEndMinutes; start += routine.intervalMinutes) {
      const fromMs = instantOfLocal(day, start, timeZone);
      const toMs = instantOfLocal(day, Math.min(start + routine.intervalMinutes, routine.workdayEndMinutes), timeZone);
      if (!times.some((time) => time >= fromMs && time < toMs)) missed.push({ day, fromMs, toMs });
    }
  }
  return missed;
}

/** The samples that count on one day: earliest first, each at least `gapMs` after the last counted. */
export function countedSamples(sortedTimesMs: readonly number[], gapMs: number): number[] {
  const counted: number[] = [];
  for (const time of sortedTimesMs) if (counted.length === 0 || time - counted[counted.length - 1] >= gapMs) counted.push(time);
  return counted;
}

/** The samples that count on one day under "no more than so long apart": the longest run each within `gapMs` of the one before (the earliest on a tie). */
export function runWithinGap(sortedTimesMs: readonly number[], gapMs: number): number[] {
  let best: number[] = [];
  let run: number[] = [];
  for (const time of sortedTimesMs) {
    run = run.length > 0 && time - run[run.length - 1] <= gapMs ? [...run, time] : [time];
    if (run.length > best.length) best = run;
  }
  return best;
}

function shortDaysWithin(days: readonly string[], times: readonly number[], perDay: number, gapMinutes: number, routine: SamplingRoutine, timeZone: string): MissedInterval[] {
  const gapMs = gapMinutes * 60_000;
  const missed: MissedInterval[] = [];
  for (const day of days) {
    const dayFromMs = instantOfLocal(day, routine.workdayStartMinutes, timeZone);
    const dayToMs = instantOfLocal(day, routine.workdayEndMinutes, timeZone);
    const run = runWithinGap(times.filter((time) => time >= dayFromMs && time < dayToMs), gapMs);
    const short = perDay - run.length;
    if (short <= 0) continue;
    if (run.length === 0) {
      missed.push({ day, fromMs: dayFromMs, toMs: dayToMs, samplesShort: short });
      continue;
    }
    // Another sample counts only within the gap of the run's ends: before its first, after its last.
    const before: [number, number] = [Math.max(dayFromMs, run[0] - gapMs), run[0]];
    const after: [number, number] = [run[run.length - 1], Math.min(dayToMs, run[run.length - 1] + gapMs)];
    for (const [fromMs, toMs] of [before, after]) if (toMs > fromMs) missed.push({ day, fromMs, toMs, samplesShort: short });
  }
  return missed;
}

function shortDays(days: readonly string[], times: readonly number[], perDay: number, gapMinutes: number, routine: SamplingRoutine, timeZone: string): MissedInterval[] {
  const gapMs = gapMinutes * 60_000;
  const missed: MissedInterval[] = [];
  for (const day of days) {
    const dayFromMs = instantOfLocal(day, routine.workdayStartMinutes, timeZone);
    const dayToMs = instantOfLocal(day, routine.workdayEndMinutes, timeZone);
    const counted = countedSamples(times.filter((time) => time >= dayFromMs && time < dayToMs), gapMs);
    const short = perDay - counted.length;
    if (short <= 0) continue;
    // The work day less (t − gap, t + gap) around each counted sample: where another could count.
    const spans: Array<[number, number]> = [];
    let cursor = dayFromMs;
    for (const time of counted) {
      const blockedFrom = Math.max(dayFromMs, time - gapMs);
      if (blockedFrom > cursor) spans.push([cursor, blockedFrom]);
      cursor = Math.max(cursor, Math.min(dayToMs, time + gapMs));
    }
    if (dayToMs > cursor) spans.push([cursor, dayToMs]);
    const open = spans.length > 0 ? spans : [[dayFromMs, dayToMs] as [number, number]];
    for (const [fromMs, toMs] of open) missed.push({ day, fromMs, toMs, samplesShort: short });
  }
  return missed;
}
