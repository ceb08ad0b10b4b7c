import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { configuredRoutes } from "../configured-routes";
import { AuditEvent, Project } from "~/lib/db.server";
import { createApiToken } from "~/lib/auth/api-token.server";
import { listProjectsForUser } from "~/models/project.server";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// Issue "project setup", archive: a finished project is read-only everywhere. The check is one
// (projectAccess with the permission table), so this walks every route of app/routes.ts under a
// project rather than a hand-kept list: a new changing route is covered the day it is added.
// Invariant: with the project archived, every method a route answers other than reading is
// refused with 409 naming the archive, nothing is written; restoring gives back each route's
// own answer to the same request.

afterAll(closeSequelize);

type Handler = (args: never) => Promise<Response>;
const CHANGING_METHODS = ["POST", "PUT", "PATCH", "DELETE"] as const;
// Archive and restore themselves are tested on their own below.
const OWN_ROUTES = new Set(["api/projects/:projectId/archive", "api/projects/:projectId/restore", "projects/:projectId/archive", "projects/:projectId/restore"]);

let projectId: number;
let managerId: number;
let managerToken: string;
let adminId: number;
let adminToken: string;

/** A route's URL and params with this test's project and ids that exist nowhere (so an open project refuses them too, changing nothing). */
function fill(path: string) {
  const params: Record<string, string> = {};
  const url = path.replace(/:(\w+)|\*/g, (whole, name: string | undefined) => {
    const key = name ?? "*";
    const value = key === "projectId" ? String(projectId) : key === "date" ? "2030-01-02" : key === "label" ? "B7" : key === "token" ? "no-such-token-0123456789" : key === "*" ? "no-such-thing" : "999999999";
    params[key] = value;
    return value;
  });
  return { url: `/${url}`, params };
}

const projectRoutes = () => configuredRoutes().filter((route) => /^(api\/)?projects\/:projectId(\/|$)/.test(route.path) && !OWN_ROUTES.has(route.path));

async function moduleOf(file: string): Promise<{ action?: Handler }> {
  return import(/* @vite-ignore */ `../../app/${file}`);
}

/** Every changing method of every project API route, answered as the site admin (whom the table allows everything) with `{}`. */
async function apiAnswers(): Promise<Map<string, { status: number; body: { errors?: Array<{ message: string }>; code?: string } | null }>> {
  const answers = new Map();
  for (const route of projectRoutes().filter((entry) => entry.path.startsWith("api/"))) {
    const { action } = await moduleOf(route.file);
    if (!action) continue;
    const { url, params } = fill(route.path);
    for (const method of CHANGING_METHODS) {
      const request = new Request(`${ORIGIN}${url}`, { method, body: "{}", headers: { "Content-Type": "application/json", Authorization: `Bearer ${adminToken}` } });
      const response = await action({ request, params, context: {} } as never);
      const text = await response.text();
      answers.set(`${method} /${route.path}`, { status: response.status, body: text.startsWith("{") ? JSON.parse(text) : null });
    }
  }
  return answers;
}

/** Every project page route with an action, posted by the manager: the status it answers or throws. */
async function pageAnswers(): Promise<Map<string, { status: number; text: string }>> {
  const answers = new Map();
  for (const route of projectRoutes().filter((entry) => !entry.path.startsWith("api/"))) {
    const { action } = await moduleOf(route.file);
    if (!action) continue;
    const { url, params } = fill(route.path);
    const request = await requestAs(managerId, url, { method: "POST", body: new URLSearchParams({ intent: "no-such-intent" }), headers: { "Content-Type": "application/x-www-form-urlencoded" } });
    let answer: unknown;
    try {
      answer = await action({ request, params, context: {} } as never);
    } catch (thrown) {
      answer = thrown;
    }
    const status = answer instanceof Response ? answer.status : (answer as { init?: { status?: number } } | null)?.init?.status ?? 200;
    const text = answer instanceof Response ? await answer.text() : "";
    answers.set(`POST /${route.path}`, { status, text });
  }
  return answers;
}

const post = async (path: string, token: string) => {
  const route = configuredRoutes().find((entry) => entry.path === path)!;
  const { action } = await moduleOf(route.file);
  const { url, params } = fill(path);
  return action!({ request: new Request(`${ORIGIN}${url}`, { method: "POST", headers: { Authorization: `Bearer ${token}` } }), params, context: {} } as never);
};

const projectRow = async () => JSON.stringify(await Project.findByPk(projectId, { raw: true }));

