import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS } from "../../sample-data/scenario";
import { demoProjectInput } from "../../db/seeders/demo-scenario";
import { createApiToken } from "~/lib/auth/api-token.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { CellResult, ProjectSettingsVersion, Project, RecomputeJob, SurveySnapshot, getSequelize } from "~/lib/db.server";
import { RECOMPUTE_GIVEN_UP_MESSAGE, RECOMPUTE_MAX_ATTEMPTS } from "~/lib/engine/recompute-jobs.server";
import { createProject, listSettingsVersions, newProjectSchema } from "~/models/project-setup.server";
import { loadQuantities } from "~/models/quantities.server";
import * as projectApi from "~/routes/api.projects.$projectId";
import * as recomputesApi from "~/routes/api.projects.$projectId.recomputes";
import { importDemoSurveys } from "./import-helpers";
import { addMember, makeUser, ORIGIN } from "./helpers";
import { finishedRecompute, getRecompute } from "./recompute-helpers";
import type { RecomputeJobView } from "~/lib/engine/recompute-jobs.server";

// A change to what the figures rest on, after surveys exist: the PATCH answers 202 with the
// recompute's address, the job runs in the background, and its summary is checked against the
// stored figures before and after, compared here row by row. The settings history keeps each
// version, and the snapshots and quantities name the one they were computed with.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-settings-recompute-"));
afterAll(closeSequelize);

let projectId: number;
let managerToken: string;
let managerName: string;
let viewerToken: string;

beforeAll(async () => {
  const admin = await makeUser("recompute-admin", { isSiteAdmin: true });
  const manager = await makeUser("recompute-manager");
  managerName = manager.name;
  managerToken = (await createApiToken(manager, "tests")).token;
  const viewer = await makeUser("recompute-viewer");
  viewerToken = (await createApiToken(viewer, "tests")).token;
  const input = newProjectSchema.parse({ ...demoProjectInput(manager.email), slug: undefined, name: "Recompute spring" });
  projectId = (await createProject(admin, input)).id;
  await addMember(viewer.id, projectId, "viewer");
  // The baseline and the first progress survey: some cells are worked, so statuses can move.
  await importDemoSurveys(projectId, manager.id, SURVEYS.filter((survey) => survey.key === "baseline" || survey.key === "progress-1"));
}, 120_000);

async function patch(token: string, body: unknown): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/projects/${projectId}`, { method: "PATCH", headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: JSON.stringify(body) });
  return projectApi.action({ request, params: { projectId: String(projectId) }, context: {} } as never);
}

async function startAgain(token: string, id = projectId): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/projects/${id}/recomputes`, { method: "POST", headers: { Authorization: `Bearer ${token}` } });
  return recomputesApi.action({ request, params: { projectId: String(id) }, context: {} } as never);
}

/** The stored figures, read straight from the rows: each cell's status and planned volume, the latest snapshot. */
async function stored() {
  const cells = await CellResult.findAll({ where: { projectId }, attributes: ["label", "status", "plannedVolume", "zoneId", "areaInLimit"] });
  const snapshot = await SurveySnapshot.findOne({ where: { projectId }, order: [["surveyedOn", "DESC"]] });
  return { cells: cells.filter((cell) => cell.areaInLimit > 0), snapshot: snapshot! };
}

