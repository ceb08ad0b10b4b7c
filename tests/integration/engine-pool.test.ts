import { join } from "node:path";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS, PROJECT } from "../../sample-data/scenario";
import { CellResult, SurveySnapshot, getSequelize } from "~/lib/db.server";
import { closeAppEnginePool } from "~/lib/engine/engine-worker.server";
import { computeProjectSurfaces, serverEnginePool } from "~/lib/engine/engine-state.server";
import { recomputeProjectStatistics } from "~/lib/engine/recompute.server";
import { DEMO_DIR, makeDemoSiteProject, postSurvey } from "./import-helpers";

// The server computes an import's figures and the map's surfaces in its engine pool (worker
// threads); ENGINE_THREADS=0 computes them on the request thread. Both ways must store and serve
// the same figures.
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-pool-test-"));

afterAll(async () => {
  await closeAppEnginePool();
  await closeSequelize();
});

async function storedFigures(projectId: number) {
  const cells = await CellResult.findAll({ where: { projectId }, order: [["row", "ASC"], ["col", "ASC"]], raw: true });
  const snapshots = await SurveySnapshot.findAll({ where: { projectId }, order: [["surveyedOn", "ASC"]], raw: true });
  return {
    cells: cells.map(({ id: _id, computedAt: _at, ...cell }) => cell),
    snapshots: snapshots.map(({ id: _id, computedAt: _at, ...snapshot }) => snapshot),
  };
}

describe("the server's engine pool", () => {
  let projectId = 0;

  beforeAll(async () => {
    const site = await makeDemoSiteProject("pool");
    projectId = site.project.id;
    for (const survey of SURVEYS.filter((entry) => entry.key === "baseline" || entry.key === "progress-1")) {
      const response = await postSurvey(projectId, site.tokens.surveyor, { path: join(DEMO_DIR, survey.fileName) }, {
        kind: survey.kind, surveyedOn: survey.surveyedOn, waterSurfaceElevation: String(survey.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
      });
      expect(response.status).toBe(201);
    }
  });

  it("runs in worker threads by default (ENGINE_THREADS unset: one thread)", () => {
    expect(serverEnginePool()?.size).toBe(1);
  });

  it("stores the same figures from its threads as computed on the request thread", async () => {
    const threaded = await storedFigures(projectId); // the commits above recomputed in the pool
    expect(threaded.cells.length).toBeGreaterThan(0);
    expect(threaded.snapshots).toHaveLength(2);
    await getSequelize().transaction((transaction) => recomputeProjectStatistics(projectId, transaction, { pool: null }));
    const inProcess = await storedFigures(projectId);
    // invariant: the same function on the same soundings, wherever it runs.
    expect(inProcess).toEqual(threaded);
  });

  it("serves the same map surfaces from its threads as computed on the request thread", async () => {
    const threaded = await computeProjectSurfaces(projectId);
    const inProcess = await computeProjectSurfaces(projectId, null);
    expect(threaded).not.toBeNull();
    expect(threaded!.depth).not.toBeNull();
    expect(threaded).toEqual(inProcess);
  });
});
