import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { removeSubscriber } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.report-subscribers.$subscriberId";

// Removing takes no body; one that is sent must be empty or `{}`, so a malformed body is refused.
const noBodySchema = z.object({}).strict();

const route = apiRoute<Route.LoaderArgs>({
  // DELETE → 204: the address no longer receives the signed daily reports (manager; audited); 404 when not on the list.
  async DELETE({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.distribute");
    await readApiBody(request, noBodySchema);
    const subscriberId = urlIdSchema.safeParse(params.subscriberId);
    if (!subscriberId.success) throw new NotFoundError({ field: "subscriberId", message: "That subscriber is not on this project's list." });
    await removeSubscriber(project, user, subscriberId.data, clientAddress(request));
    return new Response(null, { status: 204 });
  },
});
export const loader = route.loader;
export const action = route.action;
