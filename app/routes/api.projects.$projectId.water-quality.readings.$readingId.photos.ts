import { requireApiAccess } from "~/lib/api/access.server";
import { stagedFileDigest, withApiPhotoUpload } from "~/lib/api/photos.server";
import { answerOnce, idempotencyKeyOf } from "~/lib/api/idempotency.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { addReadingPhoto } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.water-quality.readings.$readingId.photos";

const route = apiRoute<Route.LoaderArgs>({
  // POST multipart `file` (JPEG, PNG or WebP, at most 20 MB; manager, dewatering operator, resource monitor) → 201 {id}; stored without its metadata, with a thumbnail.
  async POST({ request, params }) {
    // The role is checked before the body is read, so a refused upload never reaches the disk.
    const access = await requireApiAccess(request, params.projectId, "water-quality.record");
    const { user, project } = access;
    idempotencyKeyOf(request); // a malformed key is refused before the photo is read
    const readingId = urlIdSchema.safeParse(params.readingId);
    if (!readingId.success) throw new NotFoundError({ field: "readingId", message: "There is no such reading on this project." });
    // The key's fingerprint is the photo's digest: the same picture sent again is the same entry.
    return withApiPhotoUpload(request, async (file) =>
      answerOnce(request, access, { readingId: readingId.data, sha256: await stagedFileDigest(file.path) }, async () => {
        const photo = await addReadingPhoto(project, user, readingId.data, file, clientAddress(request));
        return Response.json(photo, { status: 201, headers: { Location: `/api/projects/${project.id}/water-quality/readings/${readingId.data}/photos/${photo.id}` } });
      }),
    );
  },
});
export const loader = route.loader;
export const action = route.action;
