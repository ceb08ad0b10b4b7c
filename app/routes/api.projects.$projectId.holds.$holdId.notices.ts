import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { listHoldNotices, noticeInputSchema, recordHoldNotice } from "~/models/holds.server";
import type { Route } from "./+types/api.projects.$projectId.holds.$holdId.notices";

const holdIdOf = (params: { holdId?: string }) => {
  const holdId = urlIdSchema.safeParse(params.holdId);
  if (!holdId.success) throw new NotFoundError("There is no such hold in this project.");
  return holdId.data;
};

const route = apiRoute<Route.LoaderArgs>({
  // GET — the agencies this hold must be told of and when each was: {notices: [{agency, toldAt, note}]}
  // (for the roles that may see find locations, as on the holds page).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "finds.locations.read");
    return Response.json({ notices: await listHoldNotices(project, holdIdOf(params)) }, { headers: { "Cache-Control": "no-store" } });
  },
  // POST JSON {agency, toldAt, note?} → 201 {agency, toldAt, note}: when the agency was told. Refused when the
  // hold does not list the agency (422), when it was recorded already (409), before the hold or in the future (422).
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "holds.lift");
    const holdId = holdIdOf(params);
    const input = await readApiBody(request, noticeInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json(await recordHoldNotice(access.project, access.user, holdId, input, clientAddress(request)), { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
