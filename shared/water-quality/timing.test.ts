import { describe, expect, it } from "vitest";
import { instantOfLocal, localDayOf } from "../local-time";
import { countedSamples, missedIntervals, runWithinGap } from "./missed-samples";
import { pairBackground } from "./pairing";
import { DEFAULT_SHUTDOWN_DISTANCE_FT, DEFAULT_STAND_DOWN_WAIT_MINUTES, effectOfSighting, standDownActiveAt, standDownEndMs, withinShutdownDistance } from "./stand-down";

const MINUTE = 60_000;
const at = (iso: string) => Date.parse(iso);

describe("pairing with the nearest background within the window (the issue's check; window e.g. 60 min in state permits)", () => {
  const backgrounds = [
    { id: 1, takenAtMs: at("2031-05-06T08:00:00-04:00"), value: 4 },
    { id: 2, takenAtMs: at("2031-05-06T09:40:00-04:00"), value: 6 },
  ];
  it("a compliance reading 90 min after the last background with a 60-min window is unpaired", () => {
    expect(pairBackground(at("2031-05-06T11:10:00-04:00"), backgrounds, 60)).toBeNull();
  });
  it("pairs with the nearest, on either side, up to the window inclusive", () => {
    expect(pairBackground(at("2031-05-06T09:00:00-04:00"), backgrounds, 60)?.id).toBe(2); // 40 min vs 60 min
    expect(pairBackground(at("2031-05-06T10:40:00-04:00"), backgrounds, 60)?.id).toBe(2); // exactly 60 min
    expect(pairBackground(at("2031-05-06T07:30:00-04:00"), backgrounds, 60)?.id).toBe(1); // background after the reading
  });
  it("a tie goes to the earlier background", () => {
    expect(pairBackground(at("2031-05-06T08:50:00-04:00"), backgrounds, 60)?.id).toBe(1);
  });
});

describe("the local day of a reading in the project time zone (DESIGN: the project time zone decides local days)", () => {
  it("23:30 local time counts on that local day, though UTC has moved on", () => {
    const instant = at("2031-05-06T23:30:00-04:00"); // America/New_York is UTC−4 in May (EDT)
    expect(new Date(instant).toISOString().slice(0, 10)).toBe("2031-05-07");
    expect(localDayOf(instant, "America/New_York")).toBe("2031-05-06");
  });
  it("local wall time back to the instant, also across a daylight-saving change", () => {
    expect(instantOfLocal("2031-05-06", 23 * 60 + 30, "America/New_York")).toBe(at("2031-05-06T23:30:00-04:00"));
    expect(instantOfLocal("2031-01-06", 7 * 60, "America/New_York")).toBe(at("2031-01-06T07:00:00-05:00"));
    // US DST in 2031 starts on Sunday 9 March (second Sunday of March, 15 USC 260a): 07:00 is already EDT.
    expect(instantOfLocal("2031-03-09", 7 * 60, "America/New_York")).toBe(at("2031-03-09T07:00:00-04:00"));
  });
});

describe("missed sampling intervals while work is active (e.g. every 6 h in state permits, a project setting)", () => {
  const routine = { intervalMinutes: 360, workdayStartMinutes: 7 * 60, workdayEndMinutes: 19 * 60 };
  const zone = "America/New_York";
  it("a 07:00–19:00 day sampled every 6 h has two intervals; one reading in the first leaves the second missed", () => {
    const missed = missedIntervals(["2031-05-06"], [at("2031-05-06T08:15:00-04:00")], routine, zone);
    expect(missed).toEqual([{ day: "2031-05-06", fromMs: at("2031-05-06T13:00:00-04:00"), toMs: at("2031-05-06T19:00:00-04:00") }]);
  });
  it("no gaps on a day with a reading in each interval; a day without work is never a gap", () => {
    const readings = [at("2031-05-06T08:15:00-04:00"), at("2031-05-06T18:59:00-04:00")];
    expect(missedIntervals(["2031-05-06"], readings, routine, zone)).toEqual([]);
    expect(missedIntervals([], readings, routine, zone)).toEqual([]);
  });
  it("a reading at 19:00 sharp belongs to no interval of the day (intervals are half-open)", () => {
    expect(missedIntervals(["2031-05-06"], [at("2031-05-06T08:00:00-04:00"), at("2031-05-06T19:00:00-04:00")], routine, zone)).toHaveLength(1);
  });
  it("the last interval is cut at the day's end (07:00–17:00 every 4 h: 07–11, 11–15, 15–17)", () => {
    const missed = missedIntervals(["2031-05-06"], [], { intervalMinutes: 240, workdayStartMinutes: 420, workdayEndMinutes: 1020 }, zone);
    expect(missed.map((gap) => (gap.toMs - gap.fromMs) / MINUTE)).toEqual([240, 240, 120]);
  });
});

