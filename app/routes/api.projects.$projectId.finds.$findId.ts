import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { readApiBody } from "~/lib/api/body.server";
import { etagOf, IF_MATCH_HEADER, ifMatchVersions } from "~/lib/api/versions";
import { clientAddress } from "~/lib/http/client-address.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { getFind, setFindStatus, statusInputSchema } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId";

function findIdOf(params: { findId?: string }): number {
  const findId = urlIdSchema.safeParse(params.findId);
  if (!findId.success) throw new NotFoundError("There is no such find in this project.");
  return findId.data;
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — one find with its photos (EXIF only for location roles), custody chain, current holder and version (ETag).
  async GET({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.read");
    const find = await getFind(access.project, access, findIdOf(params));
    return Response.json({ find }, { headers: { "Cache-Control": "no-store", ETag: etagOf(find.version) } });
  },
  // PATCH JSON {status, accessionNumber?, note?} (finds.log) → 200 {find}; with If-Match: <version>,
  // 412 {errors, current: find} when the find changed since that version.
  async PATCH({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const findId = findIdOf(params);
    const input = await readApiBody(request, statusInputSchema, { formats: ["json"] });
    const ifMatch = ifMatchVersions(request.headers.get(IF_MATCH_HEADER));
    await setFindStatus(access.project, access.user, findId, input, clientAddress(request), { ifMatch, access });
    const find = await getFind(access.project, access, findId);
    return Response.json({ find }, { headers: { "Cache-Control": "no-store", ETag: etagOf(find.version) } });
  },
});
export const loader = route.loader;
export const action = route.action;
