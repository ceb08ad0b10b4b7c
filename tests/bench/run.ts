import { availableParallelism, loadavg } from "node:os";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { Worker } from "node:worker_threads";
import { computeVolumesFromSurfaces, triangulateSurveys, type EngineResult, type EngineSettings } from "../../shared/pipeline";
import { areaFromAcres } from "../../shared/units";
import { volumeReport } from "../../shared/volumes/report";
import { workLimitArea } from "../../shared/grid/work-limit";
import { ellipseLimit, syntheticSurveys, type Basin } from "./synthetic";
import { EngineWorkerPool } from "../../app/lib/engine/engine-worker.server";

/**
 * npm run bench — the survey engine at spring-basin and bay scale on seeded synthetic surveys.
 * Prints per-stage times, the total and peak resident memory, and the ratio to the targets set for
 * a lean pipeline on this kind of machine (spring basin ≈ 0.5 s; bay ≈ 9 s under 450 MB).
 * Options: --only basin|bay|degenerate, --single-thread (no worker threads), --threads (threads
 * for small surveys too; by default only from 100,000 soundings a survey), --runs N,
 * --default-malloc (measure with glibc's default mmap threshold).
 */

interface Scenario {
  name: string;
  basin: Basin;
  soundings: number;
  settings: EngineSettings;
  targetSeconds: number;
  targetMemoryMb?: number;
  /** Measured runs after the warm-up; the best time is reported. */
  runs: number;
  degenerate?: { duplicateShare?: number; transects?: number };
}

const rules = { firmShare: 0.95, minCoverage: 0.8 };

// Spring basin: about 2 acres (π · 200 · 140 ft² = 87,965 ft²), 15 ft cells → about 390 cells.
const spring: Basin = { name: "spring basin", centreX: 640_000, centreY: 1_520_000, radiusX: 200, radiusY: 140, waterDepth: 8, muckThickness: 3 };
// Large bay: about 600 acres (π · 1000 · 773 m² = 2.43 km²), 5 m cells → about 97,000 cells.
const bay: Basin = { name: "large bay", centreX: 420_000, centreY: 3_150_000, radiusX: 1000, radiusY: 773, waterDepth: 3, muckThickness: 1 };

const scenarios: Scenario[] = [
  {
    name: "a) spring basin",
    basin: spring,
    soundings: 20_000,
    settings: { cellSize: 15, resolution: 1, maxEdge: 50, tolerance: 0.25, surveyNoise: 0.25, ...rules },
    targetSeconds: 0.5,
    runs: 5,
  },
  {
    name: "c) degenerate: 20 % exact duplicates, soundings on 60 straight transects, empty cells",
    basin: spring,
    soundings: 20_000,
    settings: { cellSize: 15, resolution: 1, maxEdge: 12, tolerance: 0.25, surveyNoise: 0.25, ...rules },
    targetSeconds: 0.5,
    runs: 5,
    degenerate: { duplicateShare: 0.2, transects: 60 },
  },
  {
    name: "b) large bay",
    basin: bay,
    soundings: 1_000_000,
    settings: { cellSize: 5, resolution: 1, maxEdge: 15, tolerance: 0.08, surveyNoise: 0.08, rasterPrecision: "float32", ...rules },
    targetSeconds: 9,
    targetMemoryMb: 450,
    runs: 2,
  },
];

const args = process.argv.slice(2);

