import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { getRecomputeJob } from "~/models/project-setup.server";
import type { Route } from "./+types/api.projects.$projectId.recomputes.$jobId";

const route = apiRoute<Route.LoaderArgs>({
  // GET (manager) → {state, stage, fraction, error, settingsVersion, summary, summaryText, …}; polled until done or failed.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "project.configure");
    const jobId = z.coerce.number().int().positive().safeParse(params.jobId);
    if (!jobId.success) throw new NotFoundError("There is no such recompute in this project.");
    return Response.json(await getRecomputeJob(project, jobId.data), { headers: { "Cache-Control": "no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
