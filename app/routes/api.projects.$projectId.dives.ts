import { z } from "zod";
import { NO_DECOMPRESSION_CAUTION, NO_DECOMPRESSION_SOURCE } from "../../shared/no-decompression";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { BadRequestError } from "~/lib/errors";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { workDateSchema } from "~/models/assignments.server";
import { diveInputSchema, listCellDives, listDivesOn, recordDive } from "~/models/dives.server";
import type { Route } from "./+types/api.projects.$projectId.dives";

const querySchema = z.union([
  z.object({ date: workDateSchema }).strict(),
  z.object({ cell: z.string().trim().min(1).max(16) }).strict(),
]);

const route = apiRoute<Route.LoaderArgs>({
  // GET ?date=YYYY-MM-DD | ?cell=<label> — logged dives (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const query = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
    if (!query.success) throw new BadRequestError("Ask for ?date=YYYY-MM-DD or ?cell=<label>.");
    const dives = "date" in query.data ? await listDivesOn(project, query.data.date) : await listCellDives(project, query.data.cell);
    if (dives === null) throw new BadRequestError({ field: "cell", message: `"${"cell" in query.data ? query.data.cell : ""}" is not a cell label.` });
    return Response.json({ dives, caution: NO_DECOMPRESSION_CAUTION, source: NO_DECOMPRESSION_SOURCE });
  },
  // POST {date, team, diver, leftSurface?, leftBottom?, bottomMinutes?, maxDepth, cells, notes} as JSON: dive supervisors and managers only.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dives.log");
    const input = await readApiBody(request, diveInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => Response.json(await recordDive(access.project, access.user, input, clientAddress(request)), { status: 201 }));
  },
});
export const loader = route.loader;
export const action = route.action;
