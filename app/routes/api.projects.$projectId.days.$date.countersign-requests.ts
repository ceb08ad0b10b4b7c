import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { appOrigin } from "~/lib/http/origin.server";
import { countersignRequestInputSchema, dayParam, requestCountersign } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.countersign-requests";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {email} → 201 {email, expiresAt}: a one-time countersign link goes to the inspector
  // by e-mail (an earlier open link stops working); 409 unsigned, or countersigned and not amended
  // since (after an amendment a new countersignature may be asked for; the earlier one stays on record).
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, countersignRequestInputSchema, { formats: ["json"] });
    const { email, expiresAt } = await requestCountersign(project, user, date, input.email, appOrigin(), clientAddress(request));
    return Response.json({ email, expiresAt }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
