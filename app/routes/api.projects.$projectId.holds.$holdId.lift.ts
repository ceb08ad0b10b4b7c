import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { liftHold, liftInputSchema } from "~/models/holds.server";
import type { Route } from "./+types/api.projects.$projectId.holds.$holdId.lift";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {authorisedBy, note?, liftedAt?} → 204: the held cells can be assigned again. liftedAt (ISO with
  // offset) back-dates the lift: not before the hold was placed, not in the future (422 naming liftedAt);
  // a hold lifted already → 409. The same Idempotency-Key again → 200 with no body.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "holds.lift");
    const holdId = urlIdSchema.safeParse(params.holdId);
    if (!holdId.success) throw new NotFoundError("There is no such hold in this project.");
    const input = await readApiBody(request, liftInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      await liftHold(access.project, access.user, holdId.data, input, clientAddress(request));
      return new Response(null, { status: 204 });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
