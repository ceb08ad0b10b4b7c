import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { recomputeProjectFigures } from "~/models/project-setup.server";
import type { Route } from "./+types/api.projects.$projectId.recomputes";

// Starting a recompute again takes no body; one that is sent is still read (and must be empty or `{}`).
const noBodySchema = z.object({}).strict();

const route = apiRoute<Route.ActionArgs>({
  // POST (manager) → 202 {id, url, started}: every survey's figures recomputed with the settings in
  // force, in the background (the job already waiting or running when there is one: started false).
  async POST({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "project.configure");
    await readApiBody(request, noBodySchema);
    const { jobId, started } = await recomputeProjectFigures(project, user);
    const url = `/api/projects/${project.id}/recomputes/${jobId}`;
    return Response.json({ id: jobId, url, started }, { status: 202, headers: { Location: url } });
  },
});
export const loader = route.loader;
export const action = route.action;
