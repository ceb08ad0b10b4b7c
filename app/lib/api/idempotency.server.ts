import { AsyncLocalStorage } from "node:async_hooks";
import { setTimeout as sleep } from "node:timers/promises";
import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { IdempotencyKey } from "~/lib/db.server";
import { ValidationError } from "~/lib/errors";
import type { ProjectAccess } from "~/lib/auth/access.server";
import { checkIdempotencyKey, fingerprintOf, IDEMPOTENCY_HEADER, IDEMPOTENCY_KEEP_DAYS, REPLAYED_HEADER } from "./idempotency";

/**
 * Exactly-once field writes. A client that may send an entry twice (a phone whose first answer was
 * lost) sends an `Idempotency-Key` header; the route wraps its write in `answerOnce`, and the
 * model's write transaction calls `claimIdempotencyKey(transaction)` as its first statement, so
 * the key is stored with the record or not at all.
 *
 * - A key seen before, for the same request: its stored answer again, 200, `Idempotency-Replayed: true`.
 * - A key seen before for another request (other body, route or project): 422 naming the header.
 * - The same key twice at once: the unique index on (user, key) holds the second insert until
 *   the first transaction ends; then the second finds the first's row and answers it.
 * - A request refused (4xx) stores nothing, so the client may fix the entry and send it again
 *   under the same key.
 */

interface PendingKey {
  userId: number;
  projectId: number;
  key: string;
  scope: string;
  fingerprint: string;
  /** The row inserted in the record's transaction, once claimed. */
  row: IdempotencyKey | null;
  claimedIn?: Transaction;
}

/** How a transaction ended ("commit" or "rollback"), undefined while open (Sequelize keeps it, untyped). */
const finishedOf = (transaction: Transaction) => (transaction as unknown as { finished?: string }).finished;

const pending = new AsyncLocalStorage<PendingKey>();

/** Thrown by a claim that met another request's row for the same key: answerOnce answers the first's answer. */
class KeyClaimedElsewhere extends Error {}

/** How long a second request waits for the first's answer to be written after its record commits. */
const ANSWER_WAIT_MS = 10_000;
const ANSWER_POLL_MS = 50;

export interface KeyClaim {
  /** Notes the created record's id on the key (same transaction). */
  created(recordId: number): Promise<void>;
}

const NO_CLAIM: KeyClaim = { created: async () => undefined };

/**
 * For a model's write transaction, called first thing in it: when the request being answered
 * carries an idempotency key, inserts the key's row in this transaction. Outside such a request
 * (pages, seeders, scripts, or no header) it does nothing.
 */
export async function claimIdempotencyKey(transaction: Transaction): Promise<KeyClaim> {
  const wanted = pending.getStore();
  // One claim per request; a claim whose transaction rolled back (a model that tries again) is void.
  if (!wanted || (wanted.claimedIn && finishedOf(wanted.claimedIn) !== "rollback")) return NO_CLAIM;
  let row: IdempotencyKey;
  try {
    row = await IdempotencyKey.create(
      { userId: wanted.userId, projectId: wanted.projectId, idemKey: wanted.key, scope: wanted.scope, fingerprint: wanted.fingerprint, recordId: null, statusCode: null, responseBody: null, location: null },
      { transaction },
    );
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new KeyClaimedElsewhere();
    throw error;
  }
  wanted.row = row;
  wanted.claimedIn = transaction;
  return { created: async (recordId) => void (await row.update({ recordId }, { transaction })) };
}

/** The request's key, or null; a malformed header is a 422 naming it. */
export function idempotencyKeyOf(request: Request): string | null {
  const checked = checkIdempotencyKey(request.headers.get(IDEMPOTENCY_HEADER));
  if (!checked.ok) throw new ValidationError({ field: IDEMPOTENCY_HEADER, message: checked.message }, { code: "bad-idempotency-key" });
  return checked.key;
}

function scopeOf(request: Request): string {
  return `${request.method.toUpperCase()} ${new URL(request.url).pathname}`.slice(0, 300);
}

function replay(row: IdempotencyKey): Response {
  const headers = new Headers({ "Content-Type": "application/json", "Cache-Control": "no-store", [REPLAYED_HEADER]: "true" });
  if (row.location) headers.set("Location", row.location);
  if (row.responseBody !== null) return new Response(row.responseBody, { status: 200, headers });
  // The record was stored but its answer was never written (the server stopped in between): its id, plainly.
  return new Response(JSON.stringify({ id: row.recordId, notices: ["This entry was stored before; its full answer was not kept, so open the record to see it."] }), { status: 200, headers });
}