// "Twice daily, at least 4 hours apart": a routine of this form is recalled from memory of state
// permit monitoring conditions (memory: a project setting, check the permit's own words).
describe("samples a day, at least so long apart (twice daily, ≥ 4 h: memory, a project setting)", () => {
  const routine = { intervalMinutes: 0, workdayStartMinutes: 7 * 60, workdayEndMinutes: 19 * 60, samplesPerDay: 2, minimumGapMinutes: 240 };
  const zone = "America/New_York";
  const day = "2031-05-06";
  const local = (clock: string) => at(`${day}T${clock}:00-04:00`);
  it("08:00 and 12:00 are exactly 4 h apart: both count, nothing missed (the limit is inclusive)", () => {
    expect(missedIntervals([day], [local("08:00"), local("12:00")], routine, zone)).toEqual([]);
  });
  it("08:00 and 10:00 count once (2 h apart): the second sample could have been taken 12:00–19:00 (computed: 08:00 + 4 h)", () => {
    expect(missedIntervals([day], [local("08:00"), local("10:00")], routine, zone)).toEqual([{ day, fromMs: local("12:00"), toMs: local("19:00"), samplesShort: 1 }]);
  });
  it("one sample at 13:00 leaves 07:00–09:00 and 17:00–19:00 (computed: 13:00 ∓ 4 h cut from the work day)", () => {
    expect(missedIntervals([day], [local("13:00")], routine, zone)).toEqual([
      { day, fromMs: local("07:00"), toMs: local("09:00"), samplesShort: 1 },
      { day, fromMs: local("17:00"), toMs: local("19:00"), samplesShort: 1 },
    ]);
  });
  it("no sample on an active day: the whole work day, two short; a day without work is never a gap", () => {
    expect(missedIntervals([day], [], routine, zone)).toEqual([{ day, fromMs: local("07:00"), toMs: local("19:00"), samplesShort: 2 }]);
    expect(missedIntervals([], [], routine, zone)).toEqual([]);
  });
  it("three samples 08:00, 10:00, 12:30: earliest first counts 08:00 and 12:30, the most any choice gives (computed)", () => {
    expect(countedSamples([local("08:00"), local("10:00"), local("12:30")], 240 * MINUTE)).toEqual([local("08:00"), local("12:30")]);
    expect(missedIntervals([day], [local("08:00"), local("10:00"), local("12:30")], routine, zone)).toEqual([]);
  });
  it("a sample outside the work day does not count (18:30 and 19:30: one counted)", () => {
    expect(missedIntervals([day], [local("18:30"), local("19:30")], routine, zone)).toEqual([{ day, fromMs: local("07:00"), toMs: local("14:30"), samplesShort: 1 }]);
  });
});

