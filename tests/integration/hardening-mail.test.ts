import { afterAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { Invitation, OutgoingMail, PasswordReset, getSequelize } from "~/lib/db.server";
import { TooManyRequestsError } from "~/lib/errors";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import { MAX_ATTEMPTS, deliverDue, queueMail } from "~/lib/mail/outbox.server";
import { createInvitation, invitationMailRef, listOpenInvitations } from "~/models/invitation.server";
import {
  MAX_RESET_REQUESTS_PER_CLIENT, RESET_MAIL_PAUSE_MS, RESET_WINDOW_MS, requestPasswordReset,
} from "~/models/password-reset.server";
import { ORIGIN, addMember, makeProject, makeUser, thrown, uniqueEmail } from "./helpers";

// Issue 12 ("Hardening"), items 6 and 11: mail goes through an outbox written in the record's own
// transaction and sent after the answer, and "forgot password" is limited without telling who
// has an account.

afterAll(closeSequelize);

const smtpDown = async () => {
  throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:2526"), { code: "ECONNREFUSED" });
};
const mailsTo = async (address: string) => (await listMailboxMessages()).filter((message) => message.envelopeTo.includes(address));
let clientCounter = 0;
/** A client address of its own for each test, so the per-client limit of one test never meets another's. */
const newClient = () => `198.51.100.${++clientCounter}`;

describe("hardening 11: mail is sent from an outbox, so a mail server that is down half-saves nothing", () => {
  it("an invitation made while SMTP is down is saved with its mail pending, shown as not sent yet, and sent when the server returns", async () => {
    const project = await makeProject("outbox");
    const manager = await makeUser("outbox-manager");
    await addMember(manager.id, project.id, "manager");
    const email = uniqueEmail("outbox-invitee");
    // The action succeeds without talking to the mail server at all.
    await createInvitation(project, manager, { email, role: "viewer" }, ORIGIN, "direct");
    const invitation = await Invitation.findOne({ where: { projectId: project.id, email } });
    expect(invitation, "the invitation is saved").not.toBeNull();
    const mail = await OutgoingMail.findOne({ where: { ref: invitationMailRef(invitation!.id) } });
    expect(mail?.status).toBe("pending");
    expect(mail?.bodyText).toContain(`${ORIGIN}/invite/`);

    // The mail server is down: the attempt fails, is counted, and is tried again later.
    const now = new Date();
    await deliverDue(now, smtpDown);
    await mail!.reload();
    expect(mail!.status).toBe("pending");
    expect(mail!.attempts).toBe(1);
    expect(mail!.lastError).toContain("ECONNREFUSED");
    expect(mail!.nextAttemptAt.getTime()).toBeGreaterThan(now.getTime());
    expect((await listOpenInvitations(project)).find((open) => open.email === email)?.mail).toBe("pending");
    expect(await mailsTo(email)).toHaveLength(0);

    // Not due yet: nothing is tried. Once due, with the server back, it goes out.
    expect(await deliverDue(now)).toBe(0);
    await deliverDue(new Date(mail!.nextAttemptAt.getTime() + 1_000));
    await mail!.reload();
    expect(mail!.status).toBe("sent");
    expect(await mailsTo(email)).toHaveLength(1);
    expect((await listOpenInvitations(project)).find((open) => open.email === email)?.mail).toBe("sent");
  });

  it("a record whose transaction rolls back leaves no mail behind", async () => {
    const ref = `rollback-test:${uniqueEmail("x")}`;
    await expect(
      getSequelize().transaction(async (transaction) => {
        await queueMail({ to: uniqueEmail("rollback"), subject: "never", text: "never", ref }, transaction);
        throw new Error("the record could not be saved");
      }),
    ).rejects.toThrow("could not be saved");
    expect(await OutgoingMail.count({ where: { ref } })).toBe(0);
  });

  it("gives up after the last attempt and says so", async () => {
    const ref = `give-up-test:${uniqueEmail("x")}`;
    await queueMail({ to: uniqueEmail("give-up"), subject: "s", text: "t", ref });
    const mail = (await OutgoingMail.findOne({ where: { ref } }))!;
    for (let attempt = 1; attempt <= MAX_ATTEMPTS; attempt++) {
      await deliverDue(new Date(mail.nextAttemptAt.getTime() + 1_000), smtpDown);
      await mail.reload();
    }
    expect(mail.attempts).toBe(MAX_ATTEMPTS);
    expect(mail.status).toBe("failed");
  });
});

describe("hardening 6: forgot-password tells nobody which accounts exist, and is limited", () => {
  it("answers alike for an account and a stranger, and queues the mail instead of sending it during the request", async () => {
    const user = await makeUser("forgot-known");
    const client = newClient();
    const token = await requestPasswordReset(user.email, ORIGIN, client);
    expect(token).not.toBeNull();
    expect(await requestPasswordReset(uniqueEmail("forgot-stranger"), ORIGIN, client)).toBeNull();
    // Nothing reached the mail server during the request: the mail waits in the outbox.
    expect(await mailsTo(user.email)).toHaveLength(0);
    expect(await OutgoingMail.count({ where: { toAddress: user.email, status: "pending" } })).toBe(1);
  });

  it("sends at most one mail per account every few minutes", async () => {
    const user = await makeUser("forgot-pause");
    const start = new Date();
    expect(await requestPasswordReset(user.email, ORIGIN, newClient(), start)).not.toBeNull();
    expect(await requestPasswordReset(user.email, ORIGIN, newClient(), new Date(start.getTime() + 60_000))).toBeNull();
    expect(await PasswordReset.count({ where: { userId: user.id } })).toBe(1);
    expect(await requestPasswordReset(user.email, ORIGIN, newClient(), new Date(start.getTime() + RESET_MAIL_PAUSE_MS + 1_000))).not.toBeNull();
  });

  it("tells a client that asks too often to wait (429), for known and unknown addresses alike, until the window passes", async () => {
    const client = newClient();
    for (let index = 0; index < MAX_RESET_REQUESTS_PER_CLIENT; index++) {
      await requestPasswordReset(uniqueEmail("forgot-flood"), ORIGIN, client);
    }
    const known = await makeUser("forgot-flood-known");
    expect(await thrown(() => requestPasswordReset(known.email, ORIGIN, client))).toBeInstanceOf(TooManyRequestsError);
    expect(await thrown(() => requestPasswordReset(uniqueEmail("forgot-flood"), ORIGIN, client))).toBeInstanceOf(TooManyRequestsError);
    expect(await PasswordReset.count({ where: { userId: known.id } })).toBe(0);
    // Another client is not held back; this one is again once the window has passed.
    expect(await requestPasswordReset(known.email, ORIGIN, newClient())).not.toBeNull();
    const later = new Date(Date.now() + RESET_WINDOW_MS + RESET_MAIL_PAUSE_MS + 1_000);
    expect(await requestPasswordReset(known.email, ORIGIN, client, later)).not.toBeNull();
  });
});
