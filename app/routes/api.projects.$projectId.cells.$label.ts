import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { getCellDetail } from "~/models/cell-detail.server";
import type { Route } from "./+types/api.projects.$projectId.cells.$label";

const labelSchema = z.string().trim().min(1).max(16);

const route = apiRoute<Route.LoaderArgs>({
  // GET — one cell's figures, soundings, history and assignments.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const label = labelSchema.safeParse(params.label);
    const detail = label.success ? await getCellDetail(project, label.data) : null;
    if (!detail) throw new NotFoundError(`There is no cell "${params.label}" with figures in this project.`);
    return Response.json(detail);
  },
});
export const loader = route.loader;
export const action = route.action;
