import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { configuredRoutes } from "../configured-routes";
import { FORM_LIMIT_BYTES } from "~/lib/http/body.server";
import { SHORELINE_MAX_BYTES } from "~/models/shoreline-geojson";
import { WORK_LIMIT_MAX_BYTES } from "../../shared/grid/work-limit-geojson";
import { User } from "~/lib/db.server";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// Every page route that takes a POST reads its body within a limit suited to it: a declared
// Content-Length over the limit is refused before a byte is read, and a chunked body is cut off
// at the limit, so no request can make the app hold more than that (a 100 MB form to /login used
// to take the app from 395 to 802 MB). Each action is called with a counting body, and the count
// of bytes pulled from it is the memory bound checked here.

afterAll(closeSequelize);

type Handler = (args: never) => Promise<unknown>;
interface PageRoute {
  route: string;
  /** The URL path and params with this test's ids. */
  url: () => string;
  params: () => Record<string, string>;
  /** Who posts: a member of the test project with this role, the site admin, or nobody. */
  as: "manager" | "site-admin" | "signed-out";
  /** The most the route reads; null when it refuses these requests before reading any body. */
  limitBytes: number | null;
  /** A route with its own larger limit (the survey upload) gets only the declared-length check. */
  declaredOnly?: boolean;
  /** What the route reads, when not a url-encoded form. */
  contentType?: string;
}

const FIELDS_ALLOWANCE = 64 * 1024;
// The default UPLOAD_MAX_BYTES (app/lib/settings/env.server.ts) and the 1 MB the upload allows for its other fields.
const UPLOAD_LIMIT_BYTES = 200 * 1024 * 1024 + 1024 * 1024;
const MULTIPART = "multipart/form-data; boundary=firmsand-test";
let projectId: number;
let managerId: number;
let adminId: number;
const project = () => ({ projectId: String(projectId) });
const base = () => `/projects/${projectId}`;

