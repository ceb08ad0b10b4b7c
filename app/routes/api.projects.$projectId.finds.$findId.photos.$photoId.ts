import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { findPhotoBytes } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.$findId.photos.$photoId";

const querySchema = z.object({ size: z.enum(["full", "thumb"], { message: "size is full or thumb" }).default("full") }).strict();

const route = apiRoute<Route.LoaderArgs>({
  // GET [?size=thumb] — the photo's bytes, only after the same permission check as its find; never cached by shared caches.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "finds.read");
    const findId = urlIdSchema.safeParse(params.findId);
    const photoId = urlIdSchema.safeParse(params.photoId);
    if (!findId.success || !photoId.success) throw new NotFoundError("There is no such photo of this find.");
    const { size } = readApiQuery(request, querySchema);
    const photo = await findPhotoBytes(project, findId.data, photoId.data, size);
    return new Response(new Uint8Array(photo.bytes), {
      headers: { "Content-Type": photo.contentType, "Content-Length": String(photo.bytes.byteLength), "Cache-Control": "private, no-store" },
    });
  },
});
export const loader = route.loader;
export const action = route.action;
