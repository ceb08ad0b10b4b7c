import { createHash } from "node:crypto";
import { getOptionalUser } from "../auth/access.server";
import { precompress, precompressedResponse, type PrecompressedBody } from "../http/precompressed.server";
import type { RouterContextProvider } from "react-router";
import { readerPageKey } from "./page-drawing.server";
import { keepCached, peekCached, versionedKey } from "./read-cache.server";

/** The header app/serve.mjs sets on every request: "document" or "data". */
export const REQUEST_KIND_HEADER = "x-firmsand-request-kind";

// A page many people keep open and reload (the project overview) is rendered once and its HTML
// (or, for a navigation in the app, its data) kept for the same reader until something is written
// or the read cache's lifetime passes (app/lib/cache/read-cache.server.ts). Rendering the overview
// takes about ten times the CPU of answering from memory, which decides how many readers one server holds.
//
// What makes it safe:
// - The sign-in is checked on every request, before anything is looked up: a session that ended
//   gets no kept page (the request goes on to the page's own loaders and their refusal).
// - A kept answer is for one reader and one session: the key holds the user, a hash of the whole
//   Cookie header (so a different session or cookie is a different key) and the URL.
// - Only a 200 without Set-Cookie is kept; anything else (a redirect, an error, a refreshed
//   cookie) goes to its reader alone.
// - A document and a page's data are kept apart (the production server says which a request is).
// - Only reading requests (GET); the framing policy and other headers the root adds on the way
//   out are added to every answer, kept or not.

interface KeptDocument {
  status: number;
  headers: Array<[string, string]>;
  body: PrecompressedBody;
}

/** Headers that describe one transfer rather than the document, left for the server to set. */
const TRANSFER_HEADERS = new Set(["content-length", "content-encoding", "date", "transfer-encoding", "connection", "vary"]);

/**
 * Route middleware (framework mode) for a signed-in page that depends only on the database, the
 * reader and the URL: the rendered answer is kept per reader, session and URL while nothing is written.
 */
export async function keepRenderedForReader({ request, context }: { request: Request; context?: Readonly<RouterContextProvider> }, next: () => Promise<Response>): Promise<Response> {
  if (request.method !== "GET") return next();
  // Set by the production server (app/serve.mjs) over anything a client sent: a page's document
  // and its data share a URL here. Without it (the development server) nothing is kept.
  const kind = request.headers.get(REQUEST_KIND_HEADER);
  if (kind !== "document" && kind !== "data") return next();
  const user = await getOptionalUser(request);
  if (!user) return next();
  const cookie = createHash("sha256").update(request.headers.get("Cookie") ?? "").digest("base64url");
  const url = new URL(request.url);
  const readerKey = `page:${kind}:${user.id}:${cookie}:${url.pathname}${url.search}`;
  const key = versionedKey(readerKey);
  if (key === null) return next();
  // When the kept page has expired, a document whose data has not changed is not drawn again
  // (app/lib/cache/page-drawing.server.ts); a page's data (a navigation in the app) is not drawn.
  if (kind === "document") context?.set(readerPageKey, readerKey);
  const kept = await peekCached<KeptDocument>(key)?.catch(() => undefined);
  if (kept) return precompressedResponse(request, kept.body, Object.fromEntries(kept.headers));
  const response = await next();
  if (response.status !== 200 || response.headers.has("Set-Cookie") || !response.body) return response;
  const body = await precompress(await response.text());
  const headers = [...response.headers].filter(([name]) => !TRANSFER_HEADERS.has(name.toLowerCase()));
  // The drawing's Server-Timing is this answer's alone: a kept answer was not drawn.
  keepCached<KeptDocument>(key, { status: response.status, headers: headers.filter(([name]) => name.toLowerCase() !== "server-timing"), body });
  return precompressedResponse(request, body, Object.fromEntries(headers));
}
