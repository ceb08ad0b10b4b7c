import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { getFind } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId";

const route = apiRoute<Route.LoaderArgs>({
  // GET — one find with its photos (EXIF only for location roles), custody chain and current holder.
  async GET({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.read");
    const findId = urlIdSchema.safeParse(params.findId);
    if (!findId.success) throw new NotFoundError("There is no such find in this project.");
    return Response.json({ find: await getFind(access.project, access, findId.data) }, { headers: { "Cache-Control": "no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
