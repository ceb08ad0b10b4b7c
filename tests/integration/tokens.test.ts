import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { Invitation, Membership, PasswordReset, User } from "~/lib/db.server";
import { verifyPassword } from "~/lib/auth/password.server";
import { hashLinkToken } from "~/lib/auth/tokens.server";
import { ConflictError } from "~/lib/errors";
import { INVITATION_LIFETIME_MS, acceptInvitation, createInvitation, lookUpInvitation } from "~/models/invitation.server";
import { PASSWORD_RESET_LIFETIME_MS, RESET_MAIL_PAUSE_MS, lookUpPasswordReset, requestPasswordReset, resetPassword } from "~/models/password-reset.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { ORIGIN, TEST_PASSWORD, addMember, makeProject, makeUser, uniqueEmail } from "./helpers";

afterAll(closeSequelize);

let project: ProjectView;
let manager: UserView;

beforeAll(async () => {
  project = await makeProject("tokens");
  manager = await makeUser("tokens-manager");
  await addMember(manager.id, project.id, "manager");
});

describe("invitation links", () => {
  it("stores only the token's hash and works exactly once", async () => {
    const email = uniqueEmail("invitee");
    const created = await createInvitation(project, manager, { email, role: "surveyor" }, ORIGIN, "direct");
    const stored = await Invitation.findOne({ where: { email } });
    expect(stored!.tokenHash).toBe(hashLinkToken(created.token));
    expect(stored!.tokenHash).not.toContain(created.token);

    expect(await lookUpInvitation(created.token)).toMatchObject({ status: "open", invitation: { email, role: "surveyor", hasAccount: false } });
    const accepted = await acceptInvitation(created.token, { name: "Nell Invitee", password: "a-long-password" }, "direct");
    expect(accepted).toMatchObject({ ok: true, projectId: project.id });
    const user = await User.findOne({ where: { email } });
    expect(await verifyPassword("a-long-password", user!.passwordHash)).toBe(true);
    expect((await Membership.findOne({ where: { userId: user!.id, projectId: project.id } }))!.role).toBe("surveyor");

    expect(await lookUpInvitation(created.token)).toEqual({ status: "used" });
    expect(await acceptInvitation(created.token, { name: "Again", password: "another-password" }, "direct")).toEqual({ ok: false, reason: "used" });
  });

  it("expires after its lifetime", async () => {
    const email = uniqueEmail("late");
    const sentAt = new Date();
    const created = await createInvitation(project, manager, { email, role: "viewer" }, ORIGIN, "direct", sentAt);
    const afterExpiry = new Date(sentAt.getTime() + INVITATION_LIFETIME_MS + 1_000);
    expect(await lookUpInvitation(created.token, afterExpiry)).toEqual({ status: "expired" });
    expect(await acceptInvitation(created.token, { name: "Late", password: "a-long-password" }, "direct", afterExpiry)).toEqual({ ok: false, reason: "expired" });
    expect(await User.count({ where: { email } })).toBe(0);
  });

  it("revokes the older link when someone is invited again", async () => {
    const email = uniqueEmail("twice");
    const first = await createInvitation(project, manager, { email, role: "viewer" }, ORIGIN, "direct");
    const second = await createInvitation(project, manager, { email, role: "outreach" }, ORIGIN, "direct");
    expect(await lookUpInvitation(first.token)).toEqual({ status: "used" });
    expect(await lookUpInvitation(second.token)).toMatchObject({ status: "open", invitation: { role: "outreach" } });
  });

  it("refuses to invite someone who is already a member", async () => {
    const member = await makeUser("already");
    await addMember(member.id, project.id, "viewer");
    await expect(createInvitation(project, manager, { email: member.email, role: "viewer" }, ORIGIN, "direct")).rejects.toThrow(ConflictError);
  });

  it("asks an existing account for its password instead of creating one", async () => {
    const existing = await makeUser("existing");
    const created = await createInvitation(project, manager, { email: existing.email, role: "dewatering" }, ORIGIN, "direct");
    expect(await acceptInvitation(created.token, { name: "", password: "wrong-password" }, "direct")).toEqual({ ok: false, reason: "wrong-password" });
    expect(await acceptInvitation(created.token, { name: "", password: TEST_PASSWORD }, "direct")).toMatchObject({ ok: true });
  });
});

describe("password reset links", () => {
  it("works once, then every link of that user is spent", async () => {
    const user = await makeUser("reset");
    const first = await requestPasswordReset(user.email, ORIGIN, "direct");
    // At most one mail per account every RESET_MAIL_PAUSE_MS: the second is asked for after it.
    const second = await requestPasswordReset(user.email, ORIGIN, "direct", new Date(Date.now() + RESET_MAIL_PAUSE_MS + 1_000));
    expect(first && second).toBeTruthy();
    expect(await lookUpPasswordReset(second!)).toBe("open");
    expect(await resetPassword(second!, "brand-new-password", "direct")).toMatchObject({ ok: true, userId: user.id });
    const stored = await User.findByPk(user.id);
    expect(await verifyPassword("brand-new-password", stored!.passwordHash)).toBe(true);
    expect(await resetPassword(second!, "third-password!", "direct")).toEqual({ ok: false, reason: "used" });
    expect(await lookUpPasswordReset(first!)).toBe("used");
  });

  it("expires after one hour", async () => {
    const user = await makeUser("reset-late");
    const askedAt = new Date();
    const token = await requestPasswordReset(user.email, ORIGIN, "direct", askedAt);
    const later = new Date(askedAt.getTime() + PASSWORD_RESET_LIFETIME_MS + 1_000);
    expect(await lookUpPasswordReset(token!, later)).toBe("expired");
    expect(await resetPassword(token!, "brand-new-password", "direct", later)).toEqual({ ok: false, reason: "expired" });
  });

  it("sends nothing and stores nothing for an address without an account", async () => {
    const before = await PasswordReset.count();
    expect(await requestPasswordReset(uniqueEmail("nobody"), ORIGIN, "direct")).toBeNull();
    expect(await PasswordReset.count()).toBe(before);
  });
});
