import { z } from "zod";
import { requireRole } from "~/lib/access.server";
import { getCellDetail } from "~/models/cells.server";
import type { Route } from "./+types/api.projects.$projectId.cells.$label";

const labelSchema = z.string().trim().min(1).max(16);

// GET /api/projects/<id>/cells/<label> — one cell's figures, soundings, history and assignments.
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const label = labelSchema.safeParse(params.label);
  const detail = label.success ? await getCellDetail(project, label.data) : null;
  if (!detail) return Response.json({ error: `There is no cell "${params.label}" with figures in this project.` }, { status: 404 });
  return Response.json(detail);
}
