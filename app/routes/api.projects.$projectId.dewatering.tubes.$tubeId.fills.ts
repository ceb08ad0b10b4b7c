import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { fillInputSchema, recordFill } from "~/models/dewatering.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.tubes.$tubeId.fills";

const route = apiRoute<Route.LoaderArgs>({
  // POST {date, drySolids, slurryVolume?} (dewatering operator, manager) → 201 {tube} with the fill added.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const tubeId = urlIdSchema.safeParse(params.tubeId);
    if (!tubeId.success) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
    const input = await readApiBody(request, fillInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () =>
      Response.json({ tube: await recordFill(access.project, access.user, tubeId.data, input, clientAddress(request)) }, { status: 201 }),
    );
  },
});
export const loader = route.loader;
export const action = route.action;
