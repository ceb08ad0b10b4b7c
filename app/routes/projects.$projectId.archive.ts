import { redirect } from "react-router";
import { requireRole } from "~/lib/auth/access.server";
import { ConflictError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { readPageForm } from "~/lib/http/body.server";
import { archiveProject } from "~/models/project-archive.server";
import type { Route } from "./+types/projects.$projectId.archive";

// The settings page's "Archive this project" button posts here (the manager); the project's
// pages then show the archived banner.

export function loader({ params }: Route.LoaderArgs) {
  // Archiving changes state, so it takes a POST; a GET goes to the settings page, where the button is.
  return redirect(`/projects/${params.projectId}/settings`);
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "project.archive");
  // The form carries nothing but its button; read within the page limit all the same.
  await readPageForm(request);
  try {
    await archiveProject(project, user, { ip: clientAddress(request) });
  } catch (error) {
    if (error instanceof ConflictError) throw new Response(error.message, { status: 409, statusText: "Conflict" });
    throw error;
  }
  return redirect(`/projects/${project.id}`);
}
