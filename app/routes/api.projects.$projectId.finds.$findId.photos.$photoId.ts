import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { photoQuerySchema, photoResponse } from "~/lib/api/photos.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { findPhotoBytes } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId.photos.$photoId";

const route = apiRoute<Route.LoaderArgs>({
  // GET [?size=thumb] — the photo's bytes, only after the same permission check as its find; never cached by shared caches.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "finds.read");
    const findId = urlIdSchema.safeParse(params.findId);
    const photoId = urlIdSchema.safeParse(params.photoId);
    if (!findId.success || !photoId.success) throw new NotFoundError("There is no such photo of this find.");
    const { size } = readApiQuery(request, photoQuerySchema);
    return photoResponse(await findPhotoBytes(project, findId.data, photoId.data, size));
  },
});
export const loader = route.loader;
export const action = route.action;
