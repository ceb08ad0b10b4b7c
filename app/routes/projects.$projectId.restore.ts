import { redirect } from "react-router";
import { requireRole } from "~/lib/auth/access.server";
import { ConflictError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { readPageForm } from "~/lib/http/body.server";
import { restoreProject } from "~/models/project-archive.server";
import type { Route } from "./+types/projects.$projectId.restore";

// The archived banner's "Restore" button posts here (a site admin).

export function loader({ params }: Route.LoaderArgs) {
  // Restoring changes state, so it takes a POST; a GET goes to the project.
  return redirect(`/projects/${params.projectId}`);
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "project.restore");
  await readPageForm(request);
  try {
    await restoreProject(project, user, { ip: clientAddress(request) });
  } catch (error) {
    if (error instanceof ConflictError) throw new Response(error.message, { status: 409, statusText: "Conflict" });
    throw error;
  }
  return redirect(`/projects/${project.id}`);
}
