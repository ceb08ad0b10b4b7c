import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { appOrigin } from "~/lib/http/origin.server";
import { createShareLink, listShareLinks, shareLinkFormSchema } from "~/models/share-links.server";
import type { Route } from "./+types/api.projects.$projectId.share-links";

// Outreach staff and the manager only.
const route = apiRoute<Route.LoaderArgs>({
  // GET — the project's share links (never their tokens).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "share-links.manage");
    return Response.json({ shareLinks: await listShareLinks(project) }, { headers: { "Cache-Control": "no-store" } });
  },
  // POST {name, publicText} as JSON or a form → 201 {"token","url"}; the token is shown this once.
  async POST({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "share-links.manage");
    const input = await readApiBody(request, shareLinkFormSchema);
    const created = await createShareLink(project, user, input, appOrigin(), clientAddress(request));
    return Response.json({ token: created.token, url: created.url }, { status: 201, headers: { "Cache-Control": "no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
