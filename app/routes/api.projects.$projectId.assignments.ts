import { z } from "zod";
import { requireRole } from "~/lib/access.server";
import { readJsonInput } from "~/lib/json-body.server";
import { clientAddress } from "~/lib/client-address.server";
import { assignmentInputSchema, createAssignments, getDayPlan, workDateSchema } from "~/models/assignments.server";
import type { Route } from "./+types/api.projects.$projectId.assignments";

const querySchema = z.object({ date: workDateSchema });

// GET /api/projects/<id>/assignments?date=YYYY-MM-DD — the day's plan (any member).
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const query = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!query.success) return Response.json({ error: query.error.issues.map((issue) => issue.message).join("; ") }, { status: 400 });
  return Response.json(await getDayPlan(project, query.data.date));
}

// POST /api/projects/<id>/assignments — {date, team, cells, hose, notes}: dive supervisors and managers only.
export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return Response.json({ error: "Use POST." }, { status: 405 });
  const { user, project } = await requireRole(request, params.projectId, "plans.assign");
  const input = await readJsonInput(request, assignmentInputSchema);
  if ("response" in input) return input.response;
  const outcome = await createAssignments(project, user, input.data, clientAddress(request));
  return Response.json(outcome.body, { status: outcome.status });
}