describe("a settings change after surveys exist", () => {
  it("answers 202 with the job's address; the job's summary is the difference of the stored figures (same grid: cell by cell)", async () => {
    const before = await stored();
    const version = (await ProjectSettingsVersion.findOne({ where: { projectId }, order: [["version", "DESC"]] }))!;
    const response = await patch(managerToken, { tolerances: { firmSand: version.settings.tolerances.firmSand * 4 } });
    expect(response.status).toBe(202);
    const answer = (await response.json()) as { settingsVersion: number; recompute: { id: number; url: string } };
    expect(answer.recompute.url).toBe(`/api/projects/${projectId}/recomputes/${answer.recompute.id}`);
    expect(response.headers.get("Location")).toBe(answer.recompute.url);
    expect(answer.settingsVersion).toBe(version.version + 1);

    const seen: RecomputeJobView[] = [];
    const job = await finishedRecompute(managerToken, projectId, answer.recompute.id, 80_000, seen);
    expect(job.state, job.error ?? "").toBe("done");
    expect(job.fraction).toBe(1);
    expect(job.settingsVersion).toBe(answer.settingsVersion);
    // invariant: the fraction a client sees never goes back
    const fractions = seen.map((view) => view.fraction);
    expect(fractions).toEqual([...fractions].sort((a, b) => a - b));

    const after = await stored();
    // computed here, row by row: the cells whose status differs between the rows before and after
    const statusBefore = new Map(before.cells.map((cell) => [cell.label, cell.status]));
    const changed = after.cells.filter((cell) => statusBefore.get(cell.label) !== cell.status).length;
    expect(changed).toBeGreaterThan(0); // a four times wider tolerance moves some cells to firm sand
    const summary = job.summary!;
    expect(summary.sameGrid).toBe(true);
    expect([summary.statusChanged, summary.cellsAdded, summary.cellsRemoved]).toEqual([changed, 0, 0]);
    expect([summary.fromVersion, summary.toVersion]).toEqual([version.version, answer.settingsVersion]);
    // The volumes are the snapshots' own totals before and after, never recomputed for the summary.
    const remaining = summary.volumes.find((volume) => volume.key === "remainingVolume")!;
    expect(remaining.before).toBeCloseTo(before.snapshot.totals.remainingVolume, 6);
    expect(remaining.after).toBeCloseTo(after.snapshot.totals.remainingVolume, 6);
    const planned = summary.volumes.find((volume) => volume.key === "plannedVolume")!;
    const plannedWords = Math.round(planned.before!) === Math.round(planned.after!) ? "" : `planned volume ${Math.round(planned.before!).toLocaleString("en-US")} → ${Math.round(planned.after!).toLocaleString("en-US")} yd³; `;
    expect(job.summaryText).toContain(`${plannedWords}`);
    expect(job.summaryText).toContain(`${changed.toLocaleString("en-US")} cell${changed === 1 ? "" : "s"} changed status`);

    // The snapshots name the version they were computed with; the quantities say it.
    expect(after.snapshot.settingsVersionId).toBe((await ProjectSettingsVersion.findOne({ where: { projectId, version: answer.settingsVersion } }))!.id);
    const project = presentProject((await Project.findByPk(projectId))!);
    expect((await loadQuantities(project)).settingsVersion?.version).toBe(answer.settingsVersion);
    const history = await listSettingsVersions(project);
    expect(history.slice(0, 2).map((row) => [row.version, row.changed, row.savedBy])).toEqual([
      [answer.settingsVersion, ["tolerances"], managerName],
      [version.version, version.version === 1 ? ["created"] : version.changedParts, history[1].savedBy],
    ]);
  }, 120_000);

  it("removing a zone moves its cells to the Unzoned row: the summary's rows add up as computed by hand", async () => {
    const settingsResponse = await projectApi.loader({ request: new Request(`${ORIGIN}/api/projects/${projectId}`, { headers: { Authorization: `Bearer ${managerToken}` } }), params: { projectId: String(projectId) }, context: {} } as never);
    const { settings } = (await settingsResponse.json()) as { settings: { zones: Array<{ id: number; name: string; geometry: unknown }> } };
    const before = await stored();
    const dropped = settings.zones[settings.zones.length - 1];
    const zoneBefore = before.snapshot.zones.find((zone) => zone.name === dropped.name)!.totals.plannedVolume;
    const unzonedBefore = before.snapshot.zones.find((zone) => zone.zoneId === null)?.totals.plannedVolume ?? 0;
    const response = await patch(managerToken, { zones: settings.zones.slice(0, -1).map((zone) => ({ id: zone.id, name: zone.name, geometry: zone.geometry })) });
    expect(response.status).toBe(202);
    const job = await finishedRecompute(managerToken, projectId, ((await response.json()) as { recompute: { id: number } }).recompute.id);
    expect(job.state, job.error ?? "").toBe("done");
    const summary = job.summary!;
    const droppedRow = summary.zones.find((zone) => zone.name === dropped.name)!;
    expect([droppedRow.plannedBefore, droppedRow.plannedAfter]).toEqual([zoneBefore, null]);
    const unzoned = summary.zones.find((zone) => zone.name === "Unzoned")!;
    // computed: the dropped zone's cells now count in no zone, and nothing else moved
    expect(unzoned.plannedAfter!).toBeCloseTo(unzonedBefore + zoneBefore, 2);
    expect(summary.statusChanged).toBe(0);
    expect(job.summaryText).toContain(`zone "${dropped.name}" removed`);
    // invariant: the zone rows still add up to the project
    const after = await stored();
    const rows = after.snapshot.zones.reduce((sum, zone) => sum + zone.totals.plannedVolume, 0);
    expect(rows).toBeCloseTo(after.snapshot.totals.plannedVolume, 2);
  }, 120_000);

  it("a change no figure rests on answers 200 with no recompute; the over-dredge allowance is a new version without one", async () => {
    const versions = await ProjectSettingsVersion.count({ where: { projectId } });
    const renamed = await patch(managerToken, { description: "Renamed for the test" });
    expect(renamed.status).toBe(200);
    expect(((await renamed.json()) as { recompute: unknown }).recompute).toBeNull();
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versions);
    const allowance = await patch(managerToken, { tolerances: { overDredgeAllowance: 0.5 } });
    expect(allowance.status).toBe(200);
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versions + 1);
  });
});

