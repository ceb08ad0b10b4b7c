import { requireApiAccess } from "~/lib/api/access.server";
import { stagedFileDigest, withApiPhotoUpload } from "~/lib/api/photos.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce, idempotencyKeyOf } from "~/lib/api/idempotency.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { addCustodyFormPhoto } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId.custody.$custodyId.form-photo";

const route = apiRoute<Route.LoaderArgs>({
  // POST multipart `file` (a photo of the signed paper custody form: JPEG, PNG or WebP, at most 20 MB) → 201 {id}:
  // kept as the find's photo through the one photo path and named on the handover; one per handover (409 after).
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const { user, project } = access;
    idempotencyKeyOf(request);
    const findId = urlIdSchema.safeParse(params.findId);
    if (!findId.success) throw new NotFoundError("There is no such find in this project.");
    const custodyId = urlIdSchema.safeParse(params.custodyId);
    if (!custodyId.success) throw new NotFoundError("There is no such handover of this find.");
    return withApiPhotoUpload(request, async (file) =>
      answerOnce(request, access, { findId: findId.data, custodyId: custodyId.data, sha256: await stagedFileDigest(file.path) }, async () => {
        const photo = await addCustodyFormPhoto(project, user, findId.data, custodyId.data, file, clientAddress(request));
        return Response.json(photo, { status: 201, headers: { Location: `/api/projects/${project.id}/finds/${findId.data}/photos/${photo.id}` } });
      }),
    );
  },
});
export const loader = route.loader;
export const action = route.action;
