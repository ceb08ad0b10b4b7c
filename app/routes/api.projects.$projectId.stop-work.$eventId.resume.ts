import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { resumeInputSchema, resumeStopWork } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.stop-work.$eventId.resume";

const route = apiRoute<Route.ActionArgs>({
  // POST {note} as JSON (manager, resource monitor) → 200 {event}; 409 while no resample at the
  // station is within the limit.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "stop-work.resume");
    const eventId = urlIdSchema.safeParse(params.eventId);
    if (!eventId.success) throw new NotFoundError("There is no such stop-work event on this project.");
    const input = await readApiBody(request, resumeInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json({ event: await resumeStopWork(access.project, access.user, eventId.data, input.note, clientAddress(request)) }));
  },
});
export const loader = route.loader;
export const action = route.action;
