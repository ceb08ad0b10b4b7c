import { requireRole } from "~/lib/access.server";
import { getCellsPayload } from "~/models/cells.server";
import type { Route } from "./+types/api.projects.$projectId.cells";

// GET /api/projects/<id>/cells — the grid definition plus compact per-cell arrays (any member).
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  return Response.json(await getCellsPayload(project), { headers: { "Cache-Control": "private, no-cache" } });
}