// glibc raises its mmap threshold after the first large free, after which freed arrays of up to
// 32 MB stay in the process (RSS) instead of going back to the system. A fixed threshold keeps
// RSS close to live memory; the server should run with the same setting. The benchmark re-runs
// itself with it unless told not to (--default-malloc) or already set.
if (process.platform === "linux" && process.env.MALLOC_MMAP_THRESHOLD_ === undefined && !args.includes("--default-malloc")) {
  const { spawnSync } = await import("node:child_process");
  const child = spawnSync(process.execPath, [...process.execArgv, ...process.argv.slice(1)], {
    stdio: "inherit",
    env: { ...process.env, MALLOC_MMAP_THRESHOLD_: "131072" },
  });
  process.exit(child.status ?? 1);
}
console.log(`malloc: ${process.env.MALLOC_MMAP_THRESHOLD_ ? `MALLOC_MMAP_THRESHOLD_=${process.env.MALLOC_MMAP_THRESHOLD_}` : "glibc defaults"}`);
const only = args.includes("--only") ? args[args.indexOf("--only") + 1] : null;
const singleThread = args.includes("--single-thread");
// As in the CLI: below this many soundings per survey, handing work to threads costs more than it saves.
const threadedFromSoundings = args.includes("--threads") ? 0 : 100_000;
const runs = args.includes("--runs") ? Number(args[args.indexOf("--runs") + 1]) : null;

// Resident memory is per process (worker threads included). The main thread is busy while the
// engine runs, so a timer there would not fire: a tiny sampler thread reads RSS every 2 ms and
// keeps the maximum in shared memory.
// Slot 0: peak RSS; slot 1: the stage number current when it was reached; slot 2: the current stage.
const peakCell = new BigInt64Array(new SharedArrayBuffer(24));
const stageNames: string[] = ["start"];
const sampler = new Worker(
  `const { workerData } = require("node:worker_threads");
   const peak = new BigInt64Array(workerData);
   setInterval(() => { const rss = BigInt(process.memoryUsage.rss()); if (rss > Atomics.load(peak, 0)) { Atomics.store(peak, 0, rss); Atomics.store(peak, 1, Atomics.load(peak, 2)); } }, 2);`,
  { eval: true, workerData: peakCell.buffer, execArgv: [] },
);
sampler.unref();
// A full collection between runs (never during one), as with node --expose-gc, so each measured
// run starts from live data and its peak is its own.
setFlagsFromString("--expose-gc");
const collectGarbage = runInNewContext("gc") as () => void;

let peakRss = 0;
const sampleMemory = () => {
  const rss = Math.max(process.memoryUsage.rss(), Number(Atomics.load(peakCell, 0)));
  if (rss > peakRss) peakRss = rss;
};
const resetMemory = () => {
  Atomics.store(peakCell, 0, 0n);
  Atomics.store(peakCell, 2, 0n);
  peakRss = 0;
};

