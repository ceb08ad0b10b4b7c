import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { archiveProject } from "~/models/project-archive.server";
import type { Route } from "./+types/api.projects.$projectId.archive";

// Archiving takes no body; one that is sent is still read (and must be empty or `{}`).
const noBodySchema = z.object({}).strict();

const route = apiRoute<Route.ActionArgs>({
  // POST (manager) → 200 {archivedAt, archivedBy}: the project is read-only from now on; 409 when it is archived already.
  async POST({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "project.archive");
    await readApiBody(request, noBodySchema);
    return Response.json(await archiveProject(project, user, { ip: clientAddress(request) }));
  },
});
export const loader = route.loader;
export const action = route.action;
