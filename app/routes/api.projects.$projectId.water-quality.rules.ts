import { WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { createRule, listRules, ruleInputSchema } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.water-quality.rules";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the permit's turbidity rules, newest (in force) first (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ rules: await listRules(project), caution: WATER_QUALITY_CAUTION });
  },
  // POST {kind, limit?, inclusive?, percent?, floor?, cap?, pairingWindowMinutes?, notifyWithinHours?, source} as JSON (manager) → 201 {id}.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "water-quality.configure");
    const input = await readApiBody(request, ruleInputSchema, { formats: ["json"] });
    return Response.json(await createRule(project, user, input, clientAddress(request)), { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
