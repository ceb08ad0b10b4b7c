import { requireRole } from "~/lib/access.server";
import { cellsVersion, getCellsPayloadJson } from "~/models/cells.server";
import type { Route } from "./+types/api.projects.$projectId.cells";

// GET /api/projects/<id>/cells — the grid definition plus compact per-cell arrays (any member).
// The ETag is the project's cells version (recompute stamp, zones, settings): the map polls with
// If-None-Match and gets a bodiless 304 until an import, a retract or a settings change.
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const version = await cellsVersion(project);
  const etag = `"${version}"`;
  const headers = { "Cache-Control": "private, no-cache", ETag: etag };
  const ifNoneMatch = request.headers.get("If-None-Match");
  if (ifNoneMatch && ifNoneMatch.split(",").some((tag) => tag.trim().replace(/^W\//, "") === etag)) return new Response(null, { status: 304, headers });
  return new Response(await getCellsPayloadJson(project, version), { headers: { ...headers, "Content-Type": "application/json; charset=utf-8" } });
}
