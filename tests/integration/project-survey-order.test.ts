import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { closeSequelize, getSequelize } from "../../db/connection.server";
import { createUmzug } from "../../db/umzug";
import { PROJECT, SURVEYS, WORK_LIMIT } from "../../sample-data/scenario";
import { createApiToken } from "~/lib/auth/api-token.server";
import { AuditEvent, ProjectSettingsVersion, RecomputeJob, Survey } from "~/lib/db.server";
import * as projectsApi from "~/routes/api.projects";
import * as projectApi from "~/routes/api.projects.$projectId";
import * as settingsPage from "~/routes/projects.$projectId.settings";
import { DEMO_DIR, postSurvey } from "./import-helpers";
import { makeUser, ORIGIN, requestAs } from "./helpers";

// The project's IHO S-44 survey order: a tolerance set on creating the project, on the API's PATCH
// and on the settings page; kept in the settings history and the audit log; a change recomputes
// nothing, and each survey keeps the order it was imported with. The upload defaults to the
// project's order, and the survey's QA is judged against the order it was given.
//
// published: IHO S-44 Standards for Hydrographic Surveys, ed. 6.0.0 (2020), table 1, total vertical
// uncertainty TVU = √(a² + (b·d)²) at 95 %: order 1a a = 0.5 m, b = 0.013; order 2 a = 1.0 m,
// b = 0.023; special order a = 0.25 m, b = 0.0075. published: the US survey foot is 1200/3937 m
// (the project's unit, EPSG:2237).
const S44 = { "1a": { aM: 0.5, b: 0.013 }, "2": { aM: 1.0, b: 0.023 }, special: { aM: 0.25, b: 0.0075 } } as const;
const US_FOOT_M = 1200 / 3937;
/** The allowance in US survey feet at a depth in US survey feet, from the table's values above. */
const allowanceFt = (order: keyof typeof S44, depthFt: number) => Math.sqrt(S44[order].aM ** 2 + (S44[order].b * depthFt * US_FOOT_M) ** 2) / US_FOOT_M;

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-survey-order-"));
afterAll(closeSequelize);

let adminToken: string;
let managerToken: string;
let managerId: number;
let managerEmail: string;
let inUseId: number;

beforeAll(async () => {
  const admin = await makeUser("order-admin", { isSiteAdmin: true });
  adminToken = (await createApiToken(admin, "tests")).token;
  const manager = await makeUser("order-manager");
  managerId = manager.id;
  managerEmail = manager.email;
  managerToken = (await createApiToken(manager, "tests")).token;
});

