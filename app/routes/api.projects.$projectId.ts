import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { getProjectSettings, projectPatchSchema, updateProjectSettings } from "~/models/project-setup.server";
import type { Route } from "./+types/api.projects.$projectId";

// The project's settings (the manager).
const route = apiRoute<Route.LoaderArgs>({
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "project.configure");
    return Response.json({ settings: await getProjectSettings(project) }, { headers: { "Cache-Control": "no-store" } });
  },
  // PATCH — any settings; a change the figures rest on is recomputed before the answer (200).
  async PATCH({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "project.configure");
    const patch = await readApiBody(request, projectPatchSchema, { formats: ["json"] });
    const { settings, recomputed } = await updateProjectSettings(project, user, patch, { ip: clientAddress(request) });
    return Response.json({ settings, recomputed });
  },
});
export const loader = route.loader;
export const action = route.action;