describe("the recompute's address and starting one again", () => {
  it("is the manager's: a viewer gets 403, an unknown or another project's job 404", async () => {
    const job = await RecomputeJob.findOne({ where: { projectId }, order: [["id", "DESC"]] });
    expect((await getRecompute(viewerToken, projectId, job!.id)).status).toBe(403);
    expect((await getRecompute(managerToken, projectId, 999_999_999)).status).toBe(404);
    expect((await getRecompute(managerToken, projectId, "x1")).status).toBe(404);
    expect((await startAgain(viewerToken)).status).toBe(403);
  });

  it("a job the server stopped too often is given up, saying so; starting again recomputes and finds nothing changed", async () => {
    const version = (await ProjectSettingsVersion.findOne({ where: { projectId }, order: [["version", "DESC"]] }))!;
    const stuck = await RecomputeJob.create({ projectId, userId: null, settingsVersionId: version.id, state: "running", stage: "computing", fraction: 0.4, attempts: RECOMPUTE_MAX_ATTEMPTS });
    await getSequelize().query("UPDATE recompute_jobs SET updatedAt = NOW() - INTERVAL 5 MINUTE WHERE id = ?", { replacements: [stuck.id] });
    const seen = (await (await getRecompute(managerToken, projectId, stuck.id)).json()) as RecomputeJobView;
    expect([seen.state, seen.error]).toEqual(["failed", RECOMPUTE_GIVEN_UP_MESSAGE]);

    const response = await startAgain(managerToken);
    expect(response.status).toBe(202);
    const started = (await response.json()) as { id: number; url: string; started: boolean };
    expect(started.started).toBe(true);
    expect(response.headers.get("Location")).toBe(started.url);
    // A second request while it waits or runs gets the same job, not another.
    const again = (await (await startAgain(managerToken)).json()) as { id: number; started: boolean };
    if (!again.started) expect(again.id).toBe(started.id);
    const job = await finishedRecompute(managerToken, projectId, started.id);
    expect(job.state, job.error ?? "").toBe("done");
    if (again.started) await finishedRecompute(managerToken, projectId, again.id);
    // invariant: the same settings give the same figures
    expect(job.summaryText).toBe("no figure changed");
  }, 120_000);
});
