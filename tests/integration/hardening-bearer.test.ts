import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getOptionalUser, requireUser } from "~/lib/auth/access.server";
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
