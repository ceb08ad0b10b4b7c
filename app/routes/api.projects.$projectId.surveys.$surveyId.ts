import { z } from "zod";
import { clientAddress } from "~/lib/client-address.server";
import { jsonError, requireApiRole } from "~/lib/import/api-access.server";
import { setSurveyStatus } from "~/lib/import/commit.server";
import { getSurveyDetails } from "~/models/survey.server";
import type { Route } from "./+types/api.projects.$projectId.surveys.$surveyId";

// GET: one survey with its QA. DELETE {reason}: retract (manager; soft delete, statistics
// recomputed). PATCH {status: "active"}: restore (manager).

const surveyIdSchema = z.coerce.number().int().positive();
const retractSchema = z.object({ reason: z.string().trim().min(3, "give a reason of at least 3 characters").max(2000) });
const patchSchema = z.object({ status: z.enum(["active", "retracted"]), reason: z.string().trim().max(2000).optional() });

async function readJson(request: Request): Promise<unknown> {
  const text = await request.text();
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
  } catch {
    throw jsonError(400, "The body is not valid JSON.");
  }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireApiRole(request, params.projectId);
  const surveyId = surveyIdSchema.safeParse(params.surveyId);
  const survey = surveyId.success ? await getSurveyDetails(project, surveyId.data) : null;
  if (!survey) return jsonError(404, "There is no such survey in this project.");
  return Response.json({ survey }, { headers: { "Cache-Control": "no-store" } });
}

export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "DELETE" && request.method !== "PATCH") return jsonError(405, "Use DELETE to retract or PATCH to restore.");
  const { project, user } = await requireApiRole(request, params.projectId, "surveys.retract");
  const surveyId = surveyIdSchema.safeParse(params.surveyId);
  if (!surveyId.success) return jsonError(404, "There is no such survey in this project.");
  const body = await readJson(request);
  let status: "active" | "retracted";
  let reason: string | undefined;
  if (request.method === "DELETE") {
    const parsed = retractSchema.safeParse(body);
    if (!parsed.success) return Response.json({ errors: parsed.error.issues.map((issue) => ({ row: null, column: issue.path.join(".") || "reason", message: issue.message })) }, { status: 422 });
    status = "retracted";
    reason = parsed.data.reason;
  } else {
    const parsed = patchSchema.safeParse(body);
    if (!parsed.success) return Response.json({ errors: parsed.error.issues.map((issue) => ({ row: null, column: issue.path.join(".") || "status", message: issue.message })) }, { status: 422 });
    status = parsed.data.status;
    reason = parsed.data.reason;
    if (status === "retracted" && (!reason || reason.length < 3)) return Response.json({ errors: [{ row: null, column: "reason", message: "give a reason of at least 3 characters" }] }, { status: 422 });
  }
  const survey = await setSurveyStatus({ projectId: project.id, surveyId: surveyId.data, userId: user.id, ip: clientAddress(request), status, reason });
  if (!survey) return jsonError(404, "There is no such survey in this project.");
  return Response.json({ survey: await getSurveyDetails(project, survey.id) });
}
