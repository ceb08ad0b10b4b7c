import { z } from "zod";
import { verticalBiasSchema } from "../../shared/qa/vertical-bias";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { NotFoundError } from "~/lib/errors";
import { setSurveyVerticalBias } from "~/models/survey.server";
import type { Route } from "./+types/api.projects.$projectId.surveys.$surveyId.bias";

const surveyIdSchema = z.coerce.number().int().positive();
/** `{verticalBias: {value, unit, source}}` records it; `{verticalBias: null}` clears it. */
const biasBodySchema = z.object({ verticalBias: verticalBiasSchema.nullable() });

const route = apiRoute<Route.LoaderArgs>({
  // PUT {verticalBias} — a survey's vertical-reference bias after its import (manager, surveyor), as on the survey's page.
  async PUT({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "surveys.import");
    const surveyId = surveyIdSchema.safeParse(params.surveyId);
    if (!surveyId.success) throw new NotFoundError("There is no such survey in this project.");
    const { verticalBias } = await readApiBody(request, biasBodySchema);
    const saved = await setSurveyVerticalBias(project, { surveyId: surveyId.data, userId: user.id, ip: clientAddress(request), bias: verticalBias });
    if (saved === undefined) throw new NotFoundError("There is no such survey in this project.");
    return Response.json({ verticalBias: saved });
  },
});
export const loader = route.loader;
export const action = route.action;
