import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { loadProgress } from "~/models/progress.server";
import type { Route } from "./+types/api.projects.$projectId.progress";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the progress figures (zones, totals, time series, production, forecast). Every project
  // member may read them: they are the zone-level figures the overview shows to all.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json(await loadProgress(project, { crossCheck: true }), { headers: { "Cache-Control": "private, no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
