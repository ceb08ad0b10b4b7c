/**
 * Generates the demo scenario's files (invented project, see scenario.ts):
 *   npx tsx sample-data/generate.ts [--out DIR] [--seed N]
 * Default output sample-data/demo/. The same seed always gives the same bytes.
 * `buildDemoSurveys(seed)` builds the same surveys in memory for tests.
 */
import { createHash } from "node:crypto";
import { mkdirSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { createBottom, runPosition } from "./bottom";
import { UPPER_RUN_STATIONS_FT, bankPoint } from "./outline";
import { mulberry32 } from "./prng";
import { demoProjection } from "./projection";
import { PASS_PLANS, drawCellOutcome, remainingThicknessFt, type CellOutcome } from "./removal";
import {
  GRID,
  PROJECT,
  SURVEYS,
  VENT_LON_LAT,
  WORK_LIMIT,
  ZONES,
  type DemoSurvey,
  type LonLat,
} from "./scenario";
import { planSoundings, type PlannedSounding, type Ring } from "./survey-lines";

export const DEFAULT_SEED = 20260908;

/** Sounding noise: rod-and-probe readings scatter by a few hundredths, never more than 0.1 ft. */
const DEPTH_NOISE_FT = { standardDeviation: 0.035, limit: 0.1 };
const PROBE_NOISE_FT = { standardDeviation: 0.04, limit: 0.1 };
/** Seconds per sounding (a probe takes longer than a depth reading) and per turn at a line's end. */
const SECONDS_PER_SOUNDING = { baseline: 2.8, other: 2.2 };
const SECONDS_PER_TURN = 30;

/** One survey's soundings as flat arrays (projected us-ft, depths ft below the water surface). */
export interface DemoSoundings {
  pointIds: string[];
  easting: Float64Array;
  northing: Float64Array;
  depthFt: Float64Array;
  /** Depth to refusal; baseline only. */
  probeFt: Float64Array | null;
  /** ISO-8601 local time with UTC offset. */
  time: string[];
}

export interface DemoSurveyData {
  survey: DemoSurvey;
  soundings: DemoSoundings;
}

export interface DemoSurveys {
  seed: number;
  surveys: DemoSurveyData[];
  /** Soundings deliberately placed just outside the work limit (progress 2). */
  outsidePointIds: string[];
  /** The synthetic truth, at projected coordinates (us-ft), NAVD88 ft. */
  firmElevationFt(easting: number, northing: number): number;
  baselineMuckThicknessFt(easting: number, northing: number): number;
}

/** FNV-1a, to give each part of the scenario its own random stream from one seed. */
function streamSeed(seed: number, name: string): number {
  let hash = 0x811c9dc5 ^ (seed >>> 0);
  for (const character of name) {
    hash ^= character.charCodeAt(0);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return hash >>> 0;
}

const round2 = (value: number) => Math.round(value * 100) / 100;

function localTime(survey: DemoSurvey, secondsAfterStart: number): string {
  const [hours, minutes] = survey.startTime.split(":").map(Number);
  const total = Math.round(hours * 3600 + minutes * 60 + secondsAfterStart);
  if (total >= 24 * 3600) throw new Error(`${survey.key}: the survey day runs past midnight`);
  const pad = (value: number) => String(value).padStart(2, "0");
  const clock = `${pad(Math.floor(total / 3600))}:${pad(Math.floor(total / 60) % 60)}:${pad(total % 60)}`;
  return `${survey.surveyedOn}T${clock}${survey.utcOffset}`;
}

const ID_PREFIX: Record<DemoSurvey["key"], string> = {
  baseline: "BL",
  "progress-1": "P1",
  "progress-2": "P2",
  "progress-3": "P3",
  closeout: "CO",
};

export function buildDemoSurveys(seed: number = DEFAULT_SEED): DemoSurveys {
  const projection = demoProjection(PROJECT.crs);
  const [ventEasting, ventNorthing] = projection.toProjected(VENT_LON_LAT[0], VENT_LON_LAT[1]);
  const project = (ring: LonLat[]): Ring => ring.map(([lon, lat]) => projection.toProjected(lon, lat));
  const workLimitRing = project(WORK_LIMIT.coordinates[0]);
  const zoneRings = new Map(ZONES.map((zone) => [zone.name, project(zone.polygon.coordinates[0])]));
  const origin = { easting: GRID.originEastingFt, northing: GRID.originNorthingFt };

  const bottom = createBottom(mulberry32(streamSeed(seed, "bottom")));
  const firmAt = (easting: number, northing: number) =>
    bottom.firmElevationFt(easting - ventEasting, northing - ventNorthing);
  const thicknessAt = (easting: number, northing: number) =>
    bottom.muckThicknessFt(easting - ventEasting, northing - ventNorthing);

  function cellOutcome(key: Exclude<DemoSurvey["key"], "baseline">, easting: number, northing: number, cache: Map<string, CellOutcome>) {
    const row = Math.floor((northing - origin.northing) / GRID.cellSizeFt);
    const col = Math.floor((easting - origin.easting) / GRID.cellSizeFt);
    const cellKey = `${row},${col}`;
    let outcome = cache.get(cellKey);
    if (!outcome) {
      const centerEasting = origin.easting + (col + 0.5) * GRID.cellSizeFt;
      const centerNorthing = origin.northing + (row + 0.5) * GRID.cellSizeFt;
      const along = runPosition(centerEasting - ventEasting, centerNorthing - ventNorthing).alongFt;
      // Each cell draws from its own stream, so the outcome does not depend on sounding order.
      outcome = drawCellOutcome(PASS_PLANS[key], mulberry32(streamSeed(seed, `${key}:${cellKey}`)), along);
      cache.set(cellKey, outcome);
    }
    return outcome;
  }

  const outsidePointIds: string[] = [];
  const surveys = SURVEYS.map((survey): DemoSurveyData => {
    const random = mulberry32(streamSeed(seed, survey.key));
    const isBaseline = survey.kind === "baseline";
    const rings = isBaseline ? [workLimitRing] : survey.zones.map((name) => zoneRings.get(name)!);
    const planned: (PlannedSounding & { outside?: boolean })[] = planSoundings(rings, origin, random);
    if (survey.key === "progress-2") insertOutsideSoundings(planned, ventEasting, ventNorthing);

    const count = planned.length;
    const soundings: DemoSoundings = {
      pointIds: [],
      easting: new Float64Array(count),
      northing: new Float64Array(count),
      depthFt: new Float64Array(count),
      probeFt: isBaseline ? new Float64Array(count) : null,
      time: [],
    };
    const cache = new Map<string, CellOutcome>();
    const secondsPerSounding = isBaseline ? SECONDS_PER_SOUNDING.baseline : SECONDS_PER_SOUNDING.other;
    let seconds = 0;
    planned.forEach((point, index) => {
      const { easting, northing } = point;
      const firm = firmAt(easting, northing);
      const thickness = thicknessAt(easting, northing);
      const remaining = isBaseline || point.outside
        ? thickness
        : remainingThicknessFt(cellOutcome(survey.key as Exclude<DemoSurvey["key"], "baseline">, easting, northing, cache), thickness);
      const depthNoise = random.clippedNormal(DEPTH_NOISE_FT.standardDeviation, DEPTH_NOISE_FT.limit);
      let depth = survey.waterSurfaceElevationFt - (firm + remaining) + depthNoise;
      // The outside points sit on the shallow bank; keep them a plausible wadeable depth.
      if (point.outside) depth = Math.max(0.6, depth);
      if (depth < 0.3) throw new Error(`${survey.key}: sounding ${index} would be ${depth.toFixed(2)} ft deep`);
      soundings.easting[index] = round2(easting);
      soundings.northing[index] = round2(northing);
      soundings.depthFt[index] = round2(depth);
      if (soundings.probeFt) {
        const probe =
          survey.waterSurfaceElevationFt - firm +
          random.clippedNormal(PROBE_NOISE_FT.standardDeviation, PROBE_NOISE_FT.limit);
        // Muck is at least 0.5 ft and each reading errs by at most 0.1 ft, so probe ≥ depth holds.
        if (round2(probe) < soundings.depthFt[index]) throw new Error(`${survey.key}: probe above muck at ${index}`);
        soundings.probeFt[index] = round2(probe);
      }
      if (index > 0) seconds += point.startsLine ? SECONDS_PER_TURN : secondsPerSounding + random.between(-1, 1);
      const pointId = `${ID_PREFIX[survey.key]}-${String(index + 1).padStart(5, "0")}`;
      soundings.pointIds.push(pointId);
      soundings.time.push(localTime(survey, seconds));
      if (point.outside) outsidePointIds.push(pointId);
    });
    return { survey, soundings };
  });

  return {
    seed,
    surveys,
    outsidePointIds,
    firmElevationFt: firmAt,
    baselineMuckThicknessFt: thicknessAt,
  };
}

/**
 * Three soundings 4–9 ft beyond the upper run's north (left) bank, as a crew overshooting the
 * bank would take them: the import's "outside the work limit" check must show them. They sit
 * off the outline's bank vertices, where the drawn limit and the bank coincide.
 */
function insertOutsideSoundings(
  planned: (PlannedSounding & { outside?: boolean })[],
  ventEasting: number,
  ventNorthing: number,
): void {
  const spots: [stationFt: number, beyondFt: number][] = [
    [UPPER_RUN_STATIONS_FT[1], 4],
    [UPPER_RUN_STATIONS_FT[2], 6],
    [UPPER_RUN_STATIONS_FT[3], 9],
  ];
  for (const [station, beyond] of spots) {
    const [x, y] = bankPoint(station, "left", beyond);
    const easting = ventEasting + x;
    const northing = ventNorthing + y;
    let nearest = 0;
    let nearestDistance = Infinity;
    planned.forEach((point, index) => {
      const distance = Math.hypot(point.easting - easting, point.northing - northing);
      if (distance < nearestDistance) {
        nearestDistance = distance;
        nearest = index;
      }
    });
    planned.splice(nearest + 1, 0, { easting, northing, startsLine: false, outside: true });
  }
}

export const BASELINE_HEADER = "point_id,easting,northing,depth,probe,time";
export const PROGRESS_HEADER = "point_id,easting,northing,depth,time";

export function soundingsCsv(soundings: DemoSoundings): string {
  const lines = [soundings.probeFt ? BASELINE_HEADER : PROGRESS_HEADER];
  for (let index = 0; index < soundings.pointIds.length; index++) {
    const cells = [
      soundings.pointIds[index],
      soundings.easting[index].toFixed(2),
      soundings.northing[index].toFixed(2),
      soundings.depthFt[index].toFixed(2),
    ];
    if (soundings.probeFt) cells.push(soundings.probeFt[index].toFixed(2));
    cells.push(soundings.time[index]);
    lines.push(cells.join(","));
  }
  return lines.join("\n") + "\n";
}

const json = (value: unknown) => JSON.stringify(value, null, 2) + "\n";

/** Every demo file by name, as text. */
export function demoFiles(seed: number = DEFAULT_SEED): Map<string, string> {
  const demo = buildDemoSurveys(seed);
  const files = new Map<string, string>();
  for (const { survey, soundings } of demo.surveys) files.set(survey.fileName, soundingsCsv(soundings));
  files.set(
    "work-limit.geojson",
    json({
      type: "Feature",
      properties: { name: `${PROJECT.name}: work limit`, crs: PROJECT.crs, fictional: true },
      geometry: WORK_LIMIT,
    }),
  );
  files.set(
    "zones.geojson",
    json({
      type: "FeatureCollection",
      features: ZONES.map((zone) => ({ type: "Feature", properties: { name: zone.name }, geometry: zone.polygon })),
    }),
  );
  const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");
  files.set(
    "manifest.json",
    json({
      project: PROJECT.name,
      fictional: true,
      seed,
      outsidePointIds: demo.outsidePointIds,
      files: [...files].map(([name, text]) => {
        const survey = demo.surveys.find((entry) => entry.survey.fileName === name);
        return {
          name,
          ...(survey && {
            kind: survey.survey.kind,
            surveyedOn: survey.survey.surveyedOn,
            waterSurfaceElevationFt: survey.survey.waterSurfaceElevationFt,
            soundings: survey.soundings.pointIds.length,
          }),
          bytes: Buffer.byteLength(text),
          sha256: sha256(text),
        };
      }),
    }),
  );
  return files;
}

export const DEFAULT_OUT_DIR = join(dirname(fileURLToPath(import.meta.url)), "demo");

export function writeDemoFiles(outDir: string, seed: number = DEFAULT_SEED): Map<string, string> {
  const files = demoFiles(seed);
  mkdirSync(outDir, { recursive: true });
  for (const [name, text] of files) writeFileSync(join(outDir, name), text);
  return files;
}

function parseArguments(argv: string[]): { outDir: string; seed: number } {
  let outDir = DEFAULT_OUT_DIR;
  let seed = DEFAULT_SEED;
  for (let index = 0; index < argv.length; index++) {
    const argument = argv[index];
    const value = argv[index + 1];
    if (argument === "--out" && value) {
      outDir = resolve(value);
      index++;
    } else if (argument === "--seed" && value && /^\d+$/.test(value)) {
      seed = Number(value);
      index++;
    } else {
      throw new Error(`Unknown or incomplete option "${argument}". Usage: generate.ts [--out DIR] [--seed N]`);
    }
  }
  return { outDir, seed };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  try {
    const { outDir, seed } = parseArguments(process.argv.slice(2));
    const files = writeDemoFiles(outDir, seed);
    for (const [name, text] of files) console.log(`${name}\t${Buffer.byteLength(text)} bytes`);
    console.log(`written to ${outDir} (seed ${seed})`);
  } catch (error) {
    console.error((error as Error).message);
    process.exit(1);
  }
}
