import { describe, expect, it } from "vitest";
import { missedIntervals } from "../shared/water-quality/missed-samples";
import { pairBackground } from "../shared/water-quality/pairing";
import { evaluateTurbidity } from "../shared/water-quality/turbidity-rule";
import { buildDemoWaterQuality, EXCEEDANCE_DAY, MISSED_AFTERNOON_DAY, recentDemoSightings } from "./water-quality";
import { DEFAULT_SHUTDOWN_DISTANCE_FT } from "../shared/water-quality/stand-down";
import { PROJECT } from "./scenario";

// The demo's story holds when its readings go through the same pure rules the app applies.
describe("the demo water-quality record", () => {
  const demo = buildDemoWaterQuality();
  const [background, compliance] = [demo.stations[0].name, demo.stations[1].name];
  const backgrounds = demo.readings.filter((reading) => reading.station === background).map((reading, id) => ({ id, takenAtMs: Date.parse(reading.takenAt), value: reading.value }));
  const rule = { kind: demo.rule.kind, limitNtu: demo.rule.limit, inclusive: demo.rule.inclusive, percent: null, floorNtu: null, capNtu: null };
  const verdicts = demo.readings.filter((reading) => reading.station === compliance).map((reading) => ({
    reading,
    evaluation: evaluateTurbidity(rule, reading.value, pairBackground(Date.parse(reading.takenAt), backgrounds, demo.rule.pairingWindowMinutes)?.value ?? null),
  }));

  it("every compliance reading is paired, and exactly one exceeds: 41.2 on the exceedance day", () => {
    expect(verdicts.every((entry) => entry.evaluation.paired)).toBe(true);
    const exceeding = verdicts.filter((entry) => entry.evaluation.exceeds);
    expect(exceeding.map((entry) => entry.reading.value)).toEqual([41.2]);
    expect(exceeding[0].reading.takenAt.startsWith(EXCEEDANCE_DAY)).toBe(true);
  });

  it("the resample before the resumption is within the limit", () => {
    const resample = verdicts.filter((entry) => entry.reading.takenAt > verdicts.find((candidate) => candidate.evaluation.exceeds)!.reading.takenAt && entry.reading.takenAt <= demo.resolution.resumedAt);
    expect(resample.at(-1)!.evaluation.exceeds).toBe(false);
  });

  it("the one missed interval is the afternoon it says, on a day dives were logged", () => {
    const missed = missedIntervals(["2026-11-10", "2026-11-12"], verdicts.map((entry) => Date.parse(entry.reading.takenAt)), { intervalMinutes: 360, workdayStartMinutes: 420, workdayEndMinutes: 1140 }, PROJECT.timeZone);
    expect(missed.map((gap) => gap.day)).toEqual([MISSED_AFTERNOON_DAY]);
  });

  it("is the same for the same seed", () => {
    expect(buildDemoWaterQuality()).toEqual(demo);
  });
});

describe("the demo's sightings of the last day, placed before the seeding time", () => {
  const seededAtMs = Date.parse("2027-03-09T13:47:31Z");
  const recent = recentDemoSightings(seededAtMs);

  it("fall within the 24 hours before the seeding, none in the future (the map's default window)", () => {
    expect(recent.length).toBeGreaterThan(0);
    for (const sighting of recent) {
      const ageMs = seededAtMs - Date.parse(sighting.seenAt);
      expect(ageMs).toBeGreaterThan(0);
      expect(ageMs).toBeLessThan(24 * 3_600_000);
    }
  });

  it("each has a position and is beyond the default shutdown distance, so none stops today's work (practice)", () => {
    expect(recent.every((sighting) => sighting.position !== undefined && !sighting.gone)).toBe(true);
    expect(recent.every((sighting) => sighting.distance! > DEFAULT_SHUTDOWN_DISTANCE_FT)).toBe(true);
  });

  it("is the same for the same seeding time, whole minutes before it (invariant)", () => {
    expect(recentDemoSightings(seededAtMs + 20_000)).toEqual(recent);
    expect(recent.map((sighting) => sighting.seenAt)).toEqual(["2027-03-09T11:17:00.000Z", "2027-03-09T06:47:00.000Z"]);
  });
});
