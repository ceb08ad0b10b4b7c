import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { changeTubeStatus, findTube, tubeStatusSchema } from "~/models/dewatering.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.tubes.$tubeId";

function tubeIdOf(params: { tubeId?: string }): number {
  const tubeId = urlIdSchema.safeParse(params.tubeId);
  if (!tubeId.success) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
  return tubeId.data;
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — one tube with its fills, fill level and near-capacity flag (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ tube: await findTube(project, tubeIdOf(params)) });
  },
  // PATCH {status} (dewatering operator, manager) → 200 {tube}; status is filling, dewatering, ready-to-open, opened or hauled.
  async PATCH({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, tubeStatusSchema, { formats: ["json"] });
    return Response.json({ tube: await changeTubeStatus(project, user, tubeIdOf(params), input.status, clientAddress(request)) });
  },
});
export const loader = route.loader;
export const action = route.action;
