import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { loadReconciliation } from "~/models/reconciliation.server";
import type { Route } from "./+types/api.projects.$projectId.reconciliation";

const route = apiRoute<Route.LoaderArgs>({
  // GET — surveyed, pumped and hauled solids and the N and P removed, per zone and for the project (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json(await loadReconciliation(project), { headers: { "Cache-Control": "private, no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
