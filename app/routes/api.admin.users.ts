import { requireApiUser } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { listAccounts } from "~/models/accounts.server";
import type { Route } from "./+types/api.admin.users";

// Every account (the site admin).
const route = apiRoute<Route.LoaderArgs>({
  async GET({ request }) {
    const user = await requireApiUser(request);
    const search = new URL(request.url).searchParams.get("q") ?? "";
    return Response.json({ users: await listAccounts(user, search.slice(0, 200)) }, { headers: { "Cache-Control": "no-store" } });
  },
});
export const loader = route.loader;
export const action = route.action;
