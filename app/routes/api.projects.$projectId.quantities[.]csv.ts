import { requireRole } from "~/lib/access.server";
import { loadQuantities, quantitiesCsv } from "~/models/quantities.server";
import type { Route } from "./+types/api.projects.$projectId.quantities[.]csv";

// GET: the quantities CSV (header block, zone totals, cells) for the manager and viewers, who
// prepare and review pay applications. Text fields are formula-safe (shared/csv-safe).

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "quantities.read");
  const view = await loadQuantities(project);
  const body = `\uFEFF${quantitiesCsv(view, new Date())}`; // BOM: spreadsheets then read yd³ and m³ as UTF-8
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="quantities-project-${project.id}-${view.latest?.surveyedOn ?? "no-survey"}.csv"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
