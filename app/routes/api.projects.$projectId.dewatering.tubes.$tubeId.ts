import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { etagOf, IF_MATCH_HEADER, ifMatchVersions } from "~/lib/api/versions";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { changeTube, findTube, tubeEditSchema } from "~/models/dewatering.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.tubes.$tubeId";

function tubeIdOf(params: { tubeId?: string }): number {
  const tubeId = urlIdSchema.safeParse(params.tubeId);
  if (!tubeId.success) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
  return tubeId.data;
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — one tube with its fills, fill level, near-capacity flag and version (ETag) (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const tube = await findTube(project, tubeIdOf(params));
    return Response.json({ tube }, { headers: { ETag: etagOf(tube.version), "Cache-Control": "no-store" } });
  },
  // PATCH {status?, position?: {x, y} | null, bearingDegrees?} (dewatering operator, manager) → 200 {tube};
  // status is filling, dewatering, ready-to-open, opened or hauled; a position (project CRS) moves the
  // tube on the laydown area, null takes it off the map. With If-Match: <version>, 412 {errors,
  // current: tube} when the tube changed since that version.
  async PATCH({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, tubeEditSchema, { formats: ["json"] });
    const ifMatch = ifMatchVersions(request.headers.get(IF_MATCH_HEADER));
    const tube = await changeTube(project, user, tubeIdOf(params), input, clientAddress(request), ifMatch);
    return Response.json({ tube }, { headers: { ETag: etagOf(tube.version) } });
  },
});
export const loader = route.loader;
export const action = route.action;
