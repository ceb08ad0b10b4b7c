import { readFileSync, statSync } from "node:fs";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { z } from "zod";
import type { ComputationSurvey } from "../lib/engine/engine-surveys";
import { firmPoints } from "../lib/engine/survey-work";
import { EngineWorkerPool, baselineWork, progressWork, surveyWorkSettings, volumesFromSurveyWork } from "../lib/engine/engine-worker.server";
import type { SurveyWorkDone } from "../lib/engine/survey-work";
import { lengthUnitOfCrs, resolveCrsDefinition } from "../lib/geo/epsg.server";
import { createCrs, type Crs } from "../../shared/crs";
import type { ProjectedMultiPolygon, Ring } from "../../shared/grid/work-limit";
import { computeSurveyVolumes, layGridLines, type EngineResult, type EngineSettings, type SurveyPoints } from "../../shared/pipeline";
import { soundingElevations } from "../../shared/soundings/elevations";
import { parseSoundingsCsvBytes, type ParsedSoundings } from "../../shared/soundings/parse-csv";
import { selectSurveysInForce } from "../../shared/surveys-in-force";
import { defaultsFor, lengthUnitSchema, type LengthUnit } from "../../shared/units";
import { writeVolumeReportJson } from "../../shared/volumes/report";

/**
 * Firmsand on the command line, for survey staff and for checking results from outside the app.
 *
 *   npm run --silent firmsand -- volumes --crs EPSG:2237 --units us-ft --before pre.csv --after post.csv
 *
 * Prints the volume report as JSON on stdout. Any problem goes to stderr, naming the file, row and
 * column at fault, and the exit code is non-zero (1 bad input, 2 bad options).
 */

const usage = `usage: firmsand volumes --crs CODE|PROJ4 --units us-ft|ft|m --before FILE --after FILE [options]
  --firm FILE          firm-sand soundings (its probe column, else its depth); default: the before file's probe column
  --before-wse N       water-surface elevation of each survey (default 0)
  --after-wse N
  --firm-wse N
  --limit FILE         work limit, GeoJSON Polygon or MultiPolygon in lon/lat (default: the before survey's hull)
  --origin E,N         grid origin in the CRS (default: the limit's south-west corner)
  --cell-size N        default 20 ft / 5 m
  --resolution N       raster spacing, default 1 ft / 0.25 m
  --max-edge N         longest triangle edge kept, default 50 ft / 15 m
  --tolerance N        remaining thickness counted as firm sand, default 0.25 ft / 0.08 m
  --firm-share F       share of a cell within tolerance for "at-firm-sand", default 0.95
  --min-coverage F     share of a cell that must be surveyed, default 0.8
  --survey-noise N     mean removed thickness still counted as untouched, default the tolerance
  --rotation DEG       grid rotation, counter-clockwise from east, default 0
  --threads 0|2        engine threads: 2 triangulates the surveys side by side, 0 on the main thread;
                       default 2 when the sounding files hold 6 MB or more, else 0 (same figures either way)`;

class InputError extends Error {
  constructor(message: string, readonly exitCode = 1) {
    super(message);
  }
}

const number = (name: string) =>
  z
    .string()
    .trim()
    .refine((text) => text !== "" && Number.isFinite(Number(text)), { message: `${name} must be a number` })
    .transform(Number);
const positive = (name: string) => number(name).refine((value) => value > 0, { message: `${name} must be greater than 0` });
const share = (name: string) => number(name).refine((value) => value >= 0 && value <= 1, { message: `${name} must be between 0 and 1` });

