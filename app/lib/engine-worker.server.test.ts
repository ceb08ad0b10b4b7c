import { afterAll, describe, expect, it } from "vitest";
import { computeSurveyVolumes } from "../../shared/pipeline";
import { ellipseLimit, syntheticSurveys } from "../../tests/bench/synthetic";
import { EngineWorkerPool } from "./engine-worker.server";

describe("EngineWorkerPool", () => {
  const pool = new EngineWorkerPool(2);
  afterAll(() => pool.close());
  const basin = { name: "test pond", centreX: 512_000, centreY: 1_234_000, radiusX: 120, radiusY: 80, waterDepth: 6, muckThickness: 2 };
  const settings = { cellSize: 20, resolution: 1, maxEdge: 30, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };

  it("gives the single-thread result, with and without a work limit", async () => {
    const surveys = syntheticSurveys(basin, 5000, 7, { duplicateShare: 0.05 });
    const input = { baseline: surveys.before, progress: [surveys.after], firm: surveys.firm };
    for (const limit of [ellipseLimit(basin), null]) {
      const alone = computeSurveyVolumes(input, limit, settings);
      const threaded = await pool.computeSurveyVolumes(input, limit, settings);
      // invariant: moving the same arithmetic into threads changes nothing.
      expect(threaded.totals).toEqual(alone.totals);
      expect(Array.from(threaded.cells.remainingVolume)).toEqual(Array.from(alone.cells.remainingVolume));
      expect(threaded.surfaces).toEqual(alone.surfaces);
    }
    // The caller's arrays are copied, not taken, unless it asks for transfer.
    expect(surveys.before.easting.length).toBe(5000);
  });
});
