import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { addAmendment, amendmentInputSchema, dayParam } from "~/models/daily-reports.server";
import type { Route } from "./+types/api.projects.$projectId.days.$date.amendments";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {text} → 201 with the amendments; 409 while the report is unsigned (edit it instead).
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "reports.sign");
    const date = dayParam(params.date);
    const input = await readApiBody(request, amendmentInputSchema, { formats: ["json"] });
    const { amendments } = await addAmendment(project, user, date, input.text, clientAddress(request));
    return Response.json({ amendments }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
