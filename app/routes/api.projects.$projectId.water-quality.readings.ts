import { WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody, readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { listReadings, readingInputSchema, readingQuerySchema, recordReading } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.water-quality.readings";

const route = apiRoute<Route.LoaderArgs>({
  // GET ?from=YYYY-MM-DD&to=YYYY-MM-DD&station=<name or id> — readings by local day (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const query = readApiQuery(request, readingQuerySchema.strict());
    return Response.json({ readings: await listReadings(project, query), caution: WATER_QUALITY_CAUTION });
  },
  // POST {station, takenAt, value, unit, depth?, instrument?, calibratedAt?, note?, …} as JSON →
  // 201 {id, evaluation, verdict, stopWork?} (manager, dewatering operator, resource monitor).
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "water-quality.record");
    const input = await readApiBody(request, readingInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json(await recordReading(access.project, access.user, input, clientAddress(request)), { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
