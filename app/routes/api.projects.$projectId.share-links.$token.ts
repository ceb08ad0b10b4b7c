import { clientAddress } from "~/lib/client-address.server";
import { jsonError, requireApiRole } from "~/lib/import/api-access.server";
import { revokeShareLink } from "~/models/share-links.server";
import type { Route } from "./+types/api.projects.$projectId.share-links.$token";

// DELETE: revokes the share link with this token: 204, after which /share/<token> answers 404.

export async function loader() {
  return jsonError(405, "Use DELETE to revoke a share link.");
}

export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "DELETE") return jsonError(405, "Use DELETE to revoke a share link.");
  const { project, user } = await requireApiRole(request, params.projectId, "share-links.manage");
  const revoked = await revokeShareLink(project, user, { token: params.token }, clientAddress(request));
  if (!revoked) return jsonError(404, "There is no live share link with this token on this project.");
  return new Response(null, { status: 204 });
}
