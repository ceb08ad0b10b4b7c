import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { precompressedResponse } from "~/lib/http/precompressed.server";
import { cellsVersion, getCellsPayloadBody } from "~/models/cells.server";
import type { Route } from "./+types/api.projects.$projectId.cells";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the grid definition plus compact per-cell arrays (any member). The ETag is the project's
  // cells version (recompute stamp, zones, settings): the map polls with If-None-Match and gets a
  // bodiless 304 until an import, a retract or a settings change. The body is gzipped once per version.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    // The version is kept between requests until something is written (app/lib/cache/read-cache.server.ts).
    const version = await cachedReadFor(request, `cells-version:${project.id}`, () => cellsVersion(project));
    const etag = `"${version}"`;
    const headers = { "Cache-Control": "private, no-cache", ETag: etag };
    const ifNoneMatch = request.headers.get("If-None-Match");
    if (ifNoneMatch && ifNoneMatch.split(",").some((tag) => tag.trim().replace(/^W\//, "") === etag)) return new Response(null, { status: 304, headers });
    return precompressedResponse(request, await getCellsPayloadBody(project, version), { ...headers, "Content-Type": "application/json; charset=utf-8" });
  },
});
export const loader = route.loader;
export const action = route.action;