// Written by hand, one row per page route file with an action; the last test checks the list
// against app/routes.ts, so a new form cannot skip its limit unnoticed.
const ROUTES: PageRoute[] = [
  { route: "account", url: () => "/account", params: () => ({}), as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "admin/users", url: () => "/admin/users", params: () => ({}), as: "site-admin", limitBytes: FORM_LIMIT_BYTES },
  // An unknown countersign link still reads its form (the typed name is checked first), within the page limit.
  { route: "countersign/:token", url: () => "/countersign/no-such-link", params: () => ({ token: "no-such-link" }), as: "signed-out", limitBytes: FORM_LIMIT_BYTES },
  { route: "forgot-password", url: () => "/forgot-password", params: () => ({}), as: "signed-out", limitBytes: FORM_LIMIT_BYTES },
  // An unknown invitation is refused (410) before its form is read.
  { route: "invite/:token", url: () => "/invite/no-such-invitation", params: () => ({ token: "no-such-invitation" }), as: "signed-out", limitBytes: null },
  { route: "login", url: () => "/login", params: () => ({}), as: "signed-out", limitBytes: FORM_LIMIT_BYTES },
  // Signing out reads no body at all.
  { route: "logout", url: () => "/logout", params: () => ({}), as: "manager", limitBytes: null },
  { route: "projects", url: () => "/projects", params: () => ({}), as: "site-admin", limitBytes: WORK_LIMIT_MAX_BYTES + FIELDS_ALLOWANCE },
  // Archiving reads its (empty) form within the page limit, so an oversized body is refused before anything changes.
  { route: "projects/:projectId/archive", url: () => `${base()}/archive`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/dewatering", url: () => `${base()}/dewatering`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/dewatering/hauls", url: () => `${base()}/dewatering/hauls`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  // Its multipart form (the test and its photo) stages the photo under PHOTO_MAX_BYTES, as the finds' photo form does.
  { route: "projects/:projectId/dewatering/jar-tests", url: () => `${base()}/dewatering/jar-tests`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/dewatering/samples", url: () => `${base()}/dewatering/samples`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/dewatering/tubes", url: () => `${base()}/dewatering/tubes`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/finds/:findId", url: () => `${base()}/finds/999999`, params: () => ({ ...project(), findId: "999999" }), as: "manager", limitBytes: FORM_LIMIT_BYTES },
  // The same page's form for a handover's signed-form photo (`?custody=`) stages the photo under PHOTO_MAX_BYTES (and 1 MB for its other fields).
  { route: "projects/:projectId/finds/:findId", url: () => `${base()}/finds/999999?custody=1`, params: () => ({ ...project(), findId: "999999" }), as: "manager", limitBytes: PHOTO_MAX_BYTES + 1024 * 1024, declaredOnly: true, contentType: MULTIPART },
  { route: "projects/:projectId/finds/basket", url: () => `${base()}/finds/basket`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/finds/new", url: () => `${base()}/finds/new`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/days", url: () => `${base()}/days`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/days/:date", url: () => `${base()}/days/2031-05-06`, params: () => ({ ...project(), date: "2031-05-06" }), as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/holds", url: () => `${base()}/holds`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/map", url: () => `${base()}/map`, params: project, as: "manager", limitBytes: SHORELINE_MAX_BYTES + FIELDS_ALLOWANCE },
  { route: "projects/:projectId/members", url: () => `${base()}/members`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/plans/:date", url: () => `${base()}/plans/2031-05-06`, params: () => ({ ...project(), date: "2031-05-06" }), as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/quantities", url: () => `${base()}/quantities`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/settings", url: () => `${base()}/settings`, params: project, as: "manager", limitBytes: WORK_LIMIT_MAX_BYTES + FIELDS_ALLOWANCE },
  // Restoring an open project is refused (409) before its form is read.
  { route: "projects/:projectId/restore", url: () => `${base()}/restore`, params: project, as: "site-admin", limitBytes: null },
  { route: "projects/:projectId/share", url: () => `${base()}/share`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/surveys/:surveyId", url: () => `${base()}/surveys/999999`, params: () => ({ ...project(), surveyId: "999999" }), as: "manager", limitBytes: FORM_LIMIT_BYTES },
  // An unknown import job is refused (404) before its form is read.
  { route: "projects/:projectId/surveys/imports/:jobId", url: () => `${base()}/surveys/imports/999999`, params: () => ({ ...project(), jobId: "999999" }), as: "manager", limitBytes: null },
  // Survey files stream to disk under UPLOAD_MAX_BYTES (200 MB by default; the import tests cut a chunked one off).
  { route: "projects/:projectId/surveys/new", url: () => `${base()}/surveys/new`, params: project, as: "manager", limitBytes: UPLOAD_LIMIT_BYTES, declaredOnly: true, contentType: MULTIPART },
  { route: "projects/:projectId/surveys/upload", url: () => `${base()}/surveys/upload`, params: project, as: "manager", limitBytes: UPLOAD_LIMIT_BYTES, declaredOnly: true, contentType: MULTIPART },
  { route: "projects/:projectId/teams", url: () => `${base()}/teams`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/water-quality", url: () => `${base()}/water-quality`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "projects/:projectId/water-quality/setup", url: () => `${base()}/water-quality/setup`, params: project, as: "manager", limitBytes: FORM_LIMIT_BYTES },
  { route: "reset-password/:token", url: () => "/reset-password/no-such-token", params: () => ({ token: "no-such-token" }), as: "signed-out", limitBytes: FORM_LIMIT_BYTES },
];

const CHUNK_BYTES = 64 * 1024;
const CHUNKED_TOTAL_BYTES = 20 * 1024 * 1024;

/**
 * A body of `totalBytes` sent in chunks with no Content-Length, counting what the reader pulled.
 * Past `gateBytes` it sends nothing more until `open()`: a route that waited for the whole body
 * before answering would never answer.
 */
function countingBody(totalBytes: number, gateBytes = Number.POSITIVE_INFINITY) {
  const chunk = new Uint8Array(CHUNK_BYTES).fill(0x61); // "aaaa…": one long form field name
  let pulled = 0;
  let open!: () => void;
  const opened = new Promise<void>((resolve) => (open = resolve));
  let ended!: () => void;
  const finished = new Promise<void>((resolve) => (ended = resolve));
  const stream = new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        if (pulled >= gateBytes) await opened;
        if (pulled >= totalBytes) {
          controller.close();
          return ended();
        }
        controller.enqueue(chunk);
        pulled += CHUNK_BYTES;
      },
      cancel: () => ended(),
    },
    { highWaterMark: 0 }, // pulled only when read, so the count is what the route read
  );
  return { stream, pulled: () => pulled, open, finished };
}

/** The HTTP status of what an action returned or threw (a Response, data() with an init, or plain data: 200). */
function statusOf(answer: unknown): number {
  if (answer instanceof Response) return answer.status;
  const init = (answer as { init?: { status?: number } } | null)?.init;
  return init?.status ?? 200;
}

async function answer(handler: Handler, args: unknown): Promise<number> {
  try {
    return statusOf(await handler(args as never));
  } catch (error) {
    if (error instanceof Error) throw error; // a fault, not an answer
    return statusOf(error);
  }
}

async function requestFor(route: PageRoute, init: RequestInit): Promise<Request> {
  const userId = route.as === "manager" ? managerId : route.as === "site-admin" ? adminId : null;
  const headers = new Headers(init.headers);
  headers.set("Content-Type", route.contentType ?? "application/x-www-form-urlencoded");
  headers.set("Origin", ORIGIN);
  return requestAs(userId, route.url(), { ...init, method: "POST", headers });
}

async function moduleOf(file: string): Promise<{ action?: Handler }> {
  return import(/* @vite-ignore */ `../../app/${file}`);
}

const fileOf = (route: string) => configuredRoutes().find((entry) => entry.path === route)!.file;

beforeAll(async () => {
  const made = await makeProject("form-limits");
  projectId = made.id;
  managerId = (await makeUser("form-limits-manager")).id;
  await addMember(managerId, projectId, "manager");
  adminId = (await makeUser("form-limits-admin", { isSiteAdmin: true })).id;
  await User.update({ mayCreateProjects: true }, { where: { id: managerId } });
});

describe("page forms read their bodies within a limit", () => {
  for (const route of ROUTES) {
    const limit = route.limitBytes;
    it(`POST /${route.route}${route.contentType === MULTIPART ? " (multipart)" : ""}: a declared length over ${limit === null ? "nothing" : `${limit} bytes`} is refused before reading`, async () => {
      const { action } = await moduleOf(fileOf(route.route));
      const body = countingBody(CHUNK_BYTES);
      const request = await requestFor(route, { body: body.stream, duplex: "half", headers: { "Content-Length": String((limit ?? FORM_LIMIT_BYTES) + 1) } } as RequestInit);
      const status = await answer(action!, { request, params: route.params(), context: {} });
      expect(body.pulled(), "bytes pulled from the body").toBe(0);
      if (limit !== null) expect(status).toBe(413);
      else expect(status).toBeGreaterThanOrEqual(300);
    });
    if (route.declaredOnly) continue;
    it(`POST /${route.route}${route.contentType === MULTIPART ? " (multipart)" : ""}: a chunked body is cut off at the limit, the rest dropped unread`, async () => {
      const { action } = await moduleOf(fileOf(route.route));
      const gate = (limit ?? 0) + 4 * CHUNK_BYTES;
      const body = countingBody(CHUNKED_TOTAL_BYTES, gate);
      const request = await requestFor(route, { body: body.stream, duplex: "half" } as RequestInit);
      const status = await answer(action!, { request, params: route.params(), context: {} });
      if (limit === null) {
        expect(body.pulled(), "bytes pulled from the body").toBe(0);
        expect(status).toBeGreaterThanOrEqual(300);
        return;
      }
      // The answer came while the sender was still held at the gate, so nothing past it was needed.
      expect(status).toBe(413);
      expect(body.pulled(), "bytes read when the route answered").toBeLessThanOrEqual(gate);
      // Then the rest is read and dropped, so a real client gets its 413 instead of a reset connection.
      body.open();
      await body.finished;
      expect(body.pulled()).toBe(CHUNKED_TOTAL_BYTES);
    });
  }

  it("a form within the limit still reaches the route (negative control)", async () => {
    const { action } = await moduleOf(fileOf("login"));
    const request = await requestFor(ROUTES.find((route) => route.route === "login")!, { body: "email=nobody%40example.org&password=wrong-password-1" });
    expect(await answer(action!, { request, params: {}, context: {} })).toBe(400);
  });

  it("the list covers every page route file with an action, and only those", async () => {
    const withAction: string[] = [];
    for (const { path, file } of configuredRoutes().filter((entry) => !entry.path.startsWith("api/") && entry.path !== "api")) {
      if (typeof (await moduleOf(file)).action === "function") withAction.push(path);
    }
    // A route may be listed twice (two forms with different limits); each must be listed.
    expect([...new Set(ROUTES.map((route) => route.route))].sort()).toEqual(withAction.sort());
  });
});
