import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { listSamples, recordSample, sampleInputSchema } from "~/models/sediment-samples.server";
import type { Route } from "./+types/api.projects.$projectId.sediment-samples";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the lab results (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ samples: await listSamples(project) });
  },
  // POST a lab result as JSON (manager, resource monitor) → 201 {sample}.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "samples.record");
    const input = await readApiBody(request, sampleInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json({ sample: await recordSample(access.project, access.user, input, clientAddress(request)) }, { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
