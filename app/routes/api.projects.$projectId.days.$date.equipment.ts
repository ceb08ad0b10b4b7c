import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { dayParam, equipmentInputSchema, hoursInDay, saveEquipment } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.equipment";

const route = apiRoute<Route.LoaderArgs>({
  // PUT JSON {equipment: [{name, workingHours, idleHours, idleReason}]} → 200 {equipment}: the day's
  // equipment lines replaced (an empty list clears them); 422 naming the line and field; 409 once signed.
  async PUT({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, equipmentInputSchema(hoursInDay(project, date)), { formats: ["json"] });
    const equipment = await saveEquipment(project, user, date, input, clientAddress(request));
    return Response.json({ equipment });
  },
});
export const loader = route.loader;
export const action = route.action;
