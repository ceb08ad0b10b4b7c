import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Op } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS } from "../../sample-data/scenario";
import { demoProjectInput } from "../../db/seeders/demo-scenario";
import { createApiToken } from "~/lib/auth/api-token.server";
import { CellResult, ProjectSettingsVersion, RecomputeJob, getSequelize } from "~/lib/db.server";
import {
  RECOMPUTE_CUT_OFF_MS, RECOMPUTE_GIVEN_UP_MESSAGE, RECOMPUTE_MAX_ATTEMPTS, RECOMPUTE_RESUMED_STAGE, startRecomputeJobRounds, takeUpRecomputeJobs,
} from "~/lib/engine/recompute-jobs.server";
import { createProject, newProjectSchema } from "~/models/project-setup.server";
import { importDemoSurveys } from "./import-helpers";
import { makeUser } from "./helpers";
import { finishedRecompute, getRecompute } from "./recompute-helpers";
import type { RecomputeJobView } from "~/lib/engine/recompute-jobs.server";

// A recompute that a server stop cut short is not lost: the next server takes up the waiting jobs
// when it starts, and any job whose heartbeat went silent, and runs them again under the project
// lock, one at a time and in order. The figures are spoiled by hand first (some cells' statuses),
// so a job that really ran is seen putting them back; the second job, run after it, finds nothing
// left to change.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-recompute-restart-"));
afterAll(closeSequelize);

let projectId: number;
let managerToken: string;
let settingsVersionId: number;

beforeAll(async () => {
  const admin = await makeUser("restart-admin", { isSiteAdmin: true });
  const manager = await makeUser("restart-manager");
  managerToken = (await createApiToken(manager, "tests")).token;
  const input = newProjectSchema.parse({ ...demoProjectInput(manager.email), slug: undefined, name: "Restart spring" });
  projectId = (await createProject(admin, input)).id;
  await importDemoSurveys(projectId, manager.id, SURVEYS.filter((survey) => survey.key === "baseline"));
  settingsVersionId = (await ProjectSettingsVersion.findOne({ where: { projectId }, order: [["version", "DESC"]] }))!.id;
}, 120_000);

/** A job row as a stopped server left it: its state, attempts so far, and its heartbeat `silentForMs` ago. */
async function leftJob(state: "queued" | "running", attempts: number, silentForMs: number): Promise<number> {
  const job = await RecomputeJob.create({ projectId, userId: null, settingsVersionId, state, stage: state === "queued" ? "waiting to start" : "computing", fraction: state === "queued" ? 0 : 0.4, attempts });
  await getSequelize().query("UPDATE recompute_jobs SET updatedAt = NOW(3) - INTERVAL ? MICROSECOND WHERE id = ?", { replacements: [silentForMs * 1000, job.id] });
  return job.id;
}

async function statuses(): Promise<Map<string, string>> {
  const cells = await CellResult.findAll({ where: { projectId, areaInLimit: { [Op.gt]: 0 } }, attributes: ["label", "status"], order: [["label", "ASC"]] });
  return new Map(cells.map((cell) => [cell.label, cell.status]));
}

describe("recomputes left by a stopped server", () => {
  it("are registered with the server's background work, started when it listens", () => {
    const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
    expect(registry.firmsandBackgroundTasks).toContain(startRecomputeJobRounds);
  });

  it("at the start: a waiting job and a silent running one run again, in order, one at a time; a live one is left; one stopped too often is given up", async () => {
    const correct = await statuses();
    // Spoil five cells' statuses, as if their figures had been written under other settings.
    const spoiled = [...correct.entries()].filter(([, status]) => status !== "confirmed").slice(0, 5).map(([label]) => label);
    expect(spoiled).toHaveLength(5);
    await CellResult.update({ status: "confirmed" }, { where: { projectId, label: { [Op.in]: spoiled } } });

    const waiting = await leftJob("queued", 0, 2_000); // queued just before the stop: its heartbeat is still fresh
    const cutShort = await leftJob("running", 1, RECOMPUTE_CUT_OFF_MS + 60_000);
    const stoppedTooOften = await leftJob("running", RECOMPUTE_MAX_ATTEMPTS, RECOMPUTE_CUT_OFF_MS + 60_000);
    const alive = await leftJob("running", 1, 5_000); // another server's, still beating

    // What the server's start does (scoped to this test's project: other test files share the database).
    const taken = await takeUpRecomputeJobs({ projectId, waiting: "all" });
    expect(taken.jobIds).toEqual([waiting, cutShort]);
    expect(taken.givenUp).toBe(1);
    await taken.finished;

    const [first, second] = await Promise.all([waiting, cutShort].map((id) => finishedRecompute(managerToken, projectId, id, 5_000)));
    expect([first.state, second.state], `${first.error} ${second.error}`).toEqual(["done", "done"]);
    // computed here: the five spoiled cells are put back, and nothing else moves
    expect(first.summary!.statusChanged).toBe(5);
    expect(await statuses()).toEqual(correct);
    // The second ran after the first had committed (one at a time, in order): nothing was left to change.
    expect(second.summaryText).toBe("no figure changed");
    expect(new Date(second.finishedAt!).getTime()).toBeGreaterThanOrEqual(new Date(first.finishedAt!).getTime());

    const rows = new Map((await RecomputeJob.findAll({ where: { id: [waiting, cutShort, stoppedTooOften, alive] } })).map((row) => [row.id, row]));
    expect([rows.get(waiting)!.attempts, rows.get(cutShort)!.attempts]).toEqual([1, 2]);
    expect([rows.get(stoppedTooOften)!.state, rows.get(stoppedTooOften)!.error]).toEqual(["failed", RECOMPUTE_GIVEN_UP_MESSAGE]);
    expect([rows.get(alive)!.state, rows.get(alive)!.stage]).toEqual(["running", "computing"]);
    await RecomputeJob.destroy({ where: { id: alive } });
  }, 120_000);

  it("later rounds take only silent jobs: a fresh waiting job may be another server's, waiting its turn", async () => {
    const fresh = await leftJob("queued", 0, 2_000);
    const silent = await leftJob("queued", 0, RECOMPUTE_CUT_OFF_MS + 5_000);
    const taken = await takeUpRecomputeJobs({ projectId, waiting: "silent" });
    expect(taken.jobIds).toEqual([silent]);
    await taken.finished;
    expect((await RecomputeJob.findByPk(silent))!.state).toBe("done");
    expect((await RecomputeJob.findByPk(fresh))!.state).toBe("queued");
    await RecomputeJob.destroy({ where: { id: fresh } });
  }, 120_000);

  it("a client reading a silent job sees it taken up and finished, not failed", async () => {
    const cutShort = await leftJob("running", 1, RECOMPUTE_CUT_OFF_MS + 60_000);
    const seen = (await (await getRecompute(managerToken, projectId, cutShort)).json()) as RecomputeJobView;
    // Handed back to the queue and run here (it may already have been claimed when the answer is read).
    expect(["queued", "running"]).toContain(seen.state);
    if (seen.state === "queued") expect(seen.stage).toBe(RECOMPUTE_RESUMED_STAGE);
    expect(seen.error).toBeNull();
    const job = await finishedRecompute(managerToken, projectId, cutShort);
    expect(job.state, job.error ?? "").toBe("done");
    expect(job.summaryText).toBe("no figure changed");
  }, 120_000);
});
