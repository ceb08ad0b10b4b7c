import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { DEWATERING_CAUTION, listTubes, registerTube, tubeInputSchema } from "~/models/dewatering.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.tubes";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the tube register with fills, fill level and the near-capacity flag (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ ...(await listTubes(project)), caution: DEWATERING_CAUTION });
  },
  // POST {name, circumference, length, capacityDryMassPerLength, status?, notes?} (dewatering operator, manager) → 201 {tube}.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, tubeInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json({ tube: await registerTube(access.project, access.user, input, clientAddress(request)) }, { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
