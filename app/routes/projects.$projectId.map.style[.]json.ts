import { requireRole } from "~/lib/auth/access.server";
import { buildMapStyle } from "~/models/map-style.server";
import type { Route } from "./+types/projects.$projectId.map.style[.]json";

// GET /projects/<id>/map/style.json — the offline MapLibre style built from the project's own data.
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  return Response.json(await buildMapStyle(project), { headers: { "Cache-Control": "private, no-cache" } });
}
