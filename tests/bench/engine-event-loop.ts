/**
 * Event-loop benchmark: how long the server's event loop stalls while the two heaviest engine
 * computations run, on the request thread (ENGINE_THREADS=0) and in the engine pool (the
 * default). (a) the recompute inside a sounding import's commit, for a 1,000,000-sounding
 * baseline (the import benchmark's basin and pattern, held in memory as the commit holds it),
 * which also gives the project's engine state; (b) the engine state as the map computes it
 * after a restart for the same survey (triangulation, rasters, depths, end-area check); (c) the
 * map's remaining-thickness bands from that state (contours turned to lon/lat). Reports
 * the longest stall (perf_hooks.monitorEventLoopDelay, 10 ms resolution) and the wall time.
 * Needs a migrated database (the DB_* environment, as for the app):
 *   DB_PORT=3308 DB_NAME=firmsand_bench NODE_OPTIONS=--expose-gc npx tsx tests/bench/engine-event-loop.ts [--rows N]
 */
import { Survey, getSequelize } from "../../app/lib/db.server";
import { computeState, serverEnginePool } from "../../app/lib/engine/engine-state.server";
import type { ComputationSurvey } from "../../app/lib/engine/engine-surveys";
import { closeAppEnginePool, type EngineWorkerPool } from "../../app/lib/engine/engine-worker.server";
import { loadProjectGeometry } from "../../app/lib/engine/project-geometry.server";
import { computeProjectBands, type BandsInput } from "../../app/lib/engine/project-bands";
import type { ProjectStateInput } from "../../app/lib/engine/project-state";
import { resolveCrsDefinition } from "../../app/lib/geo/epsg.server";
import { remainingThicknessThresholds } from "../../shared/bands";
import { recomputeProjectStatistics } from "../../app/lib/engine/recompute.server";
import { closeSequelize } from "../../db/connection.server";
import { baselinePoints, createBenchProject } from "./import-fixture";
import { collectsBetweenCases, measureEventLoopStall } from "./event-loop-stall";

const rowsIndex = process.argv.indexOf("--rows");
const rows = rowsIndex > 0 ? Number(process.argv[rowsIndex + 1]) : 1_000_000;
if (!Number.isInteger(rows) || rows < 1000) throw new Error(`--rows wants a whole number of at least 1000, not ${process.argv[rowsIndex + 1]}`);

const waterSurface = 30;

function baselineSoundings(id: number): ComputationSurvey {
  const easting = new Float64Array(rows);
  const northing = new Float64Array(rows);
  const elevation = new Float64Array(rows);
  const refusal = new Float64Array(rows);
  let index = 0;
  const written = baselinePoints(rows, (x, y, depth, probe) => {
    easting[index] = x;
    northing[index] = y;
    elevation[index] = waterSurface - depth;
    refusal[index] = waterSurface - probe;
    index++;
  });
  const cut = (values: Float64Array) => values.slice(0, written);
  return { id, kind: "baseline", surveyedOn: "2026-12-01", easting: cut(easting), northing: cut(northing), elevation: cut(elevation), refusalElevation: cut(refusal) };
}

async function createProject() {
  const project = await createBenchProject("Event-loop benchmark basin (synthetic)", "bench-event-loop");
  // The survey row only: its soundings stay in memory, as the commit's do when it recomputes.
  const survey = await Survey.create({
    projectId: project.id, kind: "baseline", surveyedOn: "2026-12-01", timeZone: "UTC", waterSurfaceElevation: waterSurface, fileHasElevations: false,
    datum: "NAVD88", crs: "EPSG:2237", lengthUnit: "us-ft", fileName: "bench.csv", contentSha256: "0".repeat(64), rowCount: rows, soundingCount: rows,
    uploadedById: null, retractedById: null, qa: { warnings: [], columns: {}, surveyOrder: "1a" }, coverage: null,
  });
  return { project, survey };
}


const { project, survey } = await createProject();
const line = (label: string, figures: { seconds: number; maxDelayMs: number; p99DelayMs: number }) =>
  console.log(`  ${label.padEnd(44)} ${figures.seconds.toFixed(2).padStart(6)} s   event loop max delay ${figures.maxDelayMs.toFixed(0).padStart(5)} ms (p99 ${figures.p99DelayMs.toFixed(0)} ms)`);
try {
  const pool = serverEnginePool();
  if (pool === null) throw new Error("ENGINE_THREADS=0: this benchmark compares the pool with the request thread; unset it");
  const geometry = await loadProjectGeometry(project.id);
  const extra = baselineSoundings(survey.id);
  console.log(`engine event-loop benchmark: ${extra.easting.length.toLocaleString("en-US")} soundings, ${pool.size} engine thread(s)${collectsBetweenCases ? "" : " (without --expose-gc: one case's garbage may be collected during the next)"}`);
  const mapInput = (survey: ComputationSurvey): ProjectStateInput => ({
    surveys: [survey], workLimit: geometry.workLimit!, zones: geometry.zones, settings: geometry.settings, lengthUnit: geometry.lengthUnit, waterSurfaceElevation: waterSurface, withFigures: false,
  });
  // The map reads soundings loaded for it alone, which move to the threads.
  const asTheMapDoes = (input: ProjectStateInput, pool: EngineWorkerPool | null) => computeState(input, pool, { transferSurveys: new Set(input.surveys.map((entry) => entry.id)) });
  // A first pool job starts the thread (and, from sources, compiles its modules): not what a running server pays.
  const small = baselineSoundings(survey.id);
  const warmUp = { ...small, easting: small.easting.slice(0, 2000), northing: small.northing.slice(0, 2000), elevation: small.elevation.slice(0, 2000), refusalElevation: small.refusalElevation!.slice(0, 2000) };
  await asTheMapDoes(mapInput(warmUp), pool);
  const places: Array<[string, EngineWorkerPool | null]> = [["on the request thread (ENGINE_THREADS=0)", null], ["in the engine pool", pool]];
  for (const [where, chosen] of places) {
    line(`(a) import commit recompute, ${where}`, await measureEventLoopStall(() => getSequelize().transaction((transaction) => recomputeProjectStatistics(project.id, transaction, { extra, pool: chosen }))));
  }
  for (const [where, chosen] of places) {
    const input = mapInput(baselineSoundings(survey.id));
    line(`(b) map surfaces, ${where}`, await measureEventLoopStall(() => asTheMapDoes(input, chosen)));
  }
  const state = await asTheMapDoes(mapInput(baselineSoundings(survey.id)), pool);
  const bands: BandsInput = {
    raster: state!.surfaces.result.rasters.remainingThickness, thresholds: remainingThicknessThresholds(geometry.lengthUnit),
    crsDefinition: resolveCrsDefinition(geometry.crsCode).definition, minArea: geometry.settings.cellSize ** 2 / 4,
  };
  for (const [where, chosen] of places) {
    line(`(c) map bands, ${where}`, await measureEventLoopStall(async () => (chosen ? chosen.computeProjectBands(bands) : computeProjectBands(bands))));
  }
} finally {
  await Survey.destroy({ where: { projectId: project.id } });
  await project.destroy();
  await closeAppEnginePool();
  await closeSequelize();
}
