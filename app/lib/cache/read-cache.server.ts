import { z } from "zod";
import { writeRevision } from "../../../db/models/write-revision";
import { BoundedCache } from "./bounded-cache";

// The reads a crowd repeats (the progress figures, the overview, the project layout's banners, the
// signed-in user and their membership) are kept between requests for as long as nothing they rest
// on has changed. "Changed" is the process's write revision: every create, update, upsert and
// delete that goes through a Sequelize model moves it on, once when the statement runs and once
// more when its transaction commits (a read between the two could see the rows as they were and
// must not be kept past the commit). A read is stored under the revision it started at, so a write
// made while it was computing makes it stale at once.
//
// The revision is kept by db/models/write-revision.ts. Firmsand runs as one process (the engine's
// state is per process), so every write the app makes passes there. Writes from elsewhere (a seed
// script against a running server, a raw SQL statement) are not seen: for those, and for figures
// that move with the clock (an open stop-work's lost hours, a stand-down's end), an entry also
// lives at most `READ_CACHE_SECONDS` (5 s by default). Models whose rows no cached read shows
// (sessions, sign-in attempts, the audit log, the outbox, idempotency keys, API tokens' last use,
// an import's running count) do not move the revision, or every page view would.

const lifetimeSchema = z.coerce.number({ message: "READ_CACHE_SECONDS must be a number of seconds" })
  .min(0, "READ_CACHE_SECONDS must be 0 (off) or more").max(300, "READ_CACHE_SECONDS must be at most 300").default(5);
let lifetime: { raw: string | undefined; ms: number } | undefined;

/** The lifetime of a kept answer, from READ_CACHE_SECONDS (read as it is now, so a test may change it). */
function ttlMs(): number {
  const raw = process.env.READ_CACHE_SECONDS;
  if (!lifetime || lifetime.raw !== raw) {
    const parsed = lifetimeSchema.safeParse(raw === "" ? undefined : raw);
    if (!parsed.success) throw new Error(`Firmsand's environment is not valid: ${parsed.error.issues[0]!.message}`);
    lifetime = { raw, ms: parsed.data * 1000 };
  }
  return lifetime.ms;
}

const cache = new BoundedCache<unknown>(1000);

/** Where in the lifetime window `key`'s windows begin (FNV-1a of the key, modulo the lifetime). */
function keyOffset(key: string, ttl: number): number {
  let hash = 0x811c9dc5;
  for (let index = 0; index < key.length; index++) hash = Math.imul(hash ^ key.charCodeAt(index), 0x01000193);
  return (hash >>> 0) % ttl;
}

/** `key` under the current write revision and lifetime bucket; null when the cache is off (a lifetime of 0). */
export function versionedKey(key: string): string | null {
  const ttl = ttlMs();
  if (ttl === 0) return null;
  // Each key's lifetime windows are shifted by a hash of the key, so the many answers kept at
  // once (a page per reader) do not all expire in the same instant and render again together.
  return `${key}|r${writeRevision()}|t${Math.floor((Date.now() + keyOffset(key, ttl)) / ttl)}`;
}

/** The answer kept under a key from `versionedKey`, if any. */
export function peekCached<T>(versioned: string): Promise<T> | undefined {
  return cache.peek(versioned) as Promise<T> | undefined;
}

/** Keeps `value` under a key from `versionedKey` (taken before the value was computed). */
export function keepCached<T>(versioned: string, value: T): void {
  void cache.getOrCompute(versioned, async () => value);
}

/** Freezes a value and everything in it (outside production), so a caller that changes a shared cached read fails loudly in the tests. */
function deepFreeze<T>(value: T): T {
  // Bytes cannot be frozen (a typed array with elements refuses); they are left as they are.
  if (value === null || typeof value !== "object" || Object.isFrozen(value) || ArrayBuffer.isView(value)) return value;
  Object.freeze(value);
  if (value instanceof Map) for (const [key, item] of value) { deepFreeze(key); deepFreeze(item); }
  else if (value instanceof Set) for (const item of value) deepFreeze(item);
  else for (const item of Object.values(value)) deepFreeze(item);
  return value;
}

/**
 * `compute()`'s answer for `key`, kept while the write revision stands and for at most the cache's
 * lifetime. The answer is shared by every request that reads it: callers must not change it (it
 * is frozen outside production to make sure). With a lifetime of 0 it always computes.
 */
export function cachedRead<T>(key: string, compute: () => Promise<T>): Promise<T> {
  const versioned = versionedKey(key);
  if (versioned === null) return compute();
  const freeze = process.env.NODE_ENV !== "production";
  return cache.getOrCompute(versioned, async () => {
    const value = await compute();
    return freeze ? deepFreeze(value) : value;
  }) as Promise<T>;
}

const READING_METHODS = new Set(["GET", "HEAD"]);

/**
 * `cachedRead` for a reading request (GET, HEAD); a request that changes something computes afresh,
 * so what an action checks before it writes is read from the database, never from the cache.
 */
export function cachedReadFor<T>(request: Request, key: string, compute: () => Promise<T>): Promise<T> {
  return READING_METHODS.has(request.method.toUpperCase()) ? cachedRead(key, compute) : compute();
}
