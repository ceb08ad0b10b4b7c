import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { getDailyReport, dayParam } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date";

const route = apiRoute<Route.LoaderArgs>({
  // GET → the day's report: compiled now, or as signed (with "signed", the countersignature and the amendments), and its state.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "reports.read");
    const date = dayParam(params.date);
    const { report, signed, countersigned, earlierCountersignatures, countersignOutdated, amendments, state, pdfPending } = await getDailyReport(project, date);
    return Response.json({
      ...report, state,
      ...(signed ? { signed: { ...signed, countersigned, countersignOutdated, earlierCountersignatures, amendments, pdf: pdfPending ? "preparing" : "stored" } } : {}),
    });
  },
});
export const loader = route.loader;
export const action = route.action;
