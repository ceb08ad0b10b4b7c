import { z } from "zod";
import { NO_DECOMPRESSION_CAUTION, NO_DECOMPRESSION_SOURCE } from "../../shared/no-decompression";
import { requireRole } from "~/lib/access.server";
import { readJsonInput } from "~/lib/json-body.server";
import { clientAddress } from "~/lib/client-address.server";
import { workDateSchema } from "~/models/assignments.server";
import { diveInputSchema, listCellDives, listDivesOn, recordDive } from "~/models/dives.server";
import type { Route } from "./+types/api.projects.$projectId.dives";

const querySchema = z.union([
  z.object({ date: workDateSchema }).strict(),
  z.object({ cell: z.string().trim().min(1).max(16) }).strict(),
], { error: "ask for ?date=YYYY-MM-DD or ?cell=<label>" });

// GET /api/projects/<id>/dives?date=YYYY-MM-DD | ?cell=<label> — logged dives (any member).
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const query = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!query.success) return Response.json({ error: "Ask for ?date=YYYY-MM-DD or ?cell=<label>." }, { status: 400 });
  const dives = "date" in query.data ? await listDivesOn(project, query.data.date) : await listCellDives(project, query.data.cell);
  if (dives === null) return Response.json({ error: `"${"cell" in query.data ? query.data.cell : ""}" is not a cell label.` }, { status: 400 });
  return Response.json({ dives, caution: NO_DECOMPRESSION_CAUTION, source: NO_DECOMPRESSION_SOURCE });
}

// POST /api/projects/<id>/dives — {date, team, diver, leftSurface?, leftBottom?, bottomMinutes?, maxDepth, cells, notes}: dive supervisors and managers only.
export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return Response.json({ error: "Use POST." }, { status: 405 });
  const { user, project } = await requireRole(request, params.projectId, "dives.log");
  const input = await readJsonInput(request, diveInputSchema);
  if ("response" in input) return input.response;
  const outcome = await recordDive(project, user, input.data, clientAddress(request));
  return Response.json(outcome.body, { status: outcome.status });
}
