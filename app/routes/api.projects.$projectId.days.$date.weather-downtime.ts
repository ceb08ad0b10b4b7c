import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { dayParam, saveWeatherDowntime, weatherDowntimeInputSchema } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.weather-downtime";

const route = apiRoute<Route.LoaderArgs>({
  // PUT JSON {weatherDowntime: [{start, end, reason}]} → 200 {weatherDowntime}: the day's spells of
  // weather downtime replaced (local HH:MM, the end may be 24:00); 422 naming the line and field; 409 once signed.
  async PUT({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, weatherDowntimeInputSchema(date, project.timeZone), { formats: ["json"] });
    const weatherDowntime = await saveWeatherDowntime(project, user, date, input, clientAddress(request));
    return Response.json({ weatherDowntime });
  },
});
export const loader = route.loader;
export const action = route.action;
