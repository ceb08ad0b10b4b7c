import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { createStation, listStations, stationInputSchema } from "~/models/water-quality.server";
import type { Route } from "./+types/api.projects.$projectId.water-quality.stations";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the monitoring stations (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ stations: await listStations(project) });
  },
  // POST {name, kind, position?: {x, y}, depth?, rule?} as JSON (manager) → 201 {id}.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "water-quality.configure");
    const input = await readApiBody(request, stationInputSchema, { formats: ["json"] });
    return Response.json(await createStation(project, user, input, clientAddress(request)), { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
