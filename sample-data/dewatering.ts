import { computeShiftFigures } from "../shared/dewatering/shift";
import { kilogramsTo } from "../shared/units";
import { mulberry32 } from "./prng";

/**
 * The invented dewatering records of the demo (Wickerbill Spring run): shift logs from the first
 * pumping day after the baseline survey to the week before the closeout, four geotextile tubes on
 * the laydown area filled one after another, haul tickets of the first tube's cake to a farm, and
 * two lab samples taken with the baseline. Sized so that the dry solids pumped come out near the
 * dry mass the surveyed removal gives at the samples' densities (about 5,000 yd³ removed at 8–11
 * lb/ft³ dry), as a real job's would, with the difference a reconciliation is there to show.
 *
 * Organic muck is light: a solids specific gravity of 1.8 (the project's setting, from the lab),
 * slurry solids of 4–5.5 % by weight through a 6-inch line at 500–600 gpm. All names are invented.
 */

const SEED = 20261015;
export const DEMO_SOLIDS_SPECIFIC_GRAVITY = 1.8;
export const DEMO_CAKE_SOLIDS_BY_WEIGHT = 0.28;
/** The tube supplier's fill limit on the invented job: flag a tube at 90 % of its rated dry capacity. */
export const DEMO_TUBE_NEAR_CAPACITY_SHARE = 0.9;

/**
 * The operator's jar tests: one before the first pumping day and one when the polymer lot changed,
 * each with four 1-litre jars dosed from a 0.1 % bench stock (invented readings; the dose chosen
 * is the one the shifts then ran near).
 */
export const DEMO_JAR_TESTS = [
  {
    date: "2026-09-09", time: "14:20", sampleSource: "slurry from the main line at the tube manifold",
    polymer: { product: "Cationic PAM emulsion CE-412", lot: "LOT 26-0811", benchStockPercent: 0.1 }, jarVolumeMl: 1000, raw: { turbidityNtu: 640 },
    jars: [
      { doseMgPerL: 2, settlingMinutes: 10, turbidityNtu: 210, clarity: "turbid" },
      { doseMgPerL: 4, settlingMinutes: 10, turbidityNtu: 48, clarity: "hazy" },
      { doseMgPerL: 6, settlingMinutes: 10, turbidityNtu: 14, clarity: "clear" },
      { doseMgPerL: 8, settlingMinutes: 10, turbidityNtu: 19, clarity: "slightly-hazy" },
    ],
    chosenDoseMgPerL: 6, notes: "Large floc at 6 mg/L, settled in under 3 minutes; 8 mg/L left the water slightly slick.",
  },
  {
    date: "2026-10-15", time: "06:45", sampleSource: "slurry from the main line at the tube manifold",
    polymer: { product: "Cationic PAM emulsion CE-412", lot: "LOT 26-0930", benchStockPercent: 0.1 }, jarVolumeMl: 1000, raw: { turbidityNtu: 585 },
    jars: [
      { doseMgPerL: 3, settlingMinutes: 10, turbidityNtu: 96, clarity: "hazy" },
      { doseMgPerL: 4.5, settlingMinutes: 10, turbidityNtu: 22, clarity: "slightly-hazy" },
      { doseMgPerL: 6, settlingMinutes: 10, turbidityNtu: 11, clarity: "clear" },
      { doseMgPerL: 7.5, settlingMinutes: 10, turbidityNtu: 11, clarity: "clear" },
    ],
    chosenDoseMgPerL: 6, notes: "New lot: same dose holds.",
  },
] as const;

export interface DemoShift {
  date: string;
  start: string;
  end: string;
  pumpHours: number;
  slurryFlow: { value: number; unit: "gpm" };
  solidsByWeight: number;
  polymer: { product: string; lot: string; doseMgPerL: number; stockPercent: number };
  tubes: string[];
  notes: string;
}

export interface DemoTube {
  name: string;
  circumference: number;
  length: number;
  capacityDryMassPerLength: number;
  /** Where its life stands when the demo is seeded. */
  finalStatus: "filling" | "dewatering" | "ready-to-open" | "opened" | "hauled";
  notes: string;
  /** Its centre on the laydown area north of the vent basin, feet east and north of the vent (on land: the basin's shore is about 130 ft out). */
  laydown: { eastFt: number; northFt: number };
  /** Degrees clockwise from grid north. */
  bearingDegrees: number;
}

export interface DemoHaul {
  date: string;
  ticketNumber: string;
  truck: string;
  site: string;
  load: { value: number; unit: "short-ton" };
  cakeSolidsByWeight: number | null;
}

export const DEMO_TUBES: DemoTube[] = [
  { name: "T-1", circumference: 60, length: 150, capacityDryMassPerLength: 1.1, finalStatus: "hauled", notes: "Laydown row A, west end", laydown: { eastFt: -90, northFt: 240 }, bearingDegrees: 90 },
  { name: "T-2", circumference: 60, length: 150, capacityDryMassPerLength: 1.1, finalStatus: "opened", notes: "Laydown row A, east end", laydown: { eastFt: 90, northFt: 240 }, bearingDegrees: 90 },
  { name: "T-3", circumference: 60, length: 150, capacityDryMassPerLength: 1.1, finalStatus: "dewatering", notes: "Laydown row B", laydown: { eastFt: -90, northFt: 275 }, bearingDegrees: 90 },
  { name: "T-4", circumference: 60, length: 180, capacityDryMassPerLength: 1.1, finalStatus: "filling", notes: "Laydown row B, north", laydown: { eastFt: 105, northFt: 275 }, bearingDegrees: 90 },
];