const volumesOptionsSchema = z.object({
  crs: z.string({ error: "--crs is required (an EPSG code such as EPSG:2237, or a proj4 string)" }).min(1),
  units: z.string({ error: "--units is required (us-ft, ft or m)" }).pipe(lengthUnitSchema),
  before: z.string({ error: "--before is required (the baseline sounding CSV)" }).min(1),
  after: z.string({ error: "--after is required (the progress or closeout sounding CSV)" }).min(1),
  firm: z.string().min(1).optional(),
  "before-wse": number("--before-wse").default(0),
  "after-wse": number("--after-wse").default(0),
  "firm-wse": number("--firm-wse").default(0),
  limit: z.string().min(1).optional(),
  origin: z
    .string()
    .regex(/^\s*[+-]?[\d.eE+-]+\s*,\s*[+-]?[\d.eE+-]+\s*$/, { message: "--origin must be E,N (two numbers separated by a comma)" })
    .transform((text) => text.split(",").map(Number) as [number, number])
    .refine((pair) => pair.every(Number.isFinite), { message: "--origin must be E,N (two numbers separated by a comma)" })
    .optional(),
  "cell-size": positive("--cell-size").optional(),
  resolution: positive("--resolution").optional(),
  "max-edge": positive("--max-edge").optional(),
  tolerance: number("--tolerance").refine((value) => value >= 0, { message: "--tolerance must be 0 or more" }).optional(),
  "firm-share": share("--firm-share").default(0.95),
  "min-coverage": share("--min-coverage").default(0.8),
  "survey-noise": number("--survey-noise").refine((value) => value >= 0, { message: "--survey-noise must be 0 or more" }).optional(),
  rotation: number("--rotation").default(0),
  threads: z.enum(["0", "2"], { error: "--threads must be 0 or 2" }).transform(Number).optional(),
});

type VolumesOptions = z.infer<typeof volumesOptionsSchema>;

function readArguments(argv: string[]): Record<string, string> {
  const options: Record<string, string> = {};
  for (let index = 0; index < argv.length; index++) {
    const argument = argv[index];
    if (!argument.startsWith("--")) throw new InputError(`unexpected argument "${argument}"\n${usage}`, 2);
    const equals = argument.indexOf("=");
    const name = equals > 0 ? argument.slice(2, equals) : argument.slice(2);
    if (!(name in volumesOptionsSchema.shape)) throw new InputError(`unknown option --${name}\n${usage}`, 2);
    const value = equals > 0 ? argument.slice(equals + 1) : argv[++index];
    if (value === undefined) throw new InputError(`--${name} needs a value`, 2);
    options[name] = value;
  }
  return options;
}

function readText(file: string, what: string): string {
  return readBytes(file, what).toString("utf8");
}

