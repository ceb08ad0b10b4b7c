import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { agencyNoticeInputSchema, recordAgencyNotice } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.stop-work.$eventId.notification";

const route = apiRoute<Route.ActionArgs>({
  // POST {notifiedAt (ISO 8601 with offset), to, how} as JSON (manager, resource monitor) → 200 {event}:
  // the agency notification of an exceedance, when, to whom and how.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "stop-work.resume");
    const eventId = urlIdSchema.safeParse(params.eventId);
    if (!eventId.success) throw new NotFoundError("There is no such stop-work event on this project.");
    const input = await readApiBody(request, agencyNoticeInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json({ event: await recordAgencyNotice(access.project, access.user, eventId.data, input, clientAddress(request)) }));
  },
});
export const loader = route.loader;
export const action = route.action;
