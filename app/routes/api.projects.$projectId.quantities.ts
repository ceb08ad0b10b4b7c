import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { loadPayPeriod, periodCellRows, periodQuerySchema } from "~/models/pay-periods.server";
import type { Route } from "./+types/api.projects.$projectId.quantities";

const route = apiRoute<Route.LoaderArgs>({
  // GET ?from=<surveyId>&to=<surveyId> — a pay period's figures per zone (with Unzoned), project
  // and cell, with the surveys, method and settings they rest on; default the baseline to the latest.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "quantities.read");
    const period = await loadPayPeriod(project, readApiQuery(request, periodQuerySchema));
    if (!period) throw new NotFoundError("The project has no figures yet (no baseline survey or no work limit), so there is no pay period.");
    const { figures, ...rest } = period;
    return Response.json({ ...rest, total: figures.total, zones: figures.zones, cells: periodCellRows(figures) }, { headers: { "Cache-Control": "private, no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
