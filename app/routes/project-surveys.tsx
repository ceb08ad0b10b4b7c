import { requireRole } from "~/lib/access.server";
import type { Route } from "./+types/project-surveys";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireRole(request, params.projectId);
  return {};
}

export default function ProjectSurveys() {
  return (
    <section aria-labelledby="surveys">
      <h2 id="surveys" className="text-lg font-semibold">Surveys</h2>
      <p className="mt-2 rounded border border-dashed border-line bg-panel p-6 text-muted">
        No surveys yet. Survey technicians upload sounding files here after each pass.
      </p>
    </section>
  );
}