// "Twice daily, no more than 4 hours apart": the example of the other wording, a pair taken
// close together (memory, as above: a project setting, check the permit's own words).
describe("samples a day, no more than so long apart (twice daily, ≤ 4 h: memory, a project setting)", () => {
  const routine = { intervalMinutes: 0, workdayStartMinutes: 7 * 60, workdayEndMinutes: 19 * 60, samplesPerDay: 2, minimumGapMinutes: 240, gapRule: "at-most" as const };
  const zone = "America/New_York";
  const day = "2031-05-06";
  const local = (clock: string) => at(`${day}T${clock}:00-04:00`);
  it("08:00 and 12:00 are exactly 4 h apart: both count, nothing missed (the limit is inclusive)", () => {
    expect(missedIntervals([day], [local("08:00"), local("12:00")], routine, zone)).toEqual([]);
  });
  it("08:00 and 13:00 are 5 h apart: one counts, the other could have been taken 07:00–08:00 or 08:00–12:00 (computed: 08:00 ∓ 4 h in the work day)", () => {
    expect(missedIntervals([day], [local("08:00"), local("13:00")], routine, zone)).toEqual([
      { day, fromMs: local("07:00"), toMs: local("08:00"), samplesShort: 1 },
      { day, fromMs: local("08:00"), toMs: local("12:00"), samplesShort: 1 },
    ]);
  });
  it("the longest run counts: 08:00, 13:00, 15:00, 18:30 gives 13:00–15:00–18:30 (each within 4 h of the one before; computed)", () => {
    expect(runWithinGap([local("08:00"), local("13:00"), local("15:00"), local("18:30")], 240 * MINUTE)).toEqual([local("13:00"), local("15:00"), local("18:30")]);
    expect(missedIntervals([day], [local("08:00"), local("13:00"), local("15:00"), local("18:30")], routine, zone)).toEqual([]);
  });
  it("no sample on an active day: the whole work day, two short", () => {
    expect(missedIntervals([day], [], routine, zone)).toEqual([{ day, fromMs: local("07:00"), toMs: local("19:00"), samplesShort: 2 }]);
  });
  it("the same samples judged \"at least 4 h apart\" instead: 08:00 and 10:00 count once there, twice here (the wording decides)", () => {
    expect(missedIntervals([day], [local("08:00"), local("10:00")], routine, zone)).toEqual([]);
    expect(missedIntervals([day], [local("08:00"), local("10:00")], { ...routine, gapRule: "at-least" }, zone)).toHaveLength(1);
  });
});

// Shutdown distance and wait: 50 ft and 30 min, recalled from memory of common Florida permit
// conditions (memory: check against the permit; project settings).
describe("wildlife stand-downs (default 50 ft / 30 min: memory, a project setting)", () => {
  const settings = { shutdownDistance: DEFAULT_SHUTDOWN_DISTANCE_FT, waitMinutes: DEFAULT_STAND_DOWN_WAIT_MINUTES };
  const seen = at("2031-05-06T10:00:00-04:00");
  it("within the distance (inclusive) starts a stand-down; beyond it does not", () => {
    expect(withinShutdownDistance(50, settings)).toBe(true);
    expect(withinShutdownDistance(50.5, settings)).toBe(false);
    expect(effectOfSighting(null, { seenAtMs: seen, distance: 30, gone: false }, settings)).toEqual({ kind: "start" });
    expect(effectOfSighting(null, { seenAtMs: seen, distance: 80, gone: false }, settings)).toEqual({ kind: "none" });
  });
  it("ends the wait after the animal leaves on its own, not before", () => {
    const state = { startedAtMs: seen, departedAtMs: null };
    expect(standDownActiveAt(state, seen + 5 * 60 * MINUTE, settings.waitMinutes)).toBe(true);
    const left = seen + 20 * MINUTE;
    const effect = effectOfSighting(state, { seenAtMs: left, distance: null, gone: true }, settings);
    expect(effect).toEqual({ kind: "depart", untilMs: left + 30 * MINUTE });
    const departed = { startedAtMs: seen, departedAtMs: left };
    expect(standDownEndMs(departed, settings.waitMinutes)).toBe(left + 30 * MINUTE);
    expect(standDownActiveAt(departed, left + 29 * MINUTE, settings.waitMinutes)).toBe(true);
    expect(standDownActiveAt(departed, left + 30 * MINUTE, settings.waitMinutes)).toBe(false);
  });
  it("an animal back within the distance during the wait renews the stand-down; after the wait it starts a new one", () => {
    const departed = { startedAtMs: seen, departedAtMs: seen + 20 * MINUTE };
    expect(effectOfSighting(departed, { seenAtMs: seen + 40 * MINUTE, distance: 10, gone: false }, settings)).toEqual({ kind: "renew" });
    expect(effectOfSighting(departed, { seenAtMs: seen + 50 * MINUTE, distance: 10, gone: false }, settings)).toEqual({ kind: "start" });
  });
  it("moving beyond the distance counts as leaving", () => {
    const state = { startedAtMs: seen, departedAtMs: null };
    expect(effectOfSighting(state, { seenAtMs: seen + 10 * MINUTE, distance: 200, gone: false }, settings).kind).toBe("depart");
  });
});
