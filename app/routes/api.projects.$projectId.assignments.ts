import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody, readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { assignmentInputSchema, createAssignments, getDayPlan, workDateSchema } from "~/models/assignments.server";
import type { Route } from "./+types/api.projects.$projectId.assignments";

const querySchema = z.object({ date: workDateSchema });

const route = apiRoute<Route.LoaderArgs>({
  // GET ?date=YYYY-MM-DD — the day's plan (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const { date } = readApiQuery(request, querySchema);
    return Response.json(await getDayPlan(project, date));
  },
  // POST {date, team, cells, hose, notes, bottomTimeMinutes?, reason?} as JSON: dive supervisors and managers only.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "plans.assign");
    const input = await readApiBody(request, assignmentInputSchema, { formats: ["json"] });
    return Response.json(await createAssignments(project, user, input, clientAddress(request)), { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
