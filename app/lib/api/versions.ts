import { PreconditionFailedError } from "~/lib/errors";
import { fingerprintOf } from "./idempotency";

/**
 * Record versions for edits made offline: GET and write answers carry a record's `version` (and an
 * `ETag`); a PATCH may send it back in `If-Match`, and when the record has changed since, the edit
 * is refused with 412 and the record as it is now, so the client can show both side by side.
 */

export const IF_MATCH_HEADER = "If-Match";

/**
 * A record's version for ETag / If-Match: a digest of the record as the API shows it, so any change
 * a client could see (a status, a fill added to a tube) gives a new version. Taken from content
 * rather than updatedAt, whose DATETIME keeps whole seconds: two edits within a second would share it.
 */
export function versionOf(record: unknown): string {
  return fingerprintOf(record).slice(0, 20);
}

/** The ETag header value for a version (a strong tag: the record as a whole). */
export function etagOf(version: string): string {
  return `"${version}"`;
}

/**
 * The versions an `If-Match` header names (`"v"`, `W/"v"`, a bare `v`, several separated by
 * commas, or `*` for any); null when the header is absent.
 */
export function ifMatchVersions(header: string | null): string[] | "any" | null {
  if (header === null || header.trim() === "") return null;
  if (header.trim() === "*") return "any";
  return header.split(",").map((part) => part.trim().replace(/^W\//, "").replace(/^"(.*)"$/, "$1")).filter((part) => part.length > 0);
}

/**
 * Throws 412 (PreconditionFailedError, with `current`) unless `wanted` (from ifMatchVersions) names
 * the current record's version; no If-Match (null) lets the edit through as before.
 */
export function assertCurrentVersion<View extends { version: string }>(wanted: string[] | "any" | null, current: View, noun: string): void {
  if (wanted === null || wanted === "any" || wanted.includes(current.version)) return;
  throw new PreconditionFailedError(
    { field: IF_MATCH_HEADER, value: wanted.join(", "), message: `This ${noun} was changed by someone else since you saw it: compare your change with the current record and send it again if it still applies.` },
    { code: "changed-since", current },
  );
}
