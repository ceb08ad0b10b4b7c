import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getOptionalUser } from "~/lib/auth/access.server";
import { createApiToken } from "~/lib/auth/api-token.server";
import { currentSignInSession } from "~/lib/auth/session.server";
import { ACCOUNT_DISABLED_MESSAGE, SignInError, authenticator } from "~/lib/auth/sign-in.server";
import { AuditEvent, SignInSession, User } from "~/lib/db.server";
import * as usersApi from "~/routes/api.admin.users";
import * as userApi from "~/routes/api.admin.users.$userId";
import * as accountsPage from "~/routes/admin.users";
import { PasswordReset } from "~/lib/db.server";
import { ORIGIN, TEST_PASSWORD, addMember, makeProject, makeUser, requestAs, thrown } from "./helpers";

// The site admin's account management against the real database: disabling ends the account's
// sessions and API tokens at once and refuses sign-in; re-enabling restores sign-in only.

afterAll(closeSequelize);

let admin: Awaited<ReturnType<typeof makeUser>>;
let adminToken: string;
let plainToken: string;

beforeAll(async () => {
  admin = await makeUser("accounts-admin", { isSiteAdmin: true });
  adminToken = (await createApiToken(admin, "tests")).token;
  const plain = await makeUser("accounts-plain");
  plainToken = (await createApiToken(plain, "tests")).token;
});

function patch(token: string, userId: number | string, body: unknown): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/admin/users/${userId}`, {
    method: "PATCH",
    headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" },
    body: JSON.stringify(body),
  });
  return userApi.action({ request, params: { userId: String(userId) }, context: {} } as never);
}

function list(token: string, query = ""): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/admin/users${query}`, { headers: { Authorization: `Bearer ${token}` } });
  return usersApi.loader({ request, params: {}, context: {} } as never);
}

async function signInWithPassword(email: string, password = TEST_PASSWORD): Promise<unknown> {
  const request = new Request(`${ORIGIN}/login`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email, password }),
  });
  try {
    return await authenticator.authenticate("form", request);
  } catch (error) {
    return error;
  }
}

async function bearerUser(token: string) {
  return getOptionalUser(new Request(`${ORIGIN}/api/admin/users`, { headers: { Authorization: `Bearer ${token}` } }));
}

describe("disabling an account", () => {
  it("ends its sessions and stops its API token at once, refuses sign-in; re-enabling restores sign-in only", async () => {
    const diver = await makeUser("accounts-diver");
    const token = (await createApiToken(diver, "field tablet")).token;
    const browser = await requestAs(diver.id, "/projects");
    // Before: the session, the token and the password all work (practice: the baseline that makes the test able to fail).
    expect((await currentSignInSession(browser))?.userId).toBe(diver.id);
    expect((await bearerUser(token))?.id).toBe(diver.id);
    expect(await signInWithPassword(diver.email)).toMatchObject({ id: diver.id });

    const response = await patch(adminToken, diver.id, { disabled: true });
    expect(response.status).toBe(200);
    const body = (await response.json()) as { user: { id: number; disabledAt: string | null } };
    expect(body.user.id).toBe(diver.id);
    expect(body.user.disabledAt).not.toBeNull();

    // Memory: every session of the account ends (the strategy alone makes no session row).
    expect(await currentSignInSession(browser)).toBeNull();
    expect(await getOptionalUser(browser)).toBeNull();
    const open = await SignInSession.count({ where: { userId: diver.id, endedAt: null } });
    expect(open).toBe(0);
    const ended = await SignInSession.findAll({ where: { userId: diver.id } });
    expect(ended.every((row) => row.endedReason === "account-disabled")).toBe(true);
    expect(await bearerUser(token)).toBeNull();

    const refused = await signInWithPassword(diver.email);
    expect(refused).toBeInstanceOf(SignInError);
    expect((refused as SignInError).message).toBe(ACCOUNT_DISABLED_MESSAGE);
    // A wrong password on a disabled account says only that the password is wrong.
    expect((await signInWithPassword(diver.email, "not-the-password")) as SignInError).toMatchObject({ field: "password" });

    const stored = await User.findByPk(diver.id);
    expect(stored?.disabledById).toBe(admin.id);

    expect((await patch(adminToken, diver.id, { disabled: false })).status).toBe(200);
    expect(await signInWithPassword(diver.email)).toMatchObject({ id: diver.id });
    // The old session stays ended; the token works again (it was never revoked).
    expect(await currentSignInSession(browser)).toBeNull();
    expect((await bearerUser(token))?.id).toBe(diver.id);

    const actions = (await AuditEvent.findAll({ where: { userId: admin.id }, order: [["id", "ASC"]] }))
      .filter((event) => (event.detail as { accountId?: number }).accountId === diver.id)
      .map((event) => event.action);
    expect(actions).toEqual(["account-disabled", "account-enabled"]);
  });

  it("a site admin cannot disable themself (422), and stays signed in", async () => {
    const response = await patch(adminToken, admin.id, { disabled: true });
    expect(response.status).toBe(422);
    const body = (await response.json()) as { errors: Array<{ field?: string }> };
    expect(body.errors[0].field).toBe("disabled");
    expect((await User.findByPk(admin.id))?.disabledAt).toBeNull();
    expect((await bearerUser(adminToken))?.id).toBe(admin.id);
  });
});

