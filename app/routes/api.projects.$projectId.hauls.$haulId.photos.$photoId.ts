import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { photoQuerySchema, photoResponse } from "~/lib/api/photos.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { haulPhotoBytes } from "~/models/hauls.server";
import type { Route } from "./+types/api.projects.$projectId.hauls.$haulId.photos.$photoId";

const route = apiRoute<Route.LoaderArgs>({
  // GET [?size=thumb] — the photo's bytes (any member, like the haul tickets); never cached by shared caches.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const haulId = urlIdSchema.safeParse(params.haulId);
    const photoId = urlIdSchema.safeParse(params.photoId);
    if (!haulId.success || !photoId.success) throw new NotFoundError("There is no such photo of this haul ticket.");
    const { size } = readApiQuery(request, photoQuerySchema);
    return photoResponse(await haulPhotoBytes(project, haulId.data, photoId.data, size));
  },
});
export const loader = route.loader;
export const action = route.action;
