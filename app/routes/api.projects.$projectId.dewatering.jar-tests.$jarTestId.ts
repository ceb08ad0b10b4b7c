import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { JAR_TEST_CAUTION, getJarTest } from "~/models/jar-tests.server";
import type { Route } from "./+types/api.projects.$projectId.dewatering.jar-tests.$jarTestId";

const route = apiRoute<Route.LoaderArgs>({
  // GET — one jar test with its jars (bench stock, turbidity removed), the pointed dose and its photos (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    const jarTestId = urlIdSchema.safeParse(params.jarTestId);
    if (!jarTestId.success) throw new NotFoundError({ field: "jarTestId", message: "There is no such jar test on this project." });
    return Response.json({ jarTest: await getJarTest(project, jarTestId.data), caution: JAR_TEST_CAUTION }, { headers: { "Cache-Control": "private, no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
