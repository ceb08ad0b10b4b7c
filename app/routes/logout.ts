import { redirect } from "react-router";
import { getOptionalUser } from "~/lib/auth/access.server";
import { auditForAccount } from "~/lib/auth/sign-in.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { AUDIT_ACTIONS } from "~/lib/audit/audit.server";
import { signOut } from "~/lib/auth/session.server";
import type { Route } from "./+types/logout";

export async function loader() {
  // Signing out changes state, so it takes a POST; a GET just goes home.
  return redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  const user = await getOptionalUser(request);
  if (user) await auditForAccount(user.id, AUDIT_ACTIONS.signOut, clientAddress(request), {});
  return redirect("/login", { headers: { "Set-Cookie": await signOut(request) } });
}
