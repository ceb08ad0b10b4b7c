import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { loadQuantities, quantitiesGeoJson } from "~/models/quantities.server";
import { periodQuerySchema } from "~/models/pay-periods.server";
import type { Route } from "./+types/api.projects.$projectId.quantities[.]geojson";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the cells with their figures as GeoJSON in lon/lat (RFC 7946), for those who read quantities.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "quantities.read");
    const collection = await quantitiesGeoJson(await loadQuantities(project, readApiQuery(request, periodQuerySchema)));
    return new Response(JSON.stringify(collection), {
      headers: {
        "Content-Type": "application/geo+json; charset=utf-8",
        "Content-Disposition": `attachment; filename="cells-project-${project.id}.geojson"`,
        "Cache-Control": "private, no-store",
      },
    });
  },
});
export const loader = route.loader;
export const action = route.action;
