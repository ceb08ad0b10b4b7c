import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { crewsInputSchema, dayParam, projectTeamNames, saveCrews } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.crews";

const route = apiRoute<Route.LoaderArgs>({
  // PUT JSON {crews: [{team, headCount, reason}]} → 200 {crews}: the head counts entered over the
  // compiled ones replaced (a team left out goes back to its compiled count); 422 naming the line
  // and field (crews.<n>.headCount); 409 once signed.
  async PUT({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, crewsInputSchema(await projectTeamNames(project)), { formats: ["json"] });
    const crews = await saveCrews(project, user, date, input, clientAddress(request));
    return Response.json({ crews });
  },
});
export const loader = route.loader;
export const action = route.action;
