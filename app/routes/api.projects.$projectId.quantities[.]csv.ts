import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { loadQuantities, quantitiesCsv } from "~/models/quantities.server";
import { periodQuerySchema } from "~/models/pay-periods.server";
import type { Route } from "./+types/api.projects.$projectId.quantities[.]csv";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the quantities CSV (header block, zone totals, cells) for those who read quantities.
  // Text fields are formula-safe (shared/csv-safe).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "quantities.read");
    const view = await loadQuantities(project, readApiQuery(request, periodQuerySchema));
    const body = `\uFEFF${quantitiesCsv(view, new Date())}`; // BOM: spreadsheets then read yd³ and m³ as UTF-8
    return new Response(body, {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="quantities-project-${project.id}-${view.period ? `${view.period.from.surveyedOn}-to-${view.period.to.surveyedOn}` : view.latest?.surveyedOn ?? "no-survey"}.csv"`,
        "Cache-Control": "private, no-store",
      },
    });
  },
});
export const loader = route.loader;
export const action = route.action;
