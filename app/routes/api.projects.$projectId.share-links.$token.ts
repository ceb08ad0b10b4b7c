import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { NotFoundError } from "~/lib/errors";
import { revokeShareLink } from "~/models/share-links.server";
import type { Route } from "./+types/api.projects.$projectId.share-links.$token";

// Revoking takes no body; one that is sent is still read (and must be empty or `{}`), so a
// malformed or oversized body is refused like anywhere else rather than ignored.
const noBodySchema = z.object({}).strict();

const route = apiRoute<Route.ActionArgs>({
  // DELETE — revokes the share link with this token: 204, after which /share/<token> answers 404.
  async DELETE({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "share-links.manage");
    await readApiBody(request, noBodySchema);
    const revoked = await revokeShareLink(project, user, { token: params.token }, clientAddress(request));
    if (!revoked) throw new NotFoundError("There is no live share link with this token on this project.");
    return new Response(null, { status: 204 });
  },
});
export const loader = route.loader;
export const action = route.action;
