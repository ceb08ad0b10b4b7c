import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { requireApiAccess } from "~/lib/api/access.server";
import { assertMediaType } from "~/lib/api/body.server";
import { BadRequestError, PayloadTooLargeError } from "~/lib/errors";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce, idempotencyKeyOf } from "~/lib/api/idempotency.server";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { discardStagedFile, stageUpload, UploadRefused } from "~/lib/import/stage-upload.server";
import { addFindPhoto } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId.photos";

/** SHA-256 (hex) of a staged file, read as a stream. */
async function fileDigest(path: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

const route = apiRoute<Route.LoaderArgs>({
  // POST multipart `file` (JPEG, PNG or WebP, at most 20 MB) → 201 {id}; stored without its metadata, with a thumbnail.
  async POST({ request, params }) {
    // The role is checked before the body is read, so a refused upload never reaches the disk.
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const { user, project } = access;
    idempotencyKeyOf(request); // a malformed key is refused before the photo is read
    const findId = urlIdSchema.safeParse(params.findId);
    if (!findId.success) throw new NotFoundError("There is no such find in this project.");
    assertMediaType(request, "multipart/form-data");
    let staged;
    try {
      staged = await stageUpload(request, { maxBytes: PHOTO_MAX_BYTES, advice: "Send the photo at a smaller size (a phone's normal setting is well under it)." });
    } catch (error) {
      if (error instanceof UploadRefused) throw error.status === 413 ? new PayloadTooLargeError({ field: "file", message: error.message }) : new BadRequestError({ field: "file", message: error.message });
      throw error;
    }
    try {
      if (!staged.file) throw new ValidationError({ field: "file", message: "no photo was sent in the `file` field" });
      const file = staged.file;
      // The key's fingerprint is the photo's digest: the same picture sent again is the same entry.
      return await answerOnce(request, access, { findId: findId.data, sha256: await fileDigest(file.path) }, async () => {
        const photo = await addFindPhoto(project, user, findId.data, file, clientAddress(request));
        return Response.json(photo, { status: 201, headers: { Location: `/api/projects/${project.id}/finds/${findId.data}/photos/${photo.id}` } });
      });
    } finally {
      if (staged.file) await discardStagedFile(staged.file.path);
    }
  },
});
export const loader = route.loader;
export const action = route.action;
