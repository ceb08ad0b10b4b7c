import { requireRole } from "~/lib/auth/access.server";
import { receivePageUpload } from "~/lib/import/page-upload.server";
import type { Route } from "./+types/projects.$projectId.surveys.upload";

// The upload page's script posts here (XMLHttpRequest, so it can show bytes sent) and gets JSON back.
export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "surveys.import");
  const result = await receivePageUpload(request, project, user);
  return result.ok ? Response.json({ location: result.location }) : Response.json({ errors: result.errors }, { status: result.status });
}
