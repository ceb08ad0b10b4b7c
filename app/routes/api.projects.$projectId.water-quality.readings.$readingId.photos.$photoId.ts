import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { photoQuerySchema, photoResponse } from "~/lib/api/photos.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { readingPhotoBytes } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.water-quality.readings.$readingId.photos.$photoId";

const route = apiRoute<Route.LoaderArgs>({
  // GET [?size=thumb] — the photo's bytes (any member, like the readings); never cached by shared caches.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const readingId = urlIdSchema.safeParse(params.readingId);
    const photoId = urlIdSchema.safeParse(params.photoId);
    if (!readingId.success || !photoId.success) throw new NotFoundError("There is no such photo of this reading.");
    const { size } = readApiQuery(request, photoQuerySchema);
    return photoResponse(await readingPhotoBytes(project, readingId.data, photoId.data, size));
  },
});
export const loader = route.loader;
export const action = route.action;
