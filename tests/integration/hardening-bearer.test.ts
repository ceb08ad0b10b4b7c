import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getOptionalUser, requireUser, signedInUser } from "~/lib/auth/access.server";
import { ShareLink } from "~/lib/db.server";
import { loader as progressLoader } from "~/routes/api.projects.$projectId.progress";
import { action as shareLinksAction } from "~/routes/api.projects.$projectId.share-links";
import { makeDemoSiteProject } from "./import-helpers";
import { createApiToken, listApiTokens } from "~/lib/auth/api-token.server";
import { action as accountAction } from "~/routes/account";
import { ORIGIN, makeUser, thrown } from "./helpers";

afterAll(closeSequelize);

let userId: number;
let token: string;

beforeAll(async () => {
  userId = (await makeUser("bearer-scope")).id;
  token = (await createApiToken({ id: userId }, "field laptop")).token;
});

const withBearer = (path: string, init: RequestInit = {}) =>
  new Request(`${ORIGIN}${path}`, { ...init, headers: { ...(init.headers as Record<string, string>), Authorization: `Bearer ${token}` } });

describe("hardening 5: an API token cannot mint tokens", () => {
  it("signs its holder in on /api routes", async () => {
    expect((await getOptionalUser(withBearer("/api/projects/1/surveys")))?.id).toBe(userId);
  });

  it("signs nobody in on pages, the account page included", async () => {
    for (const path of ["/account", "/projects", "/apiary", "/projects/1/map"]) expect(await getOptionalUser(withBearer(path)), path).toBeNull();
  });

  it("refuses POST /account with only a bearer token (JSON 401) and creates no token", async () => {
    const before = (await listApiTokens({ id: userId })).length;
    const form = new URLSearchParams({ intent: "create-token", tokenName: "minted by a leaked token" });
    const request = withBearer("/account", { method: "POST", body: form, headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: ORIGIN } });
    const refusal = await thrown(() => accountAction({ request, params: {}, context: {} } as never));
    expect((refusal as Response).status).toBe(401);
    expect((await (refusal as Response).json()).errors[0].message).toMatch(/\/api routes only/);
    expect((await listApiTokens({ id: userId })).length).toBe(before);
    expect(await thrown(() => requireUser(withBearer("/account")))).toBeInstanceOf(Response);
  });
});

describe("hardening 5: tokens have a scope and an optional expiry, and the list shows their last use", () => {
  const bearer = (value: string, path: string, init: RequestInit = {}) =>
    new Request(`${ORIGIN}${path}`, { ...init, headers: { ...(init.headers as Record<string, string>), Authorization: `Bearer ${value}` } });

  it("a read-only token reads but may change nothing: 403 on POST, nothing written", async () => {
    const site = await makeDemoSiteProject("bearer-read-only");
    const reader = await createApiToken({ id: site.users.manager }, "dashboard", { scope: "read-only" });
    expect(reader.view.scope).toBe("read-only");
    const read = await progressLoader({ request: bearer(reader.token, `/api/projects/${site.project.id}/progress`), params: { projectId: String(site.project.id) }, context: {} } as never);
    expect((read as Response).status).toBe(200);

    const links = await ShareLink.count({ where: { projectId: site.project.id } });
    const write = await shareLinksAction({
      request: bearer(reader.token, `/api/projects/${site.project.id}/share-links`, { method: "POST", body: JSON.stringify({ name: "from a read-only token" }), headers: { "Content-Type": "application/json" } }),
      params: { projectId: String(site.project.id) }, context: {},
    } as never);
    expect((write as Response).status).toBe(403);
    expect((await (write as Response).json()).errors[0].message).toMatch(/read-only/);
    expect(await ShareLink.count({ where: { projectId: site.project.id } })).toBe(links);

    // The same request with a read-write token of the same manager goes through (negative control).
    const writer = await createApiToken({ id: site.users.manager }, "script");
    const allowed = await shareLinksAction({
      request: bearer(writer.token, `/api/projects/${site.project.id}/share-links`, { method: "POST", body: JSON.stringify({ name: "from a read-write token" }), headers: { "Content-Type": "application/json" } }),
      params: { projectId: String(site.project.id) }, context: {},
    } as never);
    expect((allowed as Response).status).toBe(201);
  });

  it("an expired token signs nobody in and says it expired; one within its days does", async () => {
    const owner = await makeUser("bearer-expiry");
    const created = new Date(Date.now() - 31 * 24 * 3600_000);
    const old = await createApiToken(owner, "last month's script", { expiresInDays: 30 }, created);
    const fresh = await createApiToken(owner, "this month's script", { expiresInDays: 30 });
    expect(await getOptionalUser(bearer(old.token, "/api/projects"))).toBeNull();
    const refusal = await thrown(() => signedInUser(bearer(old.token, "/api/projects")));
    expect((refusal as Error).message).toMatch(/expired/);
    expect((await getOptionalUser(bearer(fresh.token, "/api/projects")))?.id).toBe(owner.id);
  });

  it("records when a token was last used", async () => {
    const owner = await makeUser("bearer-last-use");
    const { token: value, view } = await createApiToken(owner, "uploader");
    expect(view.lastUsedAt).toBeNull();
    await getOptionalUser(bearer(value, "/api/projects"));
    // The write is not awaited by the request: wait for it.
    await expect.poll(async () => (await listApiTokens(owner)).find((row) => row.id === view.id)?.lastUsedAt).not.toBeNull();
  });
});