function refuseReuse(key: string, row: IdempotencyKey): never {
  throw new ValidationError(
    { field: IDEMPOTENCY_HEADER, value: key, message: `This ${IDEMPOTENCY_HEADER} was already used for a different entry (${row.scope}); give each entry a key of its own.` },
    { code: "idempotency-key-reused" },
  );
}

/** The row for (user, key) once its answer is written, waiting up to ANSWER_WAIT_MS for it; null when there is no row. */
async function answeredRow(userId: number, key: string): Promise<IdempotencyKey | null> {
  const deadline = Date.now() + ANSWER_WAIT_MS;
  for (;;) {
    const row = await IdempotencyKey.findOne({ where: { userId, idemKey: key } });
    if (!row || row.statusCode !== null || Date.now() >= deadline) return row;
    await sleep(ANSWER_POLL_MS);
  }
}

/**
 * Answers a write once per idempotency key. `content` is what the route read from the request
 * (the parsed body; for an upload, a digest of the file), so the key's fingerprint is taken of
 * what the write means, whatever the order of its fields. Without the header, `write` simply runs.
 */
export async function answerOnce(request: Request, access: Pick<ProjectAccess, "user" | "project">, content: unknown, write: () => Promise<Response>): Promise<Response> {
  const key = idempotencyKeyOf(request);
  if (key === null) return write();
  const wanted: PendingKey = { userId: access.user.id, projectId: access.project.id, key, scope: scopeOf(request), fingerprint: fingerprintOf(content), row: null };
  const settled = (row: IdempotencyKey): Response => {
    if (row.fingerprint !== wanted.fingerprint || row.scope !== wanted.scope || row.projectId !== wanted.projectId) refuseReuse(key, row);
    return replay(row);
  };

  const earlier = await answeredRow(wanted.userId, key);
  if (earlier) return settled(earlier);

  let response: Response;
  try {
    response = await pending.run(wanted, write);
  } catch (error) {
    if (!(error instanceof KeyClaimedElsewhere)) throw error;
    const first = await answeredRow(wanted.userId, key);
    if (!first) throw new Error(`The ${IDEMPOTENCY_HEADER} row vanished while a second request waited for it.`);
    return settled(first);
  }

  const body = await response.clone().text();
  const answer = { statusCode: response.status, responseBody: body, location: response.headers.get("Location") };
  if (wanted.row && wanted.claimedIn && finishedOf(wanted.claimedIn) === "commit") {
    await wanted.row.update(answer);
  } else if (response.ok) {
    // The write stored nothing (its model answered from an earlier record): keep the key all the same.
    try {
      await IdempotencyKey.create({ userId: wanted.userId, projectId: wanted.projectId, idemKey: key, scope: wanted.scope, fingerprint: wanted.fingerprint, recordId: null, ...answer });
    } catch (error) {
      if (!(error instanceof UniqueConstraintError)) throw error;
      const first = await answeredRow(wanted.userId, key);
      if (first) return settled(first);
    }
  }
  return response;
}

/** Deletes keys older than IDEMPOTENCY_KEEP_DAYS (one indexed range delete); returns how many. */
export function purgeIdempotencyKeys(now: number = Date.now(), keepDays: number = IDEMPOTENCY_KEEP_DAYS): Promise<number> {
  return IdempotencyKey.destroy({ where: { createdAt: { [Op.lt]: new Date(now - keepDays * 86_400_000) } } });
}

let purgeTimer: NodeJS.Timeout | undefined;

/** Purges old keys now and every 6 hours (unref'd, so it never keeps a process alive). Started by the production server. */
export function startIdempotencyKeyPurge(): void {
  if (purgeTimer) return;
  const purge = () =>
    void purgeIdempotencyKeys().catch((error: unknown) => process.stderr.write(`Firmsand: the purge of old idempotency keys failed: ${(error as Error).message}\n`));
  purge();
  purgeTimer = setInterval(purge, 6 * 3600_000);
  purgeTimer.unref();
}

// The production server (app/serve.mjs) starts the background tasks the app registers on load,
// once it listens; tests and scripts that import this module start nothing.
const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
(registry.firmsandBackgroundTasks ??= []).push(startIdempotencyKeyPurge);
