/**
 * Pay-period benchmark: how long the server's event loop stalls while a pay period's figures are
 * computed from a project's engine state (the first read of a period after a recompute), on the
 * request thread and in the engine pool. A seeded synthetic project (the engine benchmark's large
 * bay, or its spring basin with --basin), a baseline and one progress survey, two zones; the state
 * is computed once in the pool, then the period from the baseline to the progress survey is
 * computed `--runs` times each way. Reports the longest stall (perf_hooks.monitorEventLoopDelay,
 * 10 ms resolution), the wall time, and whether the two ways gave the same figures (they must).
 * No database:
 *   NODE_OPTIONS=--expose-gc npx tsx tests/bench/period-event-loop.ts [--basin bay|spring] [--soundings N] [--runs N]
 */
import { isDeepStrictEqual } from "node:util";
import { EngineWorkerPool } from "../../app/lib/engine/engine-worker.server";
import { computePeriodFigures, periodFiguresInput, type PeriodFiguresInput } from "../../app/lib/engine/period-figures";
import type { ProjectStateInput } from "../../app/lib/engine/project-state";
import type { EngineSettings } from "../../shared/pipeline";
import { tvuCoefficients } from "../../shared/qa/tvu";
import { ellipseLimit, syntheticSurveys, type Basin } from "./synthetic";
import { collectsBetweenCases, measureEventLoopStall } from "./event-loop-stall";

const option = (name: string, fallback: string) => (process.argv.includes(name) ? process.argv[process.argv.indexOf(name) + 1] : fallback);
const which = option("--basin", "bay");
const runs = Number(option("--runs", "3"));

const rules = { firmShare: 0.95, minCoverage: 0.8 };
// The engine benchmark's two basins (tests/bench/run.ts): invented, no real site.
const basins: Record<string, { basin: Basin; soundings: number; settings: EngineSettings; unit: "m" | "us-ft" }> = {
  bay: {
    basin: { name: "large bay", centreX: 420_000, centreY: 3_150_000, radiusX: 1000, radiusY: 773, waterDepth: 3, muckThickness: 1 },
    soundings: 300_000,
    settings: { cellSize: 5, resolution: 1, maxEdge: 15, tolerance: 0.08, surveyNoise: 0.08, rasterPrecision: "float32", ...rules },
    unit: "m",
  },
  spring: {
    basin: { name: "spring basin", centreX: 640_000, centreY: 1_520_000, radiusX: 200, radiusY: 140, waterDepth: 8, muckThickness: 3 },
    soundings: 20_000,
    settings: { cellSize: 15, resolution: 1, maxEdge: 50, tolerance: 0.25, surveyNoise: 0.25, ...rules },
    unit: "us-ft",
  },
};
const scenario = basins[which];
if (!scenario) throw new Error(`--basin wants bay or spring, not ${which}`);
const soundings = Number(option("--soundings", String(scenario.soundings)));


const { basin, settings, unit } = scenario;
const surveys = syntheticSurveys(basin, soundings, 20310402);
// Two zones: the basin's western and eastern halves (the dredged half and the rest).
const half = (sign: -1 | 1) => [[[
  [basin.centreX, basin.centreY - 2 * basin.radiusY], [basin.centreX + sign * 2 * basin.radiusX, basin.centreY - 2 * basin.radiusY],
  [basin.centreX + sign * 2 * basin.radiusX, basin.centreY + 2 * basin.radiusY], [basin.centreX, basin.centreY + 2 * basin.radiusY], [basin.centreX, basin.centreY - 2 * basin.radiusY],
]]] as Array<Array<Array<[number, number]>>>;
const zones = [{ id: 1, name: "West", polygon: half(-1) }, { id: 2, name: "East", polygon: half(1) }];
const input: ProjectStateInput = {
  surveys: [
    { id: 1, kind: "baseline", surveyedOn: "2026-09-01", ...surveys.before, refusalElevation: surveys.firm.elevation },
    { id: 2, kind: "progress", surveyedOn: "2026-10-15", ...surveys.after, refusalElevation: null },
  ],
  workLimit: ellipseLimit(basin), zones, settings, lengthUnit: unit, waterSurfaceElevation: 0, withFigures: false,
};
const pool = new EngineWorkerPool(1);
try {
  const state = await pool.computeProjectState(input, { transferSurveys: new Set([1, 2]) });
  if (!state) throw new Error("no baseline in force");
  const cells = state.surfaces.result.cellGrid.cols * state.surfaces.result.cellGrid.rows;
  const nodes = state.surfaces.result.rasterGrid.cols * state.surfaces.result.rasterGrid.rows;
  // IHO S-44 order 1a in the project's unit (tvuCoefficients), depths from the water surface.
  const survey = { ...tvuCoefficients("1a", unit), waterSurfaceElevation: 0, fallbackDepth: null, bias: 0 };
  const period: PeriodFiguresInput = periodFiguresInput(state, 0, 1, { zones, settings, overDredgeAllowance: 0, lengthUnit: unit, uncertainty: [survey, survey] });
  console.log(`pay-period event-loop benchmark: ${basin.name}, ${soundings.toLocaleString("en-US")} soundings a survey, ${nodes.toLocaleString("en-US")} raster nodes, ${cells.toLocaleString("en-US")} grid cells, ${pool.size} engine thread(s)${collectsBetweenCases ? "" : " (without --expose-gc)"}`);
  await pool.computePeriodFigures(period); // a first job loads the thread's module: not what a running server pays
  const onThread = computePeriodFigures(period);
  const inPool = await pool.computePeriodFigures(period);
  console.log(`  same figures both ways (every cell, zone and the project): ${isDeepStrictEqual(onThread, inPool) ? "yes" : "NO"}`);
  const line = (label: string, figures: { seconds: number; maxDelayMs: number }) =>
    console.log(`  ${label.padEnd(36)} ${figures.seconds.toFixed(2).padStart(6)} s   event loop max delay ${figures.maxDelayMs.toFixed(0).padStart(5)} ms`);
  for (let run = 1; run <= runs; run++) {
    line(`period on the request thread, run ${run}`, await measureEventLoopStall(async () => computePeriodFigures(period)));
    line(`period in the engine pool, run ${run}`, await measureEventLoopStall(() => pool.computePeriodFigures(period)));
  }
} finally {
  await pool.close();
}
