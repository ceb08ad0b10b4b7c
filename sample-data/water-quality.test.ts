import { describe, expect, it } from "vitest";
import { missedIntervals } from "../shared/water-quality/missed-samples";
import { pairBackground } from "../shared/water-quality/pairing";
import { evaluateTurbidity } from "../shared/water-quality/turbidity-rule";
import { buildDemoWaterQuality, DEMO_STATIONS, EXCEEDANCE_DAY, MISSED_AFTERNOON_DAY, recentDemoSightings } from "./water-quality";
import { DEFAULT_SHUTDOWN_DISTANCE_FT } from "../shared/water-quality/stand-down";
import { PROJECT, VENT_LON_LAT, WORK_LIMIT } from "./scenario";
import { demoProjection } from "./projection";

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

// The demo seeds no shoreline, so the map draws its water as the work limit (map-style.server.ts)
// and everything outside it as land. A station or a sighting must be inside, clear of the bank.
describe("the demo's stations and placed sightings are in the water", () => {
  const projection = demoProjection(PROJECT.crs);
  const ring = WORK_LIMIT.coordinates[0].map(([lon, lat]) => projection.toProjected(lon, lat));
  const MIN_CLEARANCE_FT = 5;

  /** Even-odd ray casting in the projected plane (geometry): inside when a ray crosses the ring an odd number of times. */
  function inside(x: number, y: number): boolean {
    let crossings = 0;
    for (let index = 0; index < ring.length - 1; index++) {
      const [x0, y0] = ring[index];
      const [x1, y1] = ring[index + 1];
      if ((y0 > y) !== (y1 > y) && x < x0 + ((y - y0) * (x1 - x0)) / (y1 - y0)) crossings += 1;
    }
    return crossings % 2 === 1;
  }
  /** Distance in feet to the nearest edge of the ring (point-to-segment, geometry). */
  function clearanceFt(x: number, y: number): number {
    let nearest = Infinity;
    for (let index = 0; index < ring.length - 1; index++) {
      const [x0, y0] = ring[index];
      const [x1, y1] = ring[index + 1];
      const lengthSquared = (x1 - x0) ** 2 + (y1 - y0) ** 2;
      const along = Math.max(0, Math.min(1, ((x - x0) * (x1 - x0) + (y - y0) * (y1 - y0)) / lengthSquared));
      nearest = Math.min(nearest, Math.hypot(x - (x0 + along * (x1 - x0)), y - (y0 + along * (y1 - y0))));
    }
    return nearest;
  }

  it.each(DEMO_STATIONS.map((station) => [station.name, station.position] as const))("station %s is inside the work limit, at least 5 ft from its edge", (_name, position) => {
    expect(inside(position.x, position.y)).toBe(true);
    expect(clearanceFt(position.x, position.y)).toBeGreaterThanOrEqual(MIN_CLEARANCE_FT);
  });

  it("so is each of the last day's sightings", () => {
    for (const sighting of recentDemoSightings(Date.parse("2027-03-09T13:47:31Z"))) {
      expect(inside(sighting.position!.x, sighting.position!.y), sighting.species).toBe(true);
      expect(clearanceFt(sighting.position!.x, sighting.position!.y), sighting.species).toBeGreaterThanOrEqual(MIN_CLEARANCE_FT);
    }
  });

  it("and the check tells land from water: the vent is water, BG-1's former spot 152 ft north of it is land (negative control)", () => {
    const vent = projection.toProjected(VENT_LON_LAT[0], VENT_LON_LAT[1]);
    expect(inside(vent[0], vent[1])).toBe(true);
    expect(inside(600_180, 1_680_120)).toBe(false);
  });
});
