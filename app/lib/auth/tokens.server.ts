import { createHash, randomBytes } from "node:crypto";

/** A fresh link token (256 random bits, URL-safe) and the SHA-256 hash stored in its place. */
export function createLinkToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
