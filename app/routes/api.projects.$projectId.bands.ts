import { z } from "zod";
import { requireRole } from "~/lib/access.server";
import { getProjectBands } from "~/models/bands.server";
import type { Route } from "./+types/api.projects.$projectId.bands";

const querySchema = z.object({ surface: z.enum(["remaining", "depth"], { message: 'surface is "remaining" or "depth"' }) });

// GET /api/projects/<id>/bands?surface=remaining|depth — filled contour bands as lon/lat GeoJSON.
export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const query = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!query.success) return Response.json({ error: query.error.issues.map((issue) => issue.message).join("; ") }, { status: 400 });
  return Response.json(await getProjectBands(project, query.data.surface));
}
