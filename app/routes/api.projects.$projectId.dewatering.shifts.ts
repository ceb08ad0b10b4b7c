import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody, readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { workDateSchema } from "~/models/assignments.server";
import { DEWATERING_CAUTION, listShifts, recordShift, shiftInputSchema } from "~/models/dewatering.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.shifts";

const querySchema = z.object({ from: workDateSchema.optional(), to: workDateSchema.optional() }).strict();

const route = apiRoute<Route.LoaderArgs>({
  // GET ?from=&to= (YYYY-MM-DD, both optional) — the shift log with each shift's figures (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const range = readApiQuery(request, querySchema);
    return Response.json({ shifts: await listShifts(project, range), caution: DEWATERING_CAUTION });
  },
  // POST a shift as JSON (dewatering operator, manager) → 201 {id, computed, shift}; 200 when its idempotency key was used before.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, shiftInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      const { shift, replayed } = await recordShift(access.project, access.user, input, clientAddress(request));
      return Response.json({ id: shift.id, computed: shift.computed, shift, caution: DEWATERING_CAUTION }, { status: replayed ? 200 : 201 });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