beforeAll(async () => {
  projectId = (await makeProject("archive")).id;
  const manager = await makeUser("archive-manager");
  managerId = manager.id;
  await addMember(managerId, projectId, "manager");
  managerToken = (await createApiToken(manager, "tests")).token;
  const admin = await makeUser("archive-admin", { isSiteAdmin: true });
  adminId = admin.id;
  adminToken = (await createApiToken(admin, "tests")).token;
});

describe("an archived project", () => {
  it("refuses every changing API request and page action with 409 naming the archive, changes nothing, and a restore reopens each", async () => {
    const openApi = await apiAnswers();
    const openPages = await pageAnswers();
    // The walk reached the routes: an open project answers them in their own ways, none of them the archive's refusal.
    expect(openApi.size).toBeGreaterThan(60);
    expect([...openApi.values()].some((answer) => answer.body?.code === "project-archived")).toBe(false);
    const answering = [...openApi].filter(([, answer]) => answer.status !== 405).map(([key]) => key);
    expect(answering).toEqual(expect.arrayContaining(["POST /api/projects/:projectId/teams", "PATCH /api/projects/:projectId", "POST /api/projects/:projectId/surveys", "DELETE /api/projects/:projectId/teams/:teamId"]));
    expect(openPages.size).toBeGreaterThan(15);

    // The manager archives it (the API; the page route is the same service).
    const archived = await post("api/projects/:projectId/archive", managerToken);
    expect(archived.status).toBe(200);
    expect((await archived.json()).archivedAt).toMatch(/^\d{4}-\d{2}-\d{2}T/);
    const rowBefore = await projectRow();
    const auditBefore = await AuditEvent.count({ where: { projectId } });

    const archivedApi = await apiAnswers();
    for (const [key, open] of openApi) {
      const answer = archivedApi.get(key)!;
      if (open.status === 405) {
        expect(answer.status, key).toBe(405);
        continue;
      }
      expect(answer.status, key).toBe(409);
      expect(answer.body?.code, key).toBe("project-archived");
      expect(answer.body?.errors?.[0]?.message, key).toMatch(/was archived on \d{4}-\d{2}-\d{2} and is read-only.*A site admin can restore it/);
    }
    const archivedPages = await pageAnswers();
    for (const [key] of openPages) {
      expect(archivedPages.get(key)!.status, key).toBe(409);
      expect(archivedPages.get(key)!.text, key).toContain("is read-only");
    }
    // A second archive is refused the same way.
    expect((await post("api/projects/:projectId/archive", managerToken)).status).toBe(409);
    expect(await projectRow()).toBe(rowBefore);
    expect(await AuditEvent.count({ where: { projectId } })).toBe(auditBefore);

    // Still readable and exportable.
    const { loader: settingsLoader } = await import("~/routes/api.projects.$projectId");
    const settings = await settingsLoader({ request: new Request(`${ORIGIN}/api/projects/${projectId}`, { headers: { Authorization: `Bearer ${managerToken}` } }), params: { projectId: String(projectId) }, context: {} } as never);
    expect(settings.status).toBe(200);
    expect((await settings.json()).settings.archivedAt).not.toBeNull();
    const { loader: csvLoader } = await import("~/routes/api.projects.$projectId.quantities[.]csv");
    const csv = await csvLoader({ request: new Request(`${ORIGIN}/api/projects/${projectId}/quantities.csv`, { headers: { Authorization: `Bearer ${managerToken}` } }), params: { projectId: String(projectId) }, context: {} } as never);
    expect(csv.status).not.toBe(409);
    // Listed apart: the project list carries the date.
    const listed = (await listProjectsForUser({ id: managerId, isSiteAdmin: false } as never)).find((project) => project.id === projectId);
    expect(listed?.archivedAt).toMatch(/^\d{4}-/);

    // Restoring is the site admin's: the manager is refused, the admin reopens it.
    expect((await post("api/projects/:projectId/restore", managerToken)).status).toBe(403);
    const restored = await post("api/projects/:projectId/restore", adminToken);
    expect(restored.status).toBe(200);
    expect((await restored.json()).archivedAt).toBeNull();
    expect((await post("api/projects/:projectId/restore", adminToken)).status).toBe(409);
    const reopenedApi = await apiAnswers();
    for (const [key, open] of openApi) expect(reopenedApi.get(key)!.status, key).toBe(open.status);
    const reopenedPages = await pageAnswers();
    for (const [key, open] of openPages) expect(reopenedPages.get(key)!.status, key).toBe(open.status);

    const audit = await AuditEvent.findAll({ where: { projectId, action: ["project-archived", "project-restored"] }, order: [["id", "ASC"]] });
    expect(audit.map((event) => [event.action, event.userId])).toEqual([["project-archived", managerId], ["project-restored", adminId]]);
  }, 120_000);
});
