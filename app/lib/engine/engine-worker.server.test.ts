import { afterAll, describe, expect, it } from "vitest";
import { computeSurveyVolumes } from "../../../shared/pipeline";
import { ellipseLimit, syntheticSurveys } from "../../../tests/bench/synthetic";
import { EngineWorkerPool, workerEntry } from "./engine-worker.server";
import type { ComputationSurvey } from "./engine-surveys";
import { computeProjectBands } from "./project-bands";
import { computeProjectState, type ProjectStateInput } from "./project-state";

const FLORIDA_WEST = "+proj=tmerc +lat_0=24.3333333333333 +lon_0=-82 +k=0.999941177 +x_0=200000.0001016 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=us-ft +no_defs";

const basin = { name: "test pond", centreX: 512_000, centreY: 1_234_000, radiusX: 120, radiusY: 80, waterDepth: 6, muckThickness: 2 };
const settings = { cellSize: 20, resolution: 1, maxEdge: 30, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };

/** A baseline with its probe, a progress pass and a closeout over part of it (synthetic, seeded). */
function projectSurveys(): ComputationSurvey[] {
  const first = syntheticSurveys(basin, 5000, 7, { duplicateShare: 0.05 });
  const second = syntheticSurveys(basin, 3000, 11);
  const west = [...second.after.easting.keys()].filter((index) => second.after.easting[index] < basin.centreX);
  const pick = (values: Float64Array) => Float64Array.from(west, (index) => values[index]);
  return [
    { id: 1, kind: "baseline", surveyedOn: "2026-05-01", ...first.before, refusalElevation: first.firm.elevation },
    { id: 2, kind: "progress", surveyedOn: "2026-06-01", ...first.after, refusalElevation: null },
    { id: 3, kind: "closeout", surveyedOn: "2026-07-01", easting: pick(second.after.easting), northing: pick(second.after.northing), elevation: pick(second.after.elevation), refusalElevation: null },
  ];
}

function stateInput(surveys = projectSurveys()): ProjectStateInput {
  const limit = ellipseLimit(basin);
  const [[ring]] = limit;
  const eastHalf = [[ring.filter(([x]) => x >= basin.centreX).concat([[basin.centreX, basin.centreY + basin.radiusY]])]];
  eastHalf[0][0].push(eastHalf[0][0][0]);
  return {
    surveys, workLimit: limit, zones: [{ id: 4, name: "East", polygon: eastHalf as typeof limit }], settings: { ...settings, rasterPrecision: "float32" }, lengthUnit: "us-ft",
    waterSurfaceElevation: 1.5, withFigures: true,
  };
}

