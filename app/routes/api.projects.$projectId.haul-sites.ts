import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { addHaulSite, haulSiteInputSchema, listHaulSites } from "~/models/hauls.server";
import type { Route } from "./+types/api.projects.$projectId.haul-sites";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the sites dewatered solids go to, by name (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ sites: await listHaulSites(project) });
  },
  // POST {name, kind: "reuse"|"disposal", permitNumber} (dewatering operator, manager) → 201 {site}; 409 when the name is taken.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, haulSiteInputSchema, { formats: ["json"] });
    return Response.json({ site: await addHaulSite(project, user, input, clientAddress(request)) }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
