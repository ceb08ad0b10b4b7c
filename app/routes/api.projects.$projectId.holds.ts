import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { listHolds } from "~/models/holds.server";
import type { Route } from "./+types/api.projects.$projectId.holds";

const route = apiRoute<Route.LoaderArgs>({
  // GET — every hold, newest first: id, cells, placed, lifted; the find, radius, notices and lift only for location roles.
  async GET({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.read");
    return Response.json({ holds: await listHolds(access.project, access) }, { headers: { "Cache-Control": "no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
