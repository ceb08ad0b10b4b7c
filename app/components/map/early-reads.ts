import { mapCellsUrl, mapStyleUrl } from "./map-urls";

/**
 * The map page's first reads (its style and its cells), started as soon as the page's scripts run,
 * before React has hydrated the page: on a first visit hydration takes a few hundred milliseconds,
 * and the reads are answered meanwhile instead of after it. The page's own code then takes the
 * answer it would have asked for (`takeEarlyRead`), once; anything else asks the server as usual.
 */

/** An early read older than this is not taken (the page asks again): it may no longer be current. */
const FRESH_FOR_MS = 10_000;

const reads = new Map<string, { at: number; response: Promise<Response> }>();

/** The map page's address: `/projects/<id>/map`, nothing after it. */
const MAP_PAGE = /^\/projects\/(\d+)\/map\/?$/;

/**
 * Starts the map page's style and cells reads when the document is that page (called as its route
 * module is first evaluated; on any other page, or on the server, it does nothing).
 */
export function startMapPageReads() {
  if (typeof window === "undefined") return;
  const projectId = MAP_PAGE.exec(window.location.pathname)?.[1];
  if (!projectId) return;
  start(mapStyleUrl(window.location.origin, projectId));
  start(mapCellsUrl(projectId), { cache: "no-store" });
}

function start(url: string, init?: RequestInit) {
  const response = fetch(url, init);
  // Never an unhandled rejection: a failed early read is simply asked again by whoever takes it.
  response.catch(() => undefined);
  reads.set(url, { at: performance.now(), response });
}

/** The answer to an early read of `url`, if one was started lately and not yet taken; else null. */
export function takeEarlyRead(url: string): Promise<Response> | null {
  const read = reads.get(url);
  if (!read) return null;
  reads.delete(url);
  return performance.now() - read.at <= FRESH_FOR_MS ? read.response : null;
}