function readBytes(file: string, what: string): Buffer {
  try {
    return readFileSync(file);
  } catch (error) {
    throw new InputError(`${file}: cannot read the ${what} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
}

function readSoundings(file: string): ParsedSoundings {
  // Read from the bytes: no string of the whole file, none per cell (parse-csv.ts).
  const parsed = parseSoundingsCsvBytes(readBytes(file, "sounding file"));
  if (parsed.errors.length > 0) {
    const lines = parsed.errors.map(
      (error) => `${file}: row ${error.row}, column "${error.column}": ${error.message}${error.value === "" ? "" : ` (found "${error.value}")`}`,
    );
    const more = parsed.errors.length >= 1000 ? `\n${file}: further errors not listed` : "";
    throw new InputError(lines.join("\n") + more);
  }
  if (parsed.easting.length < 3) throw new InputError(`${file}: has ${parsed.easting.length} soundings; at least 3 are needed for a surface`);
  return parsed;
}

const positionSchema = z.tuple([z.number(), z.number()]).rest(z.number());
const ringSchema = z.array(positionSchema).min(4, { message: "a ring needs at least 4 positions (closed)" });
const polygonSchema = z.object({ type: z.literal("Polygon"), coordinates: z.array(ringSchema).min(1) });
const multiPolygonSchema = z.object({ type: z.literal("MultiPolygon"), coordinates: z.array(z.array(ringSchema).min(1)).min(1) });
const geometrySchema = z.discriminatedUnion("type", [polygonSchema, multiPolygonSchema]);
const featureSchema = z.object({ type: z.literal("Feature"), geometry: geometrySchema });
const limitFileSchema = z.union([
  geometrySchema,
  featureSchema,
  z.object({ type: z.literal("FeatureCollection"), features: z.array(featureSchema).min(1) }),
]);

/** GeoJSON (RFC 7946: lon/lat, WGS 84) → the work limit in project coordinates. */
function readWorkLimit(file: string, crs: Crs): ProjectedMultiPolygon {
  let json: unknown;
  try {
    json = JSON.parse(readText(file, "work limit"));
  } catch (error) {
    if (error instanceof InputError) throw error;
    throw new InputError(`${file}: is not valid JSON (${(error as Error).message})`);
  }
  const parsed = limitFileSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new InputError(`${file}: not a GeoJSON Polygon or MultiPolygon (${issue.path.join(".") || "top level"}: ${issue.message})`);
  }
  const geometries =
    parsed.data.type === "FeatureCollection" ? parsed.data.features.map((feature) => feature.geometry) : parsed.data.type === "Feature" ? [parsed.data.geometry] : [parsed.data];
  const polygons: number[][][][] = geometries.flatMap((geometry) => (geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates));
  return polygons.map((polygon) =>
    polygon.map((ring): Ring =>
      ring.map(([lon, lat]) => {
        if (Math.abs(lon) > 180 || Math.abs(lat) > 90) {
          throw new InputError(`${file}: position [${lon}, ${lat}] is not lon/lat; GeoJSON work limits are in degrees (RFC 7946)`);
        }
        const [easting, northing] = crs.fromLonLat(lon, lat);
        if (!Number.isFinite(easting) || !Number.isFinite(northing)) throw new InputError(`${file}: position [${lon}, ${lat}] cannot be projected into the project CRS`);
        return [easting, northing];
      }),
    ),
  );
}

function surveyPoints(parsed: ParsedSoundings, elevation: Float64Array): SurveyPoints {
  return { easting: parsed.easting, northing: parsed.northing, elevation };
}

/** From this many bytes of sounding files in all (about 200,000 soundings), the surveys are triangulated in two worker threads. */
const threadedFromBytes = 6_000_000;

async function runVolumes(argv: string[]): Promise<{ result: EngineResult; unit: LengthUnit }> {
  const parsedOptions = volumesOptionsSchema.safeParse(readArguments(argv));
  if (!parsedOptions.success) {
    throw new InputError(parsedOptions.error.issues.map((issue) => issue.message).join("\n") + `\n${usage}`, 2);
  }
  const options: VolumesOptions = parsedOptions.data;
  const unit: LengthUnit = options.units;

  let crs: Crs;
  try {
    const resolved = resolveCrsDefinition(options.crs);
    const crsUnit = lengthUnitOfCrs(resolved);
    crs = createCrs(resolved.definition);
    if (crs.isGeographic) throw new InputError(`--crs ${options.crs} is a lon/lat system; volumes need a projected CRS (state plane, UTM, ...)`, 2);
    if (crsUnit !== null && crsUnit !== unit) {
      throw new InputError(`--units ${unit} does not match ${resolved.name}, whose coordinates are in ${crsUnit}; easting, northing and depth must share one unit`, 2);
    }
    for (const warning of resolved.warnings) process.stderr.write(`note: ${warning}\n`);
  } catch (error) {
    if (error instanceof InputError) throw error;
    throw new InputError(`--crs: ${(error as Error).message}`, 2);
  }

  const defaults = defaultsFor(unit);
  const workLimit = options.limit === undefined ? null : readWorkLimit(options.limit, crs);
  const tolerance = options.tolerance ?? defaults.tolerance;
  const settings: EngineSettings = {
    cellSize: options["cell-size"] ?? defaults.cellSize,
    resolution: options.resolution ?? defaults.resolution,
    maxEdge: options["max-edge"] ?? defaults.maxEdge,
    tolerance,
    firmShare: options["firm-share"],
    minCoverage: options["min-coverage"],
    // EM 1110-2-1003 table 3-1 puts dredging-support depth accuracy at the same ±0.25 ft as the
    // default tolerance, so a change smaller than the tolerance is not yet evidence of dredging.
    surveyNoise: options["survey-noise"] ?? tolerance,
    originX: options.origin?.[0],
    originY: options.origin?.[1],
    rotationDegrees: options.rotation,
  };
  // Large surveys go to two engine threads, started before the files are read (a thread takes a
  // moment to load); with a work limit each survey is handed over as soon as its file is read, so
  // the baseline is triangulated while the next file is parsed.
  const threaded = options.threads === undefined ? fileBytes(options.before) + fileBytes(options.after) >= threadedFromBytes : options.threads > 0;
  const pool = threaded ? new EngineWorkerPool(2) : null;
  // Let the threads collect their garbage between the steps of a large survey (their input columns
  // once copied, their triangulation once sampled: see engine-worker.thread.ts); the request is
  // queued ahead of the jobs, so nothing waits for it.
  pool?.collectGarbage().catch(() => {});
  try {
    return { result: await computeVolumes(options, workLimit, settings, pool), unit };
  } finally {
    await pool?.close();
  }
}

let fullCollection: (() => void) | null = null;

/** A full garbage collection of this thread (as the engine threads do between large steps). */
function collectGarbage() {
  if (fullCollection === null) {
    setFlagsFromString("--expose-gc");
    fullCollection = runInNewContext("gc") as () => void;
  }
  fullCollection();
}

function fileBytes(file: string): number {
  try {
    return statSync(file).size;
  } catch {
    return 0; // reading it will say what is wrong
  }
}

async function computeVolumes(options: VolumesOptions, workLimit: ProjectedMultiPolygon | null, settings: EngineSettings, pool: EngineWorkerPool | null): Promise<EngineResult> {
  // The two files are the surveys in force, as the app would choose them: the before file the
  // baseline, the after file the one progress survey on it (the files carry no dates).
  const surveyOf = (id: number, kind: ComputationSurvey["kind"], parsed: ParsedSoundings, waterSurface: number): ComputationSurvey => {
    const { elevation, refusalElevation } = soundingElevations(parsed, waterSurface);
    return { id, kind, surveyedOn: "", ...surveyPoints(parsed, elevation), refusalElevation };
  };
  const baseline = surveyOf(1, "baseline", readSoundings(options.before), options["before-wse"]);
  let firm: SurveyPoints | null = null;
  let firmProblem: string | null = null; // told once the after file is read, as its own problems come first
  if (options.firm === undefined) {
    const refusal = baseline.refusalElevation;
    if (refusal === null || refusal.every(Number.isNaN)) {
      firmProblem = `${options.before}: has no probe readings (column "probe" or "probe_depth"); give the firm-sand surface with --firm FILE`;
    } else firm = firmPoints(baseline);
  }
  // With a limit, the grids are known now: the baseline goes to its thread before the next file is read.
  const lines = pool && workLimit ? layGridLines(workLimit, settings) : null;
  const workSettings = lines ? surveyWorkSettings(lines, settings) : null;
  const pending: Array<Promise<SurveyWorkDone>> = [];
  // The threads take the arrays (no copy): this thread reads the soundings no more.
  const handOver = { transferInputs: true };
  if (pool && workSettings && firm) {
    pending.push(...baselineWork(baseline, firm).map((item) => pool.surveyWork(item, workSettings, handOver)));
    collectGarbage(); // the first file's bytes and columns, before the second file is read
  }
  // A thread's failure is reported once everything is read (a bad file is the more useful message).
  for (const job of pending) job.catch(() => {});

  const later = surveyOf(2, "progress", readSoundings(options.after), options["after-wse"]);
  if (firmProblem !== null) throw new InputError(firmProblem);
  const inForce = selectSurveysInForce([baseline, later])!;
  if (options.firm !== undefined) {
    const firmSoundings = readSoundings(options.firm);
    const { elevation, refusalElevation } = soundingElevations(firmSoundings, options["firm-wse"]);
    firm = surveyPoints(firmSoundings, refusalElevation ?? elevation);
  }
  const surveys = { baseline: inForce.baseline, progress: inForce.later, firm: firm! };
  if (pool && workLimit && lines && workSettings) {
    if (pending.length === 0) pending.push(...baselineWork(surveys.baseline, surveys.firm).map((item) => pool.surveyWork(item, workSettings, handOver)));
    pending.push(...surveys.progress.map((survey) => pool.surveyWork(progressWork(survey), workSettings, handOver)));
    // The files' bytes and the parse's leftovers are garbage now: freed before the rasters come back.
    collectGarbage();
    // The threads are done once their rasters are back: ended there, their memory is free for the rest.
    return volumesFromSurveyWork(workLimit, settings, lines, pending, undefined, () => pool.close());
  }
  if (pool) return pool.computeSurveyVolumes(surveys, workLimit, settings, undefined, { transferInputs: true });
  return computeSurveyVolumes(surveys, workLimit, settings);
}

async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  try {
    if (command === "volumes") {
      const { result, unit } = await runVolumes(rest);
      // The report as JSON (JSON.stringify of volumeReport, written piece by piece without an object per cell).
      writeVolumeReportJson(result, unit, (part) => process.stdout.write(part));
      process.stdout.write("\n");
      return 0;
    }
    process.stderr.write(command === undefined || command === "--help" ? `${usage}\n` : `unknown command "${command}"\n${usage}\n`);
    return 2;
  } catch (error) {
    if (error instanceof InputError) {
      process.stderr.write(`${error.message}\n`);
      return error.exitCode;
    }
    process.stderr.write(`firmsand: ${(error as Error).message}\n`);
    return 1;
  }
}

// Not a top-level await: the built command line is a CommonJS bundle (app/cli/build.mjs).
void main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
