import { getEnv } from "./env.server";

/**
 * The client's network address, for the sign-in rate limit and the audit log.
 * React Router's request carries no socket address, so behind a proxy we trust (TRUST_PROXY=1)
 * we read the first X-Forwarded-For hop; otherwise every client shares one "direct" bucket,
 * which still caps guessing across all accounts.
 */
export function clientAddress(request: Request): string {
  if (getEnv().TRUST_PROXY) {
    const forwarded = request.headers.get("X-Forwarded-For")?.split(",")[0]?.trim();
    if (forwarded) return forwarded.slice(0, 64);
  }
  return "direct";
}
