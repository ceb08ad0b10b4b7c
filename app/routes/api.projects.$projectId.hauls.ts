import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { haulInputSchema, listHauls, listHaulSites, recordHaul } from "~/models/hauls.server";
import type { Route } from "./+types/api.projects.$projectId.hauls";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the haul tickets and the sites they go to (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const [hauls, sites] = await Promise.all([listHauls(project), listHaulSites(project)]);
    return Response.json({ hauls, sites });
  },
  // POST a ticket as JSON (dewatering operator, manager) → 201 {haul}; 200 when its idempotency key was used before.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, haulInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      const { haul, replayed } = await recordHaul(access.project, access.user, input, clientAddress(request));
      return Response.json({ haul }, { status: replayed ? 200 : 201 });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
