import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { custodyInputSchema, recordCustody } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId.custody";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {fromName, toName, place, purpose, handedAt, receiverSignature, note?} → 201 {id, status}.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const findId = urlIdSchema.safeParse(params.findId);
    if (!findId.success) throw new NotFoundError("There is no such find in this project.");
    const input = await readApiBody(request, custodyInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json(await recordCustody(access.project, access.user, findId.data, input, clientAddress(request)), { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
