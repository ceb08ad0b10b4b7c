import { afterAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getOptionalUser } from "~/lib/auth/access.server";
import { currentSignInSession, endSessions, listSessions, signOut } from "~/lib/auth/session.server";
import { changeOwnPassword } from "~/lib/auth/users.server";
import { SignInSession } from "~/lib/db.server";
import { requestPasswordReset, resetPassword } from "~/models/password-reset.server";
import { ORIGIN, TEST_PASSWORD, makeUser, requestAs } from "./helpers";

// Hardening 3: a session is a server-side record, so it can really end. Each case failed when the
// cookie held a signed user id that the server checked against nothing.

afterAll(closeSequelize);

const signedInAs = async (userId: number) => (await getOptionalUser(await requestAs(userId, "/projects")))?.id ?? null;

describe("hardening 3: sessions that really end", () => {
  it("signing out ends that session: the same cookie no longer signs anyone in", async () => {
    const user = await makeUser("session-out");
    const request = await requestAs(user.id, "/projects");
    expect((await getOptionalUser(request))?.id).toBe(user.id);
    await signOut(request);
    expect(await getOptionalUser(request)).toBeNull();
  });

  it("a password change ends the user's other sessions and keeps the one that made it", async () => {
    const user = await makeUser("session-change");
    const here = await requestAs(user.id, "/account");
    const elsewhere = await requestAs(user.id, "/projects");
    const current = await currentSignInSession(here);
    expect(await changeOwnPassword(user, TEST_PASSWORD, "a-new-long-password", current!.id)).toBe("changed");
    expect((await getOptionalUser(here))?.id).toBe(user.id);
    expect(await getOptionalUser(elsewhere)).toBeNull();
  });

  it("a password reset ends every session of the account", async () => {
    const user = await makeUser("session-reset");
    const phone = await requestAs(user.id, "/projects");
    const laptop = await requestAs(user.id, "/projects");
    const token = await requestPasswordReset(user.email, ORIGIN, "direct");
    expect(await resetPassword(token!, "reset-long-password", "direct")).toMatchObject({ ok: true });
    expect(await getOptionalUser(phone)).toBeNull();
    expect(await getOptionalUser(laptop)).toBeNull();
  });

  it("a session unused longer than SESSION_IDLE_HOURS (12 by default), or past its absolute end, signs nobody in", async () => {
    const user = await makeUser("session-idle");
    const idle = await requestAs(user.id, "/projects");
    const old = await requestAs(user.id, "/projects");
    const idleRow = await currentSignInSession(idle);
    const oldRow = await currentSignInSession(old);
    await SignInSession.update({ lastSeenAt: new Date(Date.now() - 13 * 3600_000) }, { where: { id: idleRow!.id } });
    await SignInSession.update({ expiresAt: new Date(Date.now() - 1_000) }, { where: { id: oldRow!.id } });
    expect(await getOptionalUser(idle)).toBeNull();
    expect(await getOptionalUser(old)).toBeNull();
    expect(await signedInAs(user.id)).toBe(user.id); // a fresh sign-in still works
  });

  it("lists the live sessions with this one marked, and 'sign out everywhere else' ends the others", async () => {
    const user = await makeUser("session-list");
    const here = await requestAs(user.id, "/account");
    const elsewhere = await requestAs(user.id, "/projects");
    const listed = await listSessions(user.id, here);
    expect(listed).toHaveLength(2);
    expect(listed.filter((session) => session.current)).toHaveLength(1);
    expect(await endSessions(user.id, "signed-out-elsewhere", { except: (await currentSignInSession(here))!.id })).toBe(1);
    expect(await getOptionalUser(elsewhere)).toBeNull();
    expect((await getOptionalUser(here))?.id).toBe(user.id);
    expect(await listSessions(user.id, here)).toHaveLength(1);
  });

  it("keeps only the token's hash on the server", async () => {
    const user = await makeUser("session-hash");
    const request = await requestAs(user.id, "/projects");
    const row = await currentSignInSession(request);
    expect(row!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(request.headers.get("Cookie")).not.toContain(row!.tokenHash);
  });
});
