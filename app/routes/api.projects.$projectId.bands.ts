import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { getProjectBands } from "~/models/bands.server";
import type { Route } from "./+types/api.projects.$projectId.bands";

const querySchema = z.object({ surface: z.enum(["remaining", "depth"], { message: 'surface is "remaining" or "depth"' }) });

const route = apiRoute<Route.LoaderArgs>({
  // GET ?surface=remaining|depth — filled contour bands as lon/lat GeoJSON.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const { surface } = readApiQuery(request, querySchema);
    return Response.json(await getProjectBands(project, surface));
  },
});
export const loader = route.loader;
export const action = route.action;
