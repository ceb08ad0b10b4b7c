import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { restoreProject } from "~/models/project-archive.server";
import type { Route } from "./+types/api.projects.$projectId.restore";

// Restoring takes no body; one that is sent is still read (and must be empty or `{}`).
const noBodySchema = z.object({}).strict();

const route = apiRoute<Route.ActionArgs>({
  // POST (site admin) → 200 {archivedAt: null}: the project is open again; 409 when it is not archived.
  async POST({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "project.restore");
    await readApiBody(request, noBodySchema);
    return Response.json(await restoreProject(project, user, { ip: clientAddress(request) }));
  },
});
export const loader = route.loader;
export const action = route.action;