export const DEMO_HAUL_SITES = [
  { name: "Bellwether Farm", kind: "reuse" as const, permitNumber: "SA-2026-0417 (land application agreement)" },
  { name: "Fennick County Class III cell", kind: "disposal" as const, permitNumber: "SW-88213" },
];

/** Two samples taken with the baseline survey; densities and nutrients typical of organic spring-run muck (invented). */
export const DEMO_SAMPLES = [
  { date: "2026-09-08", zone: "Vent basin", cell: null, percentSolids: 11.5, dryBulkDensity: { value: 8.6, unit: "lb/ft3" as const }, organicMatterPercent: 58, totalNitrogenMgKg: 18_400, totalPhosphorusMgKg: 1_150, lab: "Sawgrass Analytical (fictional)", reportNumber: "SA-26-3391" },
  { date: "2026-09-08", zone: "Lower run", cell: null, percentSolids: 14.2, dryBulkDensity: { value: 11.2, unit: "lb/ft3" as const }, organicMatterPercent: 41, totalNitrogenMgKg: 13_900, totalPhosphorusMgKg: 820, lab: "Sawgrass Analytical (fictional)", reportNumber: "SA-26-3392" },
];

/** Weekdays from `first` to `last`, every `step`-th one. */
function everyNthWeekday(first: string, last: string, step: number): string[] {
  const days: string[] = [];
  let count = 0;
  for (let day = new Date(`${first}T00:00:00Z`); day <= new Date(`${last}T00:00:00Z`); day.setUTCDate(day.getUTCDate() + 1)) {
    const weekday = day.getUTCDay();
    if (weekday === 0 || weekday === 6) continue;
    if (count++ % step === 0) days.push(day.toISOString().slice(0, 10));
  }
  return days;
}

export function demoDewatering(): { shifts: DemoShift[]; hauls: DemoHaul[] } {
  const random = mulberry32(SEED);
  const round = (value: number, digits: number) => Math.round(value * 10 ** digits) / 10 ** digits;
  const filled = new Map(DEMO_TUBES.map((tube) => [tube.name, 0]));
  let tubeIndex = 0;
  const shifts = everyNthWeekday("2026-09-10", "2026-11-20", 4).map((date): DemoShift => {
    const shift = {
      date, start: "07:00", end: "15:30",
      pumpHours: round(random.between(6, 7.5), 1),
      slurryFlow: { value: Math.round(random.between(500, 600)), unit: "gpm" as const },
      solidsByWeight: round(random.between(0.038, 0.056), 3),
      polymer: { product: "Cationic PAM emulsion CE-412", lot: date < "2026-10-15" ? "LOT 26-0811" : "LOT 26-0930", doseMgPerL: round(random.between(4, 7), 1), stockPercent: 0.5 },
    };
    // The tube being filled: the next one once this shift would take the current past 95 % of its capacity.
    const dryTons = kilogramsTo(computeShiftFigures({ ...shift, solidsSpecificGravity: DEMO_SOLIDS_SPECIFIC_GRAVITY }, "us-ft").drySolidsKg!, "short-ton");
    const capacityOf = (index: number) => DEMO_TUBES[index].capacityDryMassPerLength * DEMO_TUBES[index].length;
    if (filled.get(DEMO_TUBES[tubeIndex].name)! + dryTons > 0.95 * capacityOf(tubeIndex) && tubeIndex < DEMO_TUBES.length - 1) tubeIndex++;
    const tube = DEMO_TUBES[tubeIndex].name;
    filled.set(tube, filled.get(tube)! + dryTons);
    return { ...shift, tubes: [tube], notes: random.next() < 0.2 ? "Stopped 30 min to clear a root ball at the intake." : "" };
  });
  // T-1's cake, hauled to the farm in the week it was opened: tickets until its dry solids are out.
  const hauls: DemoHaul[] = [];
  let hauledTons = 0;
  const dates = everyNthWeekday("2026-11-02", "2026-11-13", 1);
  while (hauledTons < 0.97 * filled.get("T-1")!) {
    const wetTons = round(random.between(17, 22), 2);
    const sampled = hauls.length % 5 === 0 ? round(random.between(0.25, 0.31), 3) : null;
    hauledTons += wetTons * (sampled ?? DEMO_CAKE_SOLIDS_BY_WEIGHT);
    hauls.push({ date: dates[Math.min(dates.length - 1, Math.floor(hauls.length / 4))], ticketNumber: String(51200 + hauls.length), truck: `Truck ${1 + (hauls.length % 3)}`, site: DEMO_HAUL_SITES[0].name, load: { value: wetTons, unit: "short-ton" }, cakeSolidsByWeight: sampled });
  }
  return { shifts, hauls };
}