describe("EngineWorkerPool", () => {
  const pool = new EngineWorkerPool(2);
  afterAll(() => pool.close());

  it("gives the single-thread result, with and without a work limit", async () => {
    const surveys = syntheticSurveys(basin, 5000, 7, { duplicateShare: 0.05 });
    const input = { baseline: surveys.before, progress: [surveys.after], firm: surveys.firm };
    for (const limit of [ellipseLimit(basin), null]) {
      const alone = computeSurveyVolumes(input, limit, settings);
      const threaded = await pool.computeSurveyVolumes(input, limit, settings);
      // invariant: moving the same arithmetic into threads changes nothing.
      expect(threaded.totals).toEqual(alone.totals);
      expect(Array.from(threaded.cells.remainingVolumeCubicLength)).toEqual(Array.from(alone.cells.remainingVolumeCubicLength));
      expect(threaded.surfaces).toEqual(alone.surfaces);
    }
    // The caller's arrays are copied, not taken, unless it asks for transfer.
    expect(surveys.before.easting.length).toBe(5000);
  });

  it("computes a project's state in its threads exactly as on this one", async () => {
    const alone = computeProjectState(stateInput())!;
    const stages: string[] = [];
    const threaded = await pool.computeProjectState(stateInput(), { onProgress: (stage) => stages.push(stage) });
    // invariant: the same pure functions on structured-cloned copies of the input; every figure,
    // snapshot array, status, raster and count is bit for bit the same.
    expect(threaded).toEqual(alone);
    expect(alone.figures!.snapshots).toHaveLength(3);
    expect(alone.figures!.totals.cellsConfirmed).toBeGreaterThan(0);
    expect(alone.figures!.snapshots[2].zones[0].totals.cells).toBeGreaterThan(0);
    expect(threaded!.figures!.snapshots[2].remainingVolumes).toBeInstanceOf(Float32Array);
    expect(alone.surfaces.depth).not.toBeNull();
    expect(alone.surfaces.soundingsPerCell.reduce((sum, count) => sum + count, 0)).toBeGreaterThan(0); // counted closed-form in project-state.test.ts
    // The threads' progress reaches the caller.
    expect(stages).toContain("triangulate");
  });

  it("triangulates the surveys in parallel, one job per survey over every thread", async () => {
    const running = (target: EngineWorkerPool) => (target as unknown as { running: Map<number, unknown> }).running.size;
    const job = pool.computeProjectState(stateInput()); // three surveys: three jobs, then the state's
    expect(running(pool)).toBe(2); // both threads busy at once
    await job;
    const single = new EngineWorkerPool(1);
    try {
      const alone = single.computeProjectState(stateInput());
      expect(running(single)).toBe(1); // one thread: the surveys one after another, as before
      expect((await alone)!.figures).toEqual(computeProjectState(stateInput())!.figures);
    } finally {
      await single.close();
    }
  });

  it("draws a surface's contour bands in a thread exactly as on this one", async () => {
    const { surfaces } = computeProjectState(stateInput())!;
    // EPSG:2237 (NAD83 / Florida West, ftUS) as proj4 gives it: the basin's coordinates are in its range.
    const input = { raster: surfaces.result.rasters.remainingThickness, thresholds: [-Infinity, 0.25, 1, 2, Infinity], crsDefinition: FLORIDA_WEST, minArea: 100 };
    const alone = computeProjectBands(input);
    expect(await pool.computeProjectBands(input)).toEqual(alone);
    expect(alone.features.length).toBeGreaterThan(1); // the synthetic basin is dredged in its west: more than one band
  });

  it("takes the arrays of the surveys the caller hands over and copies the others", async () => {
    const surveys = projectSurveys();
    await pool.computeProjectState(stateInput(surveys), { transferSurveys: new Set([1]) });
    expect(surveys[0].easting.length).toBe(0); // moved to the thread: detached here
    expect(surveys[0].refusalElevation!.length).toBe(0);
    expect(surveys[1].easting.length).toBe(5000);
  });

  it("copies a survey column that is a view into a larger buffer instead of moving the whole buffer", async () => {
    const surveys = projectSurveys();
    const backing = new Float64Array(surveys[1].easting.length * 2);
    backing.set(surveys[1].easting, 10);
    surveys[1].easting = backing.subarray(10, 10 + surveys[1].elevation.length);
    const alone = computeProjectState(stateInput(projectSurveys()))!;
    const threaded = await pool.computeProjectState(stateInput(surveys), { transferSurveys: new Set([2]) });
    expect(threaded!.figures!.totals).toEqual(alone.figures!.totals);
    expect(backing.length).toBe(10_000); // the larger buffer stays with the caller
  });

  it("rejects with the engine's own message when a job fails, and keeps working", async () => {
    const surveys = projectSurveys();
    surveys[0].refusalElevation = null;
    await expect(pool.computeProjectState(stateInput(surveys))).rejects.toThrow(/no probe column/);
    expect(await pool.computeProjectState(stateInput(projectSurveys().slice(1)))).toBeNull(); // no baseline: no state
  });

  it("replaces a thread that dies, failing only the job it had", async () => {
    const small = new EngineWorkerPool(1);
    try {
      const tiny = syntheticSurveys(basin, 100, 3);
      await small.computeSurveyVolumes({ baseline: tiny.before, firm: tiny.firm, progress: [] }, null, settings); // the thread is up
      const worker = (small as unknown as { workers: Array<{ terminate(): Promise<number> }> }).workers[0];
      const job = small.computeProjectState(stateInput());
      await worker.terminate();
      await expect(job).rejects.toThrow(/engine thread stopped/);
      const state = await small.computeProjectState(stateInput());
      expect(state!.figures!.totals).toEqual(computeProjectState(stateInput())!.figures!.totals);
    } finally {
      await small.close();
    }
  });

  it("fails every job, with a reason, when its threads cannot start at all", async () => {
    const broken = new EngineWorkerPool(1);
    try {
      // A thread ended before its entry has loaded stands for an entry that throws on load.
      await (broken as unknown as { workers: Array<{ terminate(): Promise<number> }> }).workers[0].terminate();
      await expect(broken.computeProjectState(stateInput())).rejects.toThrow(/engine threads could not start/);
    } finally {
      await broken.close();
    }
  });
});

describe("workerEntry", () => {
  it("is the TypeScript thread beside the sources and the built .mjs beside a bundle", () => {
    expect(workerEntry("file:///repo/app/lib/engine/engine-worker.server.ts").url.href).toBe("file:///repo/app/lib/engine/engine-worker.thread.ts");
    expect(workerEntry("file:///srv/firmsand/build/server/index.js")).toEqual({ url: new URL("file:///srv/firmsand/build/server/engine-worker.thread.mjs"), fromSources: false });
  });
});
