import { instantOfLocal } from "../shared/local-time";
import { isWeekday, dayNumber, isoDateOf } from "../shared/progress/calendar-days";
import { mulberry32 } from "./prng";
import { PROJECT } from "./scenario";

/**
 * The demo's water-quality record, invented: three stations at the fictional Wickerbill Spring,
 * the permit rule (an invented permit number), two weeks of turbidity readings on work days with
 * one exceedance on 12 November and its resolution (agency told, resample within the limit,
 * resumption recorded), one missed afternoon sample, and a few wildlife sightings. Seeded, so the
 * same seed gives the same record.
 */

export const DEMO_WATER_QUALITY_SEED = 20261103;

/**
 * Positions in the project CRS (US survey feet), whole feet, placed in the water with outline.ts's
 * design (feet from the vent): BG-1 in the vent basin 60 ft north of the vent, at the head of the
 * run; OF-1 at the return outfall, 8 ft inside the run's left bank 490 ft down the centre line;
 * CP-1 on the centre line 150 ft further down-run. The demo has no shoreline of its own, so its
 * water on the map is the work limit: water-quality.test.ts checks that each station lies inside
 * it, clear of the bank.
 */
export const DEMO_STATIONS = [
  { name: "BG-1 up-run", kind: "background", depth: "mid-depth", position: { x: 600_191, y: 1_680_027 } },
  { name: "CP-1 plume, 150 ft down-run", kind: "compliance", depth: "mid-depth", position: { x: 600_825, y: 1_679_821 } },
  { name: "OF-1 return outfall", kind: "outfall", depth: "surface", position: { x: 600_674, y: 1_679_850 } },
] as const;

export const DEMO_RULE = {
  kind: "above-background",
  limit: 29,
  inclusive: true,
  pairingWindowMinutes: 60,
  notifyWithinHours: 24,
  source: "Invented demo permit FCWA-0426-ERP, specific condition 14 (after the state criterion of 29 NTU above natural background)",
} as const;

export interface DemoReading {
  station: string;
  takenAt: string;
  value: number;
  unit: "NTU";
  instrument: string;
  sampledBy: string;
  note: string;
}

export interface DemoSighting {
  species: string;
  seenAt: string;
  distance: number | null;
  gone: boolean;
  observer: string;
  note: string;
  /** Where the animal was, in the project CRS (drawn on the map); none for the older sightings. */
  position?: { x: number; y: number };
}

const at = (day: string, clock: string) => new Date(instantOfLocal(day, Number(clock.slice(0, 2)) * 60 + Number(clock.slice(3, 5)), PROJECT.timeZone)).toISOString();
const round1 = (value: number) => Math.round(value * 10) / 10;

export const EXCEEDANCE_DAY = "2026-11-12";
/** The work day whose afternoon compliance sample was missed (dives were logged that day). */
export const MISSED_AFTERNOON_DAY = "2026-11-10";

export function buildDemoWaterQuality(seed = DEMO_WATER_QUALITY_SEED) {
  const random = mulberry32(seed);
  const readings: DemoReading[] = [];
  const sample = (station: string, day: string, clock: string, value: number, sampledBy: string, note = "") =>
    readings.push({ station, takenAt: at(day, clock), value: round1(value), unit: "NTU", instrument: "Turbidimeter TB-7 (fictional)", sampledBy, note });
  for (let dayIndex = dayNumber("2026-11-03"); dayIndex <= dayNumber("2026-11-16"); dayIndex += 1) {
    if (!isWeekday(dayIndex)) continue;
    const day = isoDateOf(dayIndex);
    for (const [backgroundClock, complianceClock] of [["08:15", "08:35"], ["13:45", "14:05"]] as const) {
      if (day === MISSED_AFTERNOON_DAY && backgroundClock === "13:45") continue;
      const background = random.between(3, 7);
      sample(DEMO_STATIONS[0].name, day, backgroundClock, background, "Marisol Quaye");
      sample(DEMO_STATIONS[1].name, day, complianceClock, background + random.between(2, 16), "Marisol Quaye");
    }
    sample(DEMO_STATIONS[2].name, day, "11:00", random.between(6, 20), "Marisol Quaye");
  }
  // The exceedance: a torn silt curtain at the discharge; resampled after the repair.
  sample(DEMO_STATIONS[0].name, EXCEEDANCE_DAY, "10:00", 4.8, "Tobias Fennimore");
  sample(DEMO_STATIONS[1].name, EXCEEDANCE_DAY, "10:15", 41.2, "Tobias Fennimore", "Plume visibly wider; silt curtain torn at the east float.");
  sample(DEMO_STATIONS[0].name, EXCEEDANCE_DAY, "12:30", 5.0, "Tobias Fennimore");
  sample(DEMO_STATIONS[1].name, EXCEEDANCE_DAY, "12:40", 14.1, "Tobias Fennimore", "Resample after the curtain was repaired.");
  readings.sort((a, b) => a.takenAt.localeCompare(b.takenAt));
  const resolution = {
    agencyNotice: { notifiedAt: at(EXCEEDANCE_DAY, "11:05"), to: "District compliance officer (fictional)", how: "telephone, then e-mail" },
    resumedAt: at(EXCEEDANCE_DAY, "12:55"),
    note: "Silt curtain repaired at the east float; resample 14.1 NTU against background 5.0 is within the limit.",
  };
  const sightings: DemoSighting[] = [
    { species: "manatee", seenAt: at("2026-11-05", "10:20"), distance: 35, gone: false, observer: "Wendell Achterberg", note: "Cow and calf entering the run from downstream." },
    { species: "manatee", seenAt: at("2026-11-05", "10:55"), distance: null, gone: true, observer: "Wendell Achterberg", note: "Left downstream on their own." },
    { species: "sea turtle", seenAt: at("2026-11-09", "09:10"), distance: 120, gone: false, observer: "Tobias Fennimore", note: "" },
    { species: "manatee", seenAt: at("2026-11-13", "14:30"), distance: 20, gone: false, observer: "Marisol Quaye", note: "Single adult at the outfall." },
    { species: "manatee", seenAt: at("2026-11-13", "14:50"), distance: 150, gone: false, observer: "Marisol Quaye", note: "Moving away up-run." },
  ];
  return { stations: DEMO_STATIONS, rule: DEMO_RULE, readings, resolution, sightings };
}

/**
 * Sightings in the hours before the demo is seeded, so that a freshly seeded demo's map shows the
 * last day's sightings (the November ones are long past by then). Each is a fixed number of
 * minutes before the seeding time, beyond the default shutdown distance of 50 ft (so none starts
 * a stand-down that would stop today's work), at a position in the run: the same seeding time
 * gives the same sightings.
 */
export const RECENT_SIGHTINGS = [
  { minutesBefore: 150, species: "sea turtle", distance: 180, position: { x: 600_523, y: 1_679_892 }, observer: "Tobias Fennimore", note: "Surfaced twice mid-run, heading down-run." },
  { minutesBefore: 420, species: "manatee", distance: 240, position: { x: 600_840, y: 1_679_825 }, observer: "Marisol Quaye", note: "Single adult below the compliance station, resting." },
] as const;

export function recentDemoSightings(seededAtMs: number): DemoSighting[] {
  const minute = Math.floor(seededAtMs / 60_000) * 60_000;
  return RECENT_SIGHTINGS.map((sighting) => ({
    species: sighting.species, seenAt: new Date(minute - sighting.minutesBefore * 60_000).toISOString(), distance: sighting.distance, gone: false,
    observer: sighting.observer, note: sighting.note, position: { ...sighting.position },
  }));
}
