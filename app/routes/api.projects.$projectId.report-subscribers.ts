import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { addSubscriber, listSubscribers, subscriberInputSchema } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.report-subscribers";

const route = apiRoute<Route.LoaderArgs>({
  // GET — who receives the project's signed daily reports by e-mail (manager).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "reports.distribute");
    return Response.json({ subscribers: await listSubscribers(project) }, { headers: { "Cache-Control": "private, no-store" } });
  },
  // POST JSON {email} (an outside address, or a member's) or {userId} (a member) → 201 {subscriber};
  // 409 naming email when the address already receives them; 422 naming the field (manager).
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.distribute");
    const input = await readApiBody(request, subscriberInputSchema, { formats: ["json"] });
    const subscriber = await addSubscriber(project, user, input, clientAddress(request));
    return Response.json({ subscriber }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
