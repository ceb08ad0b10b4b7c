import { requireApiUser } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { assertMayCreateProjects, createProject, newProjectSchema } from "~/models/project-setup.server";
import type { Route } from "./+types/api.projects";

const route = apiRoute<Route.LoaderArgs>({
  // POST — a new project from its settings (JSON: the work limit and zones are GeoJSON) → 201 {"id"}.
  // A site admin, or a user a site admin has allowed to create projects.
  async POST({ request }) {
    const user = await requireApiUser(request);
    assertMayCreateProjects(user);
    const input = await readApiBody(request, newProjectSchema, { formats: ["json"] });
    const created = await createProject(user, input, { ip: clientAddress(request) });
    return Response.json({ id: created.id }, { status: 201, headers: { Location: `/api/projects/${created.id}` } });
  },
});
export const loader = route.loader;
export const action = route.action;
