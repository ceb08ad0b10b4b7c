import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { dayParam, saveVisitors, visitorsInputSchema } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.visitors";

const route = apiRoute<Route.LoaderArgs>({
  // PUT JSON {visitors: [{arrived, left, name, organisation, purpose}]} → 200 {visitors}: the day's
  // inspections and visitors replaced (local HH:MM); 422 naming the line and field; 409 once signed.
  async PUT({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, visitorsInputSchema(date, project.timeZone), { formats: ["json"] });
    const visitors = await saveVisitors(project, user, date, input, clientAddress(request));
    return Response.json({ visitors });
  },
});
export const loader = route.loader;
export const action = route.action;
