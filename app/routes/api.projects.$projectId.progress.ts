import { requireRole } from "~/lib/access.server";
import { loadProgress } from "~/models/progress.server";
import type { Route } from "./+types/api.projects.$projectId.progress";

// GET: the progress figures (zones, totals, time series, production, forecast) as JSON. Every
// project member may read them: they are the zone-level figures the overview shows to all.
// Signed out, a GET is sent to sign in (as the other GET APIs are; see the route × role matrix).

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  return Response.json(await loadProgress(project, { crossCheck: true }), { headers: { "Cache-Control": "private, no-store" } });
}
