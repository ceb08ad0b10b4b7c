import { createHash } from "node:crypto";

/**
 * The pure half of exactly-once writes (the server half is idempotency.server.ts): reading the
 * `Idempotency-Key` header and the request's fingerprint. Record versions (If-Match) are in versions.ts.
 */

export const IDEMPOTENCY_HEADER = "Idempotency-Key";
/** Set on an answer given again for a key already used. */
export const REPLAYED_HEADER = "Idempotency-Replayed";
export const IDEMPOTENCY_KEY_PATTERN = /^[A-Za-z0-9_\-:.]{1,100}$/;
/** Keys are kept this long; a client resends well within it. */
export const IDEMPOTENCY_KEEP_DAYS = 30;

export type KeyCheck = { ok: true; key: string | null } | { ok: false; message: string };

/** The header's key: null when absent, refused when empty, too long or of other characters. */
export function checkIdempotencyKey(header: string | null): KeyCheck {
  if (header === null) return { ok: true, key: null };
  if (IDEMPOTENCY_KEY_PATTERN.test(header)) return { ok: true, key: header };
  const reason = header.length === 0 ? "is empty" : header.length > 100 ? `has ${header.length} characters` : "has characters other than letters, digits and _ - : .";
  return { ok: false, message: `The ${IDEMPOTENCY_HEADER} header ${reason}: send 1 to 100 letters, digits, _ - : or . (a UUID made on the device is usual).` };
}

/** JSON with every object's keys in order, so two equal bodies written in other orders read the same. */
export function canonicalJson(value: unknown): string {
  if (value === undefined) return "null";
  if (value !== null && typeof value === "object" && typeof (value as { toJSON?: unknown }).toJSON === "function") return canonicalJson((value as { toJSON: () => unknown }).toJSON());
  if (Array.isArray(value)) return `[${value.map((item) => canonicalJson(item)).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, item]) => item !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([name, item]) => `${JSON.stringify(name)}:${canonicalJson(item)}`).join(",")}}`;
  }
  return JSON.stringify(value);
}

/** SHA-256 (hex) of what a request asked for, as its route read it. */
export function fingerprintOf(content: unknown): string {
  return createHash("sha256").update(canonicalJson(content)).digest("hex");
}
