import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { liftHold, liftInputSchema } from "~/models/holds.server";
import type { Route } from "./+types/api.projects.$projectId.holds.$holdId.lift";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {authorisedBy, note?} → 204: the held cells can be assigned again.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "holds.lift");
    const holdId = urlIdSchema.safeParse(params.holdId);
    if (!holdId.success) throw new NotFoundError("There is no such hold in this project.");
    const input = await readApiBody(request, liftInputSchema, { formats: ["json"] });
    await liftHold(project, user, holdId.data, input, clientAddress(request));
    return new Response(null, { status: 204 });
  },
});
export const loader = route.loader;
export const action = route.action;