async function send(method: "POST" | "GET" | "PATCH", token: string, body?: unknown, projectId?: number): Promise<Response> {
  const path = projectId === undefined ? "/api/projects" : `/api/projects/${projectId}`;
  const request = new Request(`${ORIGIN}${path}`, { method, headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  const route = projectId === undefined ? projectsApi : projectApi;
  return (method === "GET" ? route.loader : route.action)({ request, params: projectId === undefined ? {} : { projectId: String(projectId) }, context: {} } as never);
}

const spring = (name: string, tolerances?: Record<string, unknown>) => ({
  name, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York", workLimit: WORK_LIMIT, grid: { cellSize: 20 }, manager: managerEmail, ...(tolerances ? { tolerances } : {}),
});

async function create(name: string, tolerances?: Record<string, unknown>): Promise<number> {
  const response = await send("POST", adminToken, spring(name, tolerances));
  const body = (await response.json()) as { id: number };
  expect(response.status, JSON.stringify(body)).toBe(201);
  return body.id;
}

async function orderOf(projectId: number): Promise<string> {
  const response = await send("GET", managerToken, undefined, projectId);
  return ((await response.json()) as { settings: { tolerances: { surveyOrder: string } } }).settings.tolerances.surveyOrder;
}

async function upload(projectId: number, key: string, extra: Record<string, string> = {}): Promise<Survey> {
  const survey = SURVEYS.find((candidate) => candidate.key === key)!;
  const response = await postSurvey(projectId, managerToken, { path: join(DEMO_DIR, survey.fileName) }, {
    kind: survey.kind, surveyedOn: survey.surveyedOn, waterSurfaceElevation: String(survey.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum, ...extra,
  });
  const body = (await response.json()) as { id: number };
  expect(response.status, JSON.stringify(body)).toBe(201);
  return (await Survey.findByPk(body.id))!;
}

/** The spike threshold the survey's QA used, against the allowance of `order` at the median depth it recorded. */
function expectJudgedAgainst(survey: Survey, order: keyof typeof S44) {
  const qa = survey.qa as { surveyOrder: string; order: string; medianDepth: number; spikes: { threshold: number } };
  expect([qa.surveyOrder, qa.order]).toEqual([order, order]);
  expect(qa.spikes.threshold).toBeCloseTo(allowanceFt(order, qa.medianDepth), 9);
}

describe("the project's survey order", () => {
  it("is 1a unless the new project names another; anything but an IHO S-44 order is refused naming tolerances.surveyOrder", async () => {
    expect(await orderOf(await create("Order default"))).toBe("1a");
    expect(await orderOf(await create("Order special", { surveyOrder: "special" }))).toBe("special");
    const refused = await send("POST", adminToken, spring("Order refused", { surveyOrder: "3" }));
    expect(refused.status).toBe(422);
    const errors = ((await refused.json()) as { errors: Array<{ field: string; message: string }> }).errors;
    expect(errors).toEqual([expect.objectContaining({ field: "tolerances.surveyOrder", message: expect.stringContaining("exclusive, special, 1a, 1b, 2") })]);
    const patched = await send("PATCH", managerToken, { tolerances: { surveyOrder: "1c" } }, await create("Order patch refused"));
    expect(patched.status).toBe(422);
    expect(((await patched.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field)).toEqual(["tolerances.surveyOrder"]);
  });

  it("is the upload's default; a change is versioned and audited, recomputes nothing, and leaves earlier surveys their order", async () => {
    const projectId = (inUseId = await create("Order in use"));
    const baseline = await upload(projectId, "baseline");
    expectJudgedAgainst(baseline, "1a");
    const versionsBefore = await ProjectSettingsVersion.count({ where: { projectId } });

    const response = await send("PATCH", managerToken, { tolerances: { surveyOrder: "2" } }, projectId);
    const answer = (await response.json()) as { recompute: unknown; settingsVersion: number; settings: { tolerances: { surveyOrder: string } } };
    expect(response.status).toBe(200);
    expect(answer.recompute).toBeNull();
    expect(answer.settings.tolerances.surveyOrder).toBe("2");
    expect(await RecomputeJob.count({ where: { projectId } })).toBe(0);
    const latest = (await ProjectSettingsVersion.findOne({ where: { projectId }, order: [["version", "DESC"]] }))!;
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versionsBefore + 1);
    expect(latest.changedParts).toEqual(["tolerances"]);
    expect(latest.settings.tolerances.surveyOrder).toBe("2");
    const audit = (await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] }))!;
    const detail = audit.detail as { before: { tolerances: { surveyOrder: string } }; after: { tolerances: { surveyOrder: string } }; recomputed: boolean };
    expect([detail.before.tolerances.surveyOrder, detail.after.tolerances.surveyOrder, detail.recomputed]).toEqual(["1a", "2", false]);

    // The baseline keeps the order it was imported with; the next upload takes the project's, or the one it names.
    expectJudgedAgainst((await Survey.findByPk(baseline.id))!, "1a");
    expectJudgedAgainst(await upload(projectId, "progress-1"), "2");
    expectJudgedAgainst(await upload(projectId, "progress-2", { surveyOrder: "special" }), "special");
  }, 120_000);

  it("is saved from the settings page's tolerances, a wrong value named on its field", async () => {
    const projectId = await create("Order on the page");
    const post = async (fields: Record<string, string>) => {
      const form = new FormData();
      for (const [name, value] of Object.entries(fields)) form.set(name, value);
      const request = await requestAs(managerId, `/projects/${projectId}/settings`, { method: "POST", body: form });
      return (await settingsPage.action({ request, params: { projectId: String(projectId) }, context: {} } as never)) as unknown as { data: { errors: Record<string, string>; notice: string | null }; init: { status?: number } | null };
    };
    const tolerances = { intent: "tolerances", firmSand: "0.25", firmShare: "0.95", minCoverage: "0.8", overDredgeAllowance: "0" };
    const bad = await post({ ...tolerances, surveyOrder: "first" });
    expect(bad.init?.status).toBe(400);
    expect(bad.data.errors.surveyOrder).toMatch(/IHO S-44/);
    expect(await orderOf(projectId)).toBe("1a");
    const saved = await post({ ...tolerances, surveyOrder: "1b" });
    expect(saved.data.notice).toMatch(/^Saved\./);
    expect(await orderOf(projectId)).toBe("1b");
  });

  it("migration 0041 starts a project with surveys from its newest survey's order, others from 1a", async () => {
    const umzug = createUmzug(getSequelize());
    const emptyId = await create("Order before the migration", { surveyOrder: "exclusive" });
    await umzug.down({ to: "0041-project-survey-order" });
    try {
      await umzug.up();
    } finally {
      // Leave the database fully migrated whatever happened.
      await umzug.up();
    }
    const rows = await getSequelize().query<{ id: number; surveyOrder: string }>("SELECT id, surveyOrder FROM projects WHERE id IN (?)", { replacements: [[inUseId, emptyId]], type: QueryTypes.SELECT });
    const order = new Map(rows.map((row) => [row.id, row.surveyOrder]));
    // "Order in use" had 2 set, and its newest survey (progress 2) was imported with special order.
    expect(order.get(inUseId)).toBe("special");
    expect(order.get(emptyId)).toBe("1a");
  }, 60_000);
});