describe("the accounts API", () => {
  it("lists accounts with their memberships, searchable by name or e-mail", async () => {
    const member = await makeUser("accounts-member");
    const project = await makeProject("accounts");
    await addMember(member.id, project.id, "surveyor");
    const response = await list(adminToken, `?q=${encodeURIComponent(member.email)}`);
    expect(response.status).toBe(200);
    const { users } = (await response.json()) as { users: Array<{ id: number; memberships: Array<{ projectName: string; role: string }> }> };
    expect(users.map((user) => user.id)).toEqual([member.id]);
    expect(users[0].memberships).toEqual([{ projectId: project.id, projectName: project.name, role: "surveyor" }]);
    // A LIKE wildcard in the search is a literal character: "%" matches no account's name or e-mail.
    expect(((await (await list(adminToken, "?q=%25")).json()) as { users: unknown[] }).users).toEqual([]);
  });

  it("allows and stops project creation", async () => {
    const someone = await makeUser("accounts-creator");
    expect(((await (await patch(adminToken, someone.id, { mayCreateProjects: true })).json()) as { user: { mayCreateProjects: boolean } }).user.mayCreateProjects).toBe(true);
    expect((await User.findByPk(someone.id))?.mayCreateProjects).toBe(true);
    await patch(adminToken, someone.id, { mayCreateProjects: false });
    expect((await User.findByPk(someone.id))?.mayCreateProjects).toBe(false);
  });

  it("refuses anyone but a site admin (403), an unknown id (404) and bad fields (422)", async () => {
    const target = await makeUser("accounts-target");
    expect((await list(plainToken)).status).toBe(403);
    expect((await patch(plainToken, target.id, { disabled: true })).status).toBe(403);
    expect((await User.findByPk(target.id))?.disabledAt).toBeNull();
    expect((await patch(adminToken, 999_999_999, { disabled: true })).status).toBe(404);
    expect((await patch(adminToken, "01", { disabled: true })).status).toBe(404);
    expect((await patch(adminToken, target.id, { disabled: "yes" })).status).toBe(422);
    expect((await patch(adminToken, target.id, { isSiteAdmin: true })).status).toBe(422);
    expect((await patch(adminToken, target.id, {})).status).toBe(422);
    expect((await User.findByPk(target.id))?.isSiteAdmin).toBe(false);
  });
});

describe("the accounts page", () => {
  async function post(userId: number, form: Record<string, string>) {
    const request = await requestAs(userId, "/admin/users", { method: "POST", body: new URLSearchParams(form), headers: { Origin: ORIGIN, "Content-Type": "application/x-www-form-urlencoded" } });
    return accountsPage.action({ request, params: {}, context: {} } as never);
  }

  it("is refused to anyone but a site admin (403), page and form alike", async () => {
    const member = await makeUser("accounts-page-member");
    const target = await makeUser("accounts-page-target");
    const denied = (await thrown(async () => accountsPage.loader({ request: await requestAs(member.id, "/admin/users"), params: {}, context: {} } as never))) as Response;
    expect(denied.status).toBe(403);
    const refused = (await thrown(() => post(member.id, { intent: "disable", userId: String(target.id) }))) as Response;
    expect(refused.status).toBe(403);
    expect((await User.findByPk(target.id))?.disabledAt).toBeNull();
  });

  it("creates an account with no known password and a reset link for it; an address that has an account is refused", async () => {
    const email = `created-${Date.now().toString(36)}@example.org`;
    const before = await PasswordReset.count();
    const answer = await post(admin.id, { intent: "create", name: "New Diver", email });
    expect((answer as { notice?: string }).notice).toContain(email);
    const created = await User.findOne({ where: { email } });
    expect(created?.name).toBe("New Diver");
    expect(await PasswordReset.count()).toBe(before + 1);
    // No password is known before the link is used.
    expect(await signInWithPassword(email, TEST_PASSWORD)).toBeInstanceOf(SignInError);
    // The same address again is refused, beside the e-mail field.
    const again = (await post(admin.id, { intent: "create", name: "Twice", email })) as unknown as { data: { errors: Record<string, string> } };
    expect(again.data.errors.email).toContain("already has an account");
    expect(await User.count({ where: { email } })).toBe(1);
  });

  it("sends an account a reset link, audited as the admin's", async () => {
    const someone = await makeUser("accounts-reset");
    await post(admin.id, { intent: "send-reset", userId: String(someone.id) });
    const reset = await PasswordReset.findOne({ where: { userId: someone.id } });
    expect(reset).not.toBeNull();
    const audit = await AuditEvent.findAll({ where: { userId: admin.id, action: "account-password-reset-sent" } });
    expect(audit.some((event) => (event.detail as { accountId?: number }).accountId === someone.id)).toBe(true);
  });
});
