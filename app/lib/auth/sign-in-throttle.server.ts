import { Op } from "sequelize";
import { LoginAttempt } from "~/lib/db.server";

// Failed sign-ins are limited per account and per client address over a sliding window,
// kept in the database so the limit holds across requests and processes.
export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 30;

export interface SignInLockout {
  scope: "account" | "address";
  retryAfterMinutes: number;
  message: string;
}

async function lockoutFor(where: { email: string } | { ip: string }, limit: number, now: Date): Promise<number | null> {
  const failures = await LoginAttempt.findAll({
    where: { ...where, succeeded: false, createdAt: { [Op.gt]: new Date(now.getTime() - SIGN_IN_WINDOW_MS) } },
    order: [["createdAt", "DESC"]],
    limit,
    attributes: ["createdAt"],
  });
  if (failures.length < limit) return null;
  // Locked until the oldest of the last `limit` failures leaves the window.
  const oldest = failures[failures.length - 1].createdAt.getTime();
  return Math.max(1, Math.ceil((oldest + SIGN_IN_WINDOW_MS - now.getTime()) / 60_000));
}

/**
 * Whether sign-in is refused for this account or address right now, and for how long. A browser
 * where the account signed in before (`knownDevice`, app/lib/auth/known-device.server.ts) is
 * spared both locks: they hold strangers back, not the account's owner.
 */
export async function signInLockout(email: string, ip: string, now = new Date(), knownDevice = false): Promise<SignInLockout | null> {
  if (knownDevice) return null;
  const accountMinutes = await lockoutFor({ email }, MAX_FAILURES_PER_ACCOUNT, now);
  if (accountMinutes !== null) {
    return {
      scope: "account",
      retryAfterMinutes: accountMinutes,
      message: `Too many failed sign-ins for this account. Try again in ${accountMinutes} minute${accountMinutes === 1 ? "" : "s"}.`,
    };
  }
  const addressMinutes = await lockoutFor({ ip }, MAX_FAILURES_PER_ADDRESS, now);
  if (addressMinutes !== null) {
    return {
      scope: "address",
      retryAfterMinutes: addressMinutes,
      message: `Too many failed sign-ins from your network address. Try again in ${addressMinutes} minute${addressMinutes === 1 ? "" : "s"}.`,
    };
  }
  return null;
}

export async function recordLoginAttempt(email: string, ip: string, succeeded: boolean, now = new Date()): Promise<void> {
  await LoginAttempt.create({ email, ip, succeeded, createdAt: now });
}
