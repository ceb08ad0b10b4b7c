import { requireRole } from "~/lib/access.server";
import { loadQuantities, quantitiesGeoJson } from "~/models/quantities.server";
import type { Route } from "./+types/api.projects.$projectId.quantities[.]geojson";

// GET: the cells with their figures as GeoJSON in lon/lat (RFC 7946), for the manager and viewers.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "quantities.read");
  const collection = await quantitiesGeoJson(await loadQuantities(project));
  return new Response(JSON.stringify(collection), {
    headers: {
      "Content-Type": "application/geo+json; charset=utf-8",
      "Content-Disposition": `attachment; filename="cells-project-${project.id}.geojson"`,
      "Cache-Control": "private, no-store",
    },
  });
}
