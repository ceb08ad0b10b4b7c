import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody, readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { answerOnce } from "~/lib/api/idempotency.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { workDateSchema } from "~/models/assignments.server";
import { JAR_TEST_CAUTION, jarTestInputSchema, listJarTests, recordJarTest } from "~/models/jar-tests.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.jar-tests";

const querySchema = z.object({ from: workDateSchema.optional(), to: workDateSchema.optional() }).strict();

const route = apiRoute<Route.LoaderArgs>({
  // GET ?from=&to= (YYYY-MM-DD, both optional) — the jar tests, newest first, each jar with its bench stock and turbidity removed (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const range = readApiQuery(request, querySchema);
    return Response.json({ jarTests: await listJarTests(project, range), caution: JAR_TEST_CAUTION });
  },
  // POST a jar test as JSON (dewatering operator, manager) → 201 {id, jarTest}; 200 when its idempotency key was used before. Photos: POST …/jar-tests/<id>/photos.
  async POST({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "dewatering.log");
    const input = await readApiBody(request, jarTestInputSchema, { formats: ["json"] });
    return answerOnce(request, access, input, async () => {
      const { jarTest, replayed } = await recordJarTest(access.project, access.user, input, null, clientAddress(request));
      return Response.json({ id: jarTest.id, jarTest, caution: JAR_TEST_CAUTION }, { status: replayed ? 200 : 201 });
    });
  },
});
export const loader = route.loader;
export const action = route.action;
