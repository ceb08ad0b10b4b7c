import { afterAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { MAX_FAILURES_PER_ACCOUNT } from "~/lib/auth/sign-in-throttle.server";
import { action as loginAction } from "~/routes/login";
import { action as inviteAction } from "~/routes/invite.$token";
import { createInvitation } from "~/models/invitation.server";
import { ORIGIN, TEST_PASSWORD, addMember, makeProject, makeUser } from "./helpers";

// Issue 12 ("Hardening"), item 7: five wrong passwords typed by anyone lock an account against
// strangers, but not against its owner on a browser where it signed in before; the invitation
// page's password check is throttled like sign-in.

afterAll(closeSequelize);

type Answer = { status: number; cookies: string[]; body: unknown };

/** Posts the sign-in form as a browser carrying `cookie` would, and reads the answer whether returned or thrown. */
async function postForm(handler: (args: never) => Promise<unknown>, path: string, fields: Record<string, string>, cookie = "", params: Record<string, string> = {}): Promise<Answer> {
  const request = new Request(`${ORIGIN}${path}`, { method: "POST", body: new URLSearchParams(fields), headers: { Cookie: cookie, Origin: ORIGIN } });
  let answer: unknown;
  try {
    answer = await handler({ request, params, context: {} } as never);
  } catch (thrown) {
    answer = thrown;
  }
  if (answer instanceof Response) return { status: answer.status, cookies: answer.headers.getSetCookie(), body: null };
  const init = (answer as { init?: { status?: number } }).init;
  return { status: init?.status ?? 200, cookies: [], body: (answer as { data?: unknown }).data ?? answer };
}

const deviceCookieOf = (answer: Answer) => answer.cookies.find((cookie) => cookie.startsWith("firmsand_device="))!.split(";")[0];

async function lockOut(email: string) {
  for (let attempt = 0; attempt < MAX_FAILURES_PER_ACCOUNT; attempt++) {
    const failed = await postForm(loginAction, "/login", { email, password: "not-the-password" });
    expect(failed.status).toBe(400);
  }
}

describe("hardening 7: an account lock spares the owner's known browsers", () => {
  it("after five wrong passwords a stranger is refused even with the right one, the owner's browser signs in", async () => {
    const owner = await makeUser("known-device");
    const first = await postForm(loginAction, "/login", { email: owner.email, password: TEST_PASSWORD });
    expect(first.status).toBe(302);
    const device = deviceCookieOf(first);
    expect(device, "the browser is remembered at sign-in").toBeTruthy();

    await lockOut(owner.email);
    const stranger = await postForm(loginAction, "/login", { email: owner.email, password: TEST_PASSWORD });
    expect(stranger.status).toBe(400);
    expect(JSON.stringify(stranger.body)).toMatch(/Too many failed sign-ins for this account/);

    const known = await postForm(loginAction, "/login", { email: owner.email, password: TEST_PASSWORD }, device);
    expect(known.status, "the owner's browser").toBe(302);
    // The password is still checked on a known browser.
    expect((await postForm(loginAction, "/login", { email: owner.email, password: "not-the-password" }, device)).status).toBe(400);
  });

  it("a browser known for another account, or a forged cookie, does not open the lock", async () => {
    const victim = await makeUser("known-device-victim");
    const other = await makeUser("known-device-other");
    const otherDevice = deviceCookieOf(await postForm(loginAction, "/login", { email: other.email, password: TEST_PASSWORD }));
    await lockOut(victim.email);
    expect((await postForm(loginAction, "/login", { email: victim.email, password: TEST_PASSWORD }, otherDevice)).status).toBe(400);
    const forged = `firmsand_device=${Buffer.from(JSON.stringify({ accounts: [victim.id] })).toString("base64")}`;
    expect((await postForm(loginAction, "/login", { email: victim.email, password: TEST_PASSWORD }, forged)).status).toBe(400);
  });
});

describe("hardening 7: the invitation page's password check is throttled like sign-in", () => {
  it("counts wrong passwords toward the account's lock and refuses while it holds", async () => {
    const project = await makeProject("invite-throttle");
    const manager = await makeUser("invite-throttle-manager");
    await addMember(manager.id, project.id, "manager");
    const invitee = await makeUser("invite-throttle-invitee");
    const { token } = await createInvitation(project, manager, { email: invitee.email, role: "viewer" }, ORIGIN, "direct");
    for (let attempt = 0; attempt < MAX_FAILURES_PER_ACCOUNT; attempt++) {
      expect((await postForm(inviteAction, `/invite/${token}`, { password: "not-the-password" }, "", { token })).status).toBe(400);
    }
    const locked = await postForm(inviteAction, `/invite/${token}`, { password: TEST_PASSWORD }, "", { token });
    expect(locked.status).toBe(429);
    expect(JSON.stringify(locked.body)).toMatch(/Too many failed sign-ins/);
  });
});
