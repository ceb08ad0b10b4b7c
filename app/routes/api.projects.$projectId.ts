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
  // PATCH — any settings: 200 {settings, settingsVersion, recompute: null}, or, when a change the
  // figures rest on needs every survey recomputed, 202 with the job's address (Location, recompute.url).
  async PATCH({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "project.configure");
    const patch = await readApiBody(request, projectPatchSchema, { formats: ["json"] });
    const { settings, settingsVersion, recompute } = await updateProjectSettings(project, user, patch, { ip: clientAddress(request) });
    if (!recompute) return Response.json({ settings, settingsVersion, recompute: null });
    const url = `/api/projects/${project.id}/recomputes/${recompute.jobId}`;
    return Response.json({ settings, settingsVersion, recompute: { id: recompute.jobId, url } }, { status: 202, headers: { Location: url } });
  },
});
export const loader = route.loader;
export const action = route.action;
