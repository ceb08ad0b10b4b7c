import { Op, type Transaction } from "sequelize";
import { endSessions } from "~/lib/auth/session.server";
import { Membership, PasswordReset, ResetRequest, User, getSequelize } from "~/lib/db.server";
import { TooManyRequestsError } from "~/lib/errors";
import { queueMail } from "~/lib/mail/outbox.server";
import { hashPassword } from "~/lib/auth/password.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { normaliseEmail } from "~/lib/auth/users.server";

export const PASSWORD_RESET_LIFETIME_MS = 60 * 60 * 1000;

/**
 * "Forgot password" requests are limited two ways, kept in the database so the limits hold across
 * requests and processes:
 * - per client address, over a sliding window: beyond the limit the client is told to wait (429),
 *   whatever address it typed;
 * - per e-mail address: at most one mail every few minutes, silently, so the answer never reveals
 *   which addresses have accounts (an address without one gets no mail in any case).
 */
export const RESET_WINDOW_MS = 15 * 60 * 1000;
export const MAX_RESET_REQUESTS_PER_CLIENT = 10;
export const RESET_MAIL_PAUSE_MS = 5 * 60 * 1000;

/**
 * Queues a reset link when the address has an account and no limit holds it back. Both paths do
 * the same reads and one write, and neither waits for the mail server (the outbox sends after
 * the answer), so neither the answer nor its timing tells who has an account. Returns the token
 * for tests. `byAdmin`: a site admin's "send reset link", which no limit holds back.
 */
export async function requestPasswordReset(emailInput: string, origin: string, ip: string, now = new Date(), options: { byAdmin?: boolean } = {}): Promise<string | null> {
  const email = normaliseEmail(emailInput);
  if (!options.byAdmin) {
    const since = new Date(now.getTime() - RESET_WINDOW_MS);
    const fromClient = await ResetRequest.count({ where: { ip, createdAt: { [Op.gt]: since } } });
    if (fromClient >= MAX_RESET_REQUESTS_PER_CLIENT) {
      throw new TooManyRequestsError("Too many reset requests from your network address. Try again in 15 minutes.");
    }
    await ResetRequest.create({ email, ip, createdAt: now });
  }
  const user = await User.findOne({ where: { email } });
  if (!user) return null;
  if (!options.byAdmin) {
    const recent = await PasswordReset.count({ where: { userId: user.id, createdAt: { [Op.gt]: new Date(now.getTime() - RESET_MAIL_PAUSE_MS) } } });
    if (recent > 0) return null;
  }
  const { token, tokenHash } = createLinkToken();
  const expiresAt = new Date(now.getTime() + PASSWORD_RESET_LIFETIME_MS);
  await getSequelize().transaction(async (transaction) => {
    await PasswordReset.create({ userId: user.id, tokenHash, expiresAt, createdAt: now }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.passwordResetRequested, userId: user.id, ip, detail: {} }, transaction);
    await queueMail({
      to: email,
      subject: "Reset your Firmsand password",
      text: [
        `Someone (we hope you) asked to reset the password of ${email} on Firmsand.`,
        "",
        `Open this link to choose a new password: ${origin}/reset-password/${token}`,
        "",
        "The link works once and expires in one hour. If you did not ask for it, ignore this message.",
      ].join("\n"),
    }, transaction);
  });
  return token;
}

export type ResetLookup = "open" | "expired" | "used" | "unknown";

async function findByToken(token: string, transaction?: Transaction) {
  return PasswordReset.findOne({ where: { tokenHash: hashLinkToken(token) }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
}

function statusOf(reset: PasswordReset | null, now: Date): ResetLookup {
  if (!reset) return "unknown";
  if (reset.usedAt) return "used";
  if (reset.expiresAt.getTime() <= now.getTime()) return "expired";
  return "open";
}

export async function lookUpPasswordReset(token: string, now = new Date()): Promise<ResetLookup> {
  return statusOf(await findByToken(token), now);
}

/** Sets the new password once; every other open link of that user stops working too. */
export async function resetPassword(token: string, newPassword: string, ip: string, now = new Date()): Promise<{ ok: true; userId: number } | { ok: false; reason: Exclude<ResetLookup, "open"> }> {
  return getSequelize().transaction(async (transaction) => {
    const reset = await findByToken(token, transaction);
    const status = statusOf(reset, now);
    if (status !== "open" || !reset) return { ok: false, reason: status === "open" ? "unknown" : status };
    await User.update({ passwordHash: await hashPassword(newPassword) }, { where: { id: reset.userId }, transaction });
    await PasswordReset.update({ usedAt: now }, { where: { userId: reset.userId, usedAt: null }, transaction });
    // Whoever knew the old password may be signed in somewhere: every session ends.
    await endSessions(reset.userId, "password-reset", { transaction });
    const memberships = await Membership.findAll({ where: { userId: reset.userId }, attributes: ["projectId"], transaction });
    await recordAudit({ action: AUDIT_ACTIONS.passwordReset, userId: reset.userId, ip, detail: {} }, transaction);
    for (const { projectId } of memberships) {
      await recordAudit({ action: AUDIT_ACTIONS.passwordReset, userId: reset.userId, projectId, ip, detail: {} }, transaction);
    }
    return { ok: true, userId: reset.userId };
  });
}
