import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { signDailyReport, signInputSchema, dayParam } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.sign";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {name} → 201 with the signed report; 409 once signed. The typed name is the signature.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, signInputSchema, { formats: ["json"] });
    const { report, signed, countersigned, amendments, state, pdfPending } = await signDailyReport(project, user, date, input.name, clientAddress(request));
    return Response.json({ ...report, state, signed: { ...signed, countersigned, amendments, pdf: pdfPending ? "preparing" : "stored" } }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
