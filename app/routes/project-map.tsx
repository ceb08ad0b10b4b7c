import { requireRole } from "~/lib/access.server";
import type { Route } from "./+types/project-map";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  return { hasWorkLimit: project.hasWorkLimit };
}

export default function ProjectMap({ loaderData }: Route.ComponentProps) {
  return (
    <section aria-labelledby="map">
      <h2 id="map" className="text-lg font-semibold">Map</h2>
      <p className="mt-2 rounded border border-dashed border-line bg-panel p-6 text-muted">
        {loaderData.hasWorkLimit
          ? "The cell map appears here once the first survey has been processed."
          : "Set the project's work limit to see it on the map."}
      </p>
    </section>
  );
}
