import { createHash, type Hash } from "node:crypto";
import { createContext } from "react-router";
import { BoundedCache } from "./bounded-cache";

// A page's HTML is a function of its loaders' data and its URL: drawing it again from the same data
// draws the same bytes. A page kept per reader (app/lib/cache/document-cache.server.ts) lives a few
// seconds, for writes made outside the app and figures that move with the clock; when it expires,
// its loaders run again (cheap: their reads are shared and kept) and, when what they answer is what
// the reader's page was drawn from, the HTML drawn then is sent again instead of being drawn anew.
// On the demo overview, one client alone: drawn anew 11 ms, sent again as drawn 6–7 ms, a kept
// page 3 ms (2026-12-04); a crowd reloading a page nobody changed costs its loaders, not its drawing.
//
// What makes it safe:
// - The fingerprint covers every loader's data on the page, the URL (in the key), and the
//   reader's session (in the key): a change to anything the page shows is a new drawing.
// - Only values whose content the fingerprint can read are fingerprinted (plain objects, arrays,
//   Maps, Sets, dates, bytes, primitives); anything else (a promise, a class instance) means the
//   page is drawn every time.
// - Only a page that opts in (its middleware sets `readerPageKey`) and only a GET answered 200
//   without errors or action data; a drawing that fails is never kept.
// - Drawing must not read the clock: a page's server HTML must already equal its first render in
//   the browser (hydration), so the clock reaches a page through its loaders' data.

/** Set by a page's middleware for a document request: whose page this is (user, session, URL). */
export const readerPageKey = createContext<string | null>(null);

/** Drawn pages by reader key and data fingerprint: about 70 KB each for the overview. */
const drawings = new BoundedCache<string>(200);

/** A hash of `value`'s content, or null when it holds something whose content cannot be read here. */
export function dataFingerprint(value: unknown): string | null {
  const hash = createHash("sha256");
  return feed(hash, value, new Set()) ? hash.digest("base64url") : null;
}

/** Feeds `value` to the hash, each part tagged with its kind and length so no two values feed the same bytes. */
function feed(hash: Hash, value: unknown, path: Set<object>): boolean {
  switch (typeof value) {
    case "undefined": hash.update("u;"); return true;
    case "boolean": hash.update(value ? "t;" : "f;"); return true;
    // Object.is tells -0 from 0 (which String() does not): a page may draw them differently.
    case "number": hash.update(`n${Object.is(value, -0) ? "-0" : String(value)};`); return true;
    case "bigint": hash.update(`b${value};`); return true;
    case "string": hash.update(`s${value.length}:`); hash.update(value); return true;
    case "object": break;
    default: return false; // a function or a symbol
  }
  if (value === null) { hash.update("z;"); return true; }
  // A value that holds itself cannot be drawn from a fingerprint.
  if (path.has(value)) return false;
  path.add(value);
  try {
    if (value instanceof Date) { hash.update(`d${value.getTime()};`); return true; }
    if (ArrayBuffer.isView(value)) {
      hash.update(`v${value.constructor.name}:${value.byteLength}:`);
      hash.update(new Uint8Array(value.buffer, value.byteOffset, value.byteLength));
      return true;
    }
    if (Array.isArray(value)) {
      hash.update(`a${value.length}[`);
      for (const item of value) if (!feed(hash, item, path)) return false;
      hash.update("]");
      return true;
    }
    if (value instanceof Map) {
      hash.update(`m${value.size}{`);
      for (const [key, item] of value) if (!feed(hash, key, path) || !feed(hash, item, path)) return false;
      hash.update("}");
      return true;
    }
    if (value instanceof Set) {
      hash.update(`e${value.size}{`);
      for (const item of value) if (!feed(hash, item, path)) return false;
      hash.update("}");
      return true;
    }
    const prototype = Object.getPrototypeOf(value);
    if (prototype !== Object.prototype && prototype !== null) return false;
    // In insertion order, as a page that lists an object's entries draws them.
    const keys = Object.keys(value);
    hash.update(`o${keys.length}{`);
    for (const key of keys) {
      hash.update(`k${key.length}:`);
      hash.update(key);
      if (!feed(hash, (value as Record<string, unknown>)[key], path)) return false;
    }
    hash.update("}");
    return true;
  } finally {
    path.delete(value);
  }
}

export interface Drawing {
  html: string;
  /** How long drawing took, in milliseconds; null when the page was drawn before from the same data. */
  drawnMs: number | null;
}

/**
 * The page for `readerKey` drawn from data with `fingerprint`: the one drawn before from the same
 * data, or `draw()`'s (kept for next time; a drawing that throws is not kept).
 */
export async function drawnOnce(readerKey: string, fingerprint: string, draw: () => Promise<string>): Promise<Drawing> {
  const key = `${readerKey}|${fingerprint}`;
  if (drawings.has(key)) return { html: await drawings.getOrCompute(key, draw), drawnMs: null };
  const started = performance.now();
  const html = await drawings.getOrCompute(key, draw);
  return { html, drawnMs: performance.now() - started };
}
