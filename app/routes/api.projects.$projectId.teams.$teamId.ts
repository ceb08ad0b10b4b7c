import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { listDiveTeams, removeDiveTeam, retiredBecause, teamPatchSchema, updateDiveTeam } from "~/models/dive-teams.server";
import type { Route } from "./+types/api.projects.$projectId.teams.$teamId";

// Removing takes no body; one that is sent is still read (and must be empty or `{}`), so a
// malformed or oversized body is refused like anywhere else rather than ignored.
const noBodySchema = z.object({}).strict();

function teamIdOf(params: { teamId?: string }): number {
  const teamId = urlIdSchema.safeParse(params.teamId);
  if (!teamId.success) throw new NotFoundError({ field: "teamId", message: "There is no such dive team on this project." });
  return teamId.data;
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — one team (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const id = teamIdOf(params);
    const team = (await listDiveTeams(project, { retired: true })).find((candidate) => candidate.id === id);
    if (!team) throw new NotFoundError({ field: "teamId", message: "There is no such dive team on this project." });
    return Response.json({ team });
  },
  // PATCH {name?, members?, hoses?, station?, retired?} (manager, dive supervisor) → 200 {team}.
  async PATCH({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "teams.manage");
    const patch = await readApiBody(request, teamPatchSchema, { formats: ["json"] });
    return Response.json({ team: await updateDiveTeam(project, user, teamIdOf(params), patch, { ip: clientAddress(request) }) });
  },
  // DELETE (manager, dive supervisor) → 204 when nothing names the team; 200 {retired: true, team,
  // message} when dives, assignments or finds do: it is retired, never deleted with its history.
  async DELETE({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "teams.manage");
    await readApiBody(request, noBodySchema);
    const removed = await removeDiveTeam(project, user, teamIdOf(params), { ip: clientAddress(request) });
    if (removed.outcome === "deleted") return new Response(null, { status: 204 });
    return Response.json({ retired: true, team: removed.team, records: removed.records, message: retiredBecause(removed.records) });
  },
});
export const loader = route.loader;
export const action = route.action;
