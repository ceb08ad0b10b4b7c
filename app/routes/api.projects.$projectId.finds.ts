import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { findInputSchema, listFinds, logFind } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the catalogue (finds.read); cell, position, depths, dive and team only for roles that may see locations.
  async GET({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.read");
    return Response.json({ finds: await listFinds(access.project, access) }, { headers: { "Cache-Control": "no-store" } });
  },
  // POST JSON {category, description, cell?, position?: {x, y}, depthBelowSurface?, depthInMuck?, foundAt, diveId?, finder?, count?, taxon?, element?, material?, condition?, fieldTag?, idempotencyKey?}
  // → 201 {id, catalogueNumber, hold?: {id, cells}}; the same idempotency key again → 200 with the first answer.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const input = await readApiBody(request, findInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      const { replayed, ...logged } = await logFind(access.project, access.user, input, clientAddress(request));
      return Response.json(logged, { status: replayed ? 200 : 201, headers: { Location: `/api/projects/${access.project.id}/finds/${logged.id}` } });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
