import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { createDiveTeam, listDiveTeams, teamInputSchema } from "~/models/dive-teams.server";
import type { Route } from "./+types/api.projects.$projectId.teams";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the dive teams, those in service first, then the retired ones (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ teams: await listDiveTeams(project, { retired: true }), minTeamSize: project.minTeamSize });
  },
  // POST {name, members?, hoses?, station?} (manager, dive supervisor) → 201 {id, team}; 409 naming name when taken.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "teams.manage");
    const input = await readApiBody(request, teamInputSchema, { formats: ["json"] });
    const team = await createDiveTeam(project, user, input, { ip: clientAddress(request) });
    return Response.json({ id: team.id, team }, { status: 201, headers: { Location: `/api/projects/${project.id}/teams/${team.id}` } });
  },
});
export const loader = route.loader;
export const action = route.action;
