import { requireApiUser } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { NotFoundError } from "~/lib/errors";
import type { Route } from "./+types/api.$";

// Any other /api address: the API's JSON 404 (after the usual 401 for no credential), never the
// HTML page a browser gets.
async function notFound({ request }: Route.LoaderArgs): Promise<Response> {
  await requireApiUser(request);
  throw new NotFoundError(`There is no API route at ${new URL(request.url).pathname}.`);
}

const route = apiRoute<Route.LoaderArgs>({ GET: notFound, POST: notFound, PUT: notFound, PATCH: notFound, DELETE: notFound });
export const loader = route.loader;
export const action = route.action;
