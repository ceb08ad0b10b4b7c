import { STAND_DOWN_CAUTION } from "../../shared/water-quality/wording";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { listSightings, listStandDowns, recordSighting, sightingInputSchema } from "~/models/wildlife.server";
import type { Route } from "./+types/api.projects.$projectId.wildlife.sightings";

const route = apiRoute<Route.LoaderArgs>({
  // GET — sightings and stand-downs, newest first (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const [sightings, standDowns] = await Promise.all([listSightings(project), listStandDowns(project)]);
    return Response.json({ sightings, standDowns, caution: STAND_DOWN_CAUTION });
  },
  // POST {species, seenAt, distance?, gone?, position?: {x, y}, observer, note?} as JSON →
  // 201 {id, standDown?: {id, until}} (manager, dive supervisor, dewatering operator, resource monitor).
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "wildlife.record");
    const input = await readApiBody(request, sightingInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json(await recordSighting(access.project, access.user, input, clientAddress(request)), { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
