import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { loadPayPeriod, periodQuerySchema } from "~/models/pay-periods.server";
import { loadReconciliation } from "~/models/reconciliation.server";
import type { Route } from "./+types/api.projects.$projectId.reconciliation";

const route = apiRoute<Route.LoaderArgs>({
  // GET [?from=<surveyId>&to=<surveyId> | ?month=YYYY-MM] — surveyed, pumped and hauled solids and
  // the N and P removed, per zone and for the project (any member); for a pay period when asked.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const query = readApiQuery(request, periodQuerySchema);
    const asked = Boolean(query.from || query.to || query.month);
    const period = asked ? await loadPayPeriod(project, query) : null;
    if (asked && !period) throw new NotFoundError("The project has no figures yet (no baseline survey or no work limit), so there is no pay period.");
    const reconciliation = period
      ? await loadReconciliation(project, undefined, { from: period.from, to: period.to, zones: period.figures.zones })
      : await loadReconciliation(project);
    return Response.json(reconciliation, { headers: { "Cache-Control": "private, no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
