import { requireApiUser } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { accountPatchSchema, assertMayManageAccounts, parseAccountId, updateAccount } from "~/models/accounts.server";
import type { Route } from "./+types/api.admin.users.$userId";

// One account (the site admin): PATCH {"disabled"?, "mayCreateProjects"?} → 200 {user}.
const route = apiRoute<Route.LoaderArgs>({
  async PATCH({ request, params }) {
    const user = await requireApiUser(request);
    assertMayManageAccounts(user);
    const patch = await readApiBody(request, accountPatchSchema, { formats: ["json"] });
    const account = await updateAccount(user, parseAccountId(params.userId), patch, { ip: clientAddress(request) });
    return Response.json({ user: account });
  },
});
export const loader = route.loader;
export const action = route.action;
