import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { basketLoadInputSchema, logBasketLoad } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds.baskets";

const route = apiRoute<Route.LoaderArgs>({
  // POST JSON {lines: [{category, description, count?, volume?: {value, unit: gal|ft3|L|m3}, material?, taxon?, element?}] (each line a
  // count, a volume or both), cell?, position?: {x, y}, depthBelowSurface?, depthInMuck?, foundAt, diveId?, teamId?, finder?, fieldTag?,
  // condition?} → 201 {finds: [{id, catalogueNumber, category, count, volume}]} (count or volume null when not given), a catalogue
  // entry per line, in one transaction; the same Idempotency-Key again → 200 with the first answer.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.log");
    const input = await readApiBody(request, basketLoadInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      const { replayed, ...logged } = await logBasketLoad(access.project, access.user, input, clientAddress(request));
      return Response.json(logged, { status: replayed ? 200 : 201 });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
