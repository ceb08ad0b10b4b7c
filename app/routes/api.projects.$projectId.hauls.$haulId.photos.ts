import { requireApiAccess } from "~/lib/api/access.server";
import { stagedFileDigest, withApiPhotoUpload } from "~/lib/api/photos.server";
import { answerOnce, idempotencyKeyOf } from "~/lib/api/idempotency.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { addHaulPhoto } from "~/models/hauls.server";
import type { Route } from "./+types/api.projects.$projectId.hauls.$haulId.photos";

const route = apiRoute<Route.LoaderArgs>({
  // POST multipart `file` (JPEG, PNG or WebP, at most 20 MB; dewatering operator, manager) → 201 {id}; stored without its metadata, with a thumbnail.
  async POST({ request, params }) {
    // The role is checked before the body is read, so a refused upload never reaches the disk.
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const { user, project } = access;
    idempotencyKeyOf(request); // a malformed key is refused before the photo is read
    const haulId = urlIdSchema.safeParse(params.haulId);
    if (!haulId.success) throw new NotFoundError("There is no such haul ticket on this project.");
    // The key's fingerprint is the photo's digest: the same picture sent again is the same entry.
    return withApiPhotoUpload(request, async (file) =>
      answerOnce(request, access, { haulId: haulId.data, sha256: await stagedFileDigest(file.path) }, async () => {
        const photo = await addHaulPhoto(project, user, haulId.data, file, clientAddress(request));
        return Response.json(photo, { status: 201, headers: { Location: `/api/projects/${project.id}/hauls/${haulId.data}/photos/${photo.id}` } });
      }),
    );
  },
});
export const loader = route.loader;
export const action = route.action;
