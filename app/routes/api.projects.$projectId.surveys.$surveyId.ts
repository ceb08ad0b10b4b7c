import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { NotFoundError } from "~/lib/errors";
import { setSurveyStatus } from "~/lib/import/commit.server";
import { getSurveyDetails } from "~/models/survey.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import type { Route } from "./+types/api.projects.$projectId.surveys.$surveyId";

const surveyIdSchema = z.coerce.number().int().positive();
const reasonSchema = z.string().trim().min(3, "give a reason of at least 3 characters").max(2000);
const retractSchema = z.object({ reason: reasonSchema });
const patchSchema = z
  .object({ status: z.enum(["active", "retracted"]), reason: z.string().trim().max(2000).optional() })
  .refine((input) => input.status === "active" || (input.reason ?? "").length >= 3, { path: ["reason"], message: "give a reason of at least 3 characters" });

const noSuchSurvey = () => new NotFoundError("There is no such survey in this project.");

function surveyIdOf(params: { surveyId?: string }): number {
  const surveyId = surveyIdSchema.safeParse(params.surveyId);
  if (!surveyId.success) throw noSuchSurvey();
  return surveyId.data;
}

async function setStatus(request: Request, project: ProjectView, user: UserView, surveyId: number, status: "active" | "retracted", reason: string | undefined) {
  const survey = await setSurveyStatus({ projectId: project.id, surveyId, userId: user.id, ip: clientAddress(request), status, reason });
  if (!survey) throw noSuchSurvey();
  return Response.json({ survey: await getSurveyDetails(project, survey.id) });
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — one survey with its QA (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const survey = await getSurveyDetails(project, surveyIdOf(params));
    if (!survey) throw noSuchSurvey();
    return Response.json({ survey }, { headers: { "Cache-Control": "no-store" } });
  },
  // DELETE {reason} — retract (manager; soft delete, statistics recomputed).
  async DELETE({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "surveys.retract");
    const surveyId = surveyIdOf(params);
    const { reason } = await readApiBody(request, retractSchema);
    return setStatus(request, project, user, surveyId, "retracted", reason);
  },
  // PATCH {status: "active"} — restore (manager); {status: "retracted", reason} retracts.
  async PATCH({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "surveys.retract");
    const surveyId = surveyIdOf(params);
    const { status, reason } = await readApiBody(request, patchSchema);
    return setStatus(request, project, user, surveyId, status, reason);
  },
});
export const loader = route.loader;
export const action = route.action;
