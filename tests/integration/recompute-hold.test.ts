import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS } from "../../sample-data/scenario";
import { demoProjectInput } from "../../db/seeders/demo-scenario";
import { createApiToken } from "~/lib/auth/api-token.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { Project } from "~/lib/db.server";
import { RECOMPUTE_HELD_STAGE, type RecomputeJobView } from "~/lib/engine/recompute-jobs.server";
import { createProject, newProjectSchema, recomputeProjectFigures } from "~/models/project-setup.server";
import { importDemoSurveys } from "./import-helpers";
import { makeUser } from "./helpers";
import { finishedRecompute } from "./recompute-helpers";

// The test setting RECOMPUTE_HOLD_MS (read at the first recompute, so set before any here): a
// claimed job shows as running, its stage saying it is held, for that long before it computes,
// so the browser test of the running panel never races a fast machine. Then it runs as ever.

const HOLD_MS = 1_500;
process.env.RECOMPUTE_HOLD_MS = String(HOLD_MS);
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-recompute-hold-"));
afterAll(closeSequelize);

let projectId: number;
let managerToken: string;
let manager: Awaited<ReturnType<typeof makeUser>>;

beforeAll(async () => {
  const admin = await makeUser("hold-admin", { isSiteAdmin: true });
  manager = await makeUser("hold-manager");
  managerToken = (await createApiToken(manager, "tests")).token;
  const input = newProjectSchema.parse({ ...demoProjectInput(manager.email), slug: undefined, name: "Held recompute spring" });
  projectId = (await createProject(admin, input)).id;
  await importDemoSurveys(projectId, manager.id, SURVEYS.filter((survey) => survey.key === "baseline"));
}, 120_000);

describe("a recompute held by RECOMPUTE_HOLD_MS", () => {
  it("is seen running, held, for the set time, then finishes as any recompute does", async () => {
    const project = presentProject((await Project.findByPk(projectId))!);
    const started = Date.now();
    const { jobId } = await recomputeProjectFigures(project, manager);
    const seen: RecomputeJobView[] = [];
    const job = await finishedRecompute(managerToken, projectId, jobId, 60_000, seen);
    expect(job.state, job.error ?? "").toBe("done");
    // The whole run lasted at least the hold, and a reader polling every 100 ms saw it held while running.
    expect(Date.now() - started).toBeGreaterThanOrEqual(HOLD_MS);
    const held = seen.filter((view) => view.state === "running" && view.stage === RECOMPUTE_HELD_STAGE);
    expect(held.length).toBeGreaterThanOrEqual(5);
    // Nothing was changed by the settings, so nothing moved.
    expect(job.summaryText).toBe("no figure changed");
  }, 120_000);
});