async function runScenario(scenario: Scenario, pool: EngineWorkerPool | null, runs: number) {
  const limit = ellipseLimit(scenario.basin);
  const once = async () => {
    // Fresh surveys each run (not timed): the threaded path hands their buffers to the workers.
    const surveys = syntheticSurveys(scenario.basin, scenario.soundings, 20310402, scenario.degenerate);
    const engineSurveys = { baseline: surveys.before, progress: [surveys.after], firm: surveys.firm };
    const stageTimes = new Map<string, number>();
    let last = performance.now();
    const onProgress = (stage: string) => {
      // The stage that starts now is the one after `stage` (reported at its end).
      stageNames.push(`after ${stage}`);
      Atomics.store(peakCell, 2, BigInt(stageNames.length - 1));
      const now = performance.now();
      stageTimes.set(stage, (stageTimes.get(stage) ?? 0) + now - last);
      last = now;
      sampleMemory();
    };
    last = performance.now();
    const start = last;
    const cpuStart = process.cpuUsage();
    let result: EngineResult;
    if (pool && scenario.soundings >= threadedFromSoundings) {
      result = await pool.computeSurveyVolumes(engineSurveys, limit, scenario.settings, onProgress, { transferInputs: true });
    } else {
      const surfaces = triangulateSurveys(engineSurveys, scenario.settings.maxEdge, onProgress);
      result = computeVolumesFromSurfaces(surfaces, limit, scenario.settings, onProgress);
    }
    const report = volumeReport(result, scenario.basin === bay ? "m" : "us-ft");
    onProgress("report");
    const seconds = (performance.now() - start) / 1000;
    const cpu = process.cpuUsage(cpuStart);
    const cpuSeconds = (cpu.user + cpu.system) / 1e6;
    sampleMemory();
    // Keep only what is printed, so the rasters of this run do not sit in memory during the next.
    const unit = scenario.basin === bay ? "m" : "us-ft";
    const acres = workLimitArea(limit) / areaFromAcres(1, unit);
    const header = `${scenario.name}: ${scenario.soundings.toLocaleString("en-US")} soundings × 2 surveys, ${acres.toFixed(1)} acres, ` +
      `${result.rasterGrid.cols}×${result.rasterGrid.rows} raster at ${scenario.settings.resolution} ${unit}, ${report.totals.cells.toLocaleString("en-US")} cells of ${scenario.settings.cellSize} ${unit}`;
    const outcome = `duplicates merged ${result.surfaces.duplicatesMerged}, long triangles dropped ${result.surfaces.longTrianglesDropped}; ` +
      `removed ${report.totals.removedVolume.toFixed(0)} ${report.units.volume}, remaining ${report.totals.remainingVolume.toFixed(0)} ${report.units.volume}, ` +
      `${report.totals.cellsAtFirmSand} cells at firm sand, ${result.totals.cellsNoData} without enough data`;
    return { seconds, cpuSeconds, stageTimes, header, outcome };
  };
  await once(); // warm-up: JIT, worker start-up, page faults
  let best: Awaited<ReturnType<typeof once>> | null = null;
  const peaks: number[] = [];
  const peakStages: string[] = [];
  for (let run = 0; run < runs; run++) {
    collectGarbage();
    await pool?.collectGarbage();
    resetMemory();
    const measured = await once();
    if (best === null || measured.seconds < best.seconds) best = measured;
    peaks.push(peakRss);
    peakStages.push(stageNames[Number(Atomics.load(peakCell, 1))] ?? "?");
  }
  const { seconds, cpuSeconds, stageTimes, header, outcome } = best!;
  console.log(`\n${header}`);
  for (const [stage, milliseconds] of stageTimes) console.log(`  ${stage.padEnd(32)} ${milliseconds.toFixed(1).padStart(9)} ms`);
  console.log(`  ${"total".padEnd(32)} ${(seconds * 1000).toFixed(1).padStart(9)} ms   target ${scenario.targetSeconds} s → ratio ${(seconds / scenario.targetSeconds).toFixed(2)}`);
  console.log(`  ${"CPU time, all threads".padEnd(32)} ${(cpuSeconds * 1000).toFixed(1).padStart(9)} ms   (machine load average ${loadavg()[0].toFixed(1)} on ${availableParallelism()} cores)`);
  console.log(`  ${outcome}`);
  const peakMb = Math.max(...peaks) / 2 ** 20;
  const target = scenario.targetMemoryMb;
  console.log(`  peak RSS over the measured run${runs > 1 ? "s" : ""} (whole process incl. threads, 2 ms samples) ${peakMb.toFixed(0)} MB` +
    (target ? `   target < ${target} MB → ratio ${(peakMb / target).toFixed(2)}` : "") +
    `   (reached ${peakStages[peaks.indexOf(Math.max(...peaks))]})`);
  const threaded = pool !== null && scenario.soundings >= threadedFromSoundings;
  console.log(`  best of ${runs} run${runs > 1 ? "s" : ""} after one warm-up; ${threaded ? "2 worker threads" : "single thread"}`);
}

async function main() {
  const pool = singleThread ? null : new EngineWorkerPool(2);
  try {
    for (const scenario of scenarios) {
      if (only && !scenario.name.includes(only)) continue;
      await runScenario(scenario, pool, runs ?? scenario.runs);
    }
  } finally {
    await sampler.terminate();
    await pool?.close();
  }
}

await main();
