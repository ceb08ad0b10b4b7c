import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { photoQuerySchema, photoResponse } from "~/lib/api/photos.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { jarTestPhotoBytes } from "~/models/jar-tests.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.jar-tests.$jarTestId.photos.$photoId";

const route = apiRoute<Route.LoaderArgs>({
  // GET [?size=thumb] — the photo's bytes (any member, like the jar tests); never cached by shared caches.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const jarTestId = urlIdSchema.safeParse(params.jarTestId);
    const photoId = urlIdSchema.safeParse(params.photoId);
    if (!jarTestId.success || !photoId.success) throw new NotFoundError("There is no such photo of this jar test.");
    const { size } = readApiQuery(request, photoQuerySchema);
    return photoResponse(await jarTestPhotoBytes(project, jarTestId.data, photoId.data, size));
  },
});
export const loader = route.loader;
export const action = route.action;
