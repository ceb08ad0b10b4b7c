import { WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { listStopWork } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.stop-work";

const route = apiRoute<Route.LoaderArgs>({
  // GET — stop-work events, open and closed, newest first, with their durations (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ events: await listStopWork(project), caution: WATER_QUALITY_CAUTION });
  },
});
export const loader = route.loader;
export const action = route.action;
