import type { Transaction } from "sequelize";
import { endSessions } from "~/lib/auth/session.server";
import { Membership, PasswordReset, User, getSequelize } from "~/lib/db.server";
import { sendMail } from "~/lib/mail/mail.server";
import { hashPassword } from "~/lib/auth/password.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { normaliseEmail } from "~/lib/auth/users.server";

export const PASSWORD_RESET_LIFETIME_MS = 60 * 60 * 1000;

/**
 * Sends a reset link when the address has an account. The caller says the same thing either
 * way, so the form does not reveal who has an account. Returns the token for tests.
 */
export async function requestPasswordReset(emailInput: string, origin: string, ip: string, now = new Date()): Promise<string | null> {
  const email = normaliseEmail(emailInput);
  const user = await User.findOne({ where: { email } });
  if (!user) return null;
  const { token, tokenHash } = createLinkToken();
  const expiresAt = new Date(now.getTime() + PASSWORD_RESET_LIFETIME_MS);
  await PasswordReset.create({ userId: user.id, tokenHash, expiresAt });
  await recordAudit({ action: AUDIT_ACTIONS.passwordResetRequested, userId: user.id, ip, detail: {} });
  await sendMail({
    to: email,
    subject: "Reset your Firmsand password",
    text: [
      `Someone (we hope you) asked to reset the password of ${email} on Firmsand.`,
      "",
      `Open this link to choose a new password: ${origin}/reset-password/${token}`,
      "",
      "The link works once and expires in one hour. If you did not ask for it, ignore this message.",
    ].join("\n"),
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
