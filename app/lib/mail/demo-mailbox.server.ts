import { requireSiteAdmin } from "../auth/access.server";
import { getEnv } from "../settings/env.server";

/** The demo mailbox exists only in demo mode, and only site admins may read it. */
export async function requireDemoMailbox(request: Request) {
  if (!getEnv().DEMO_MODE) throw new Response("The demo mailbox is only available in demo mode.", { status: 404, statusText: "Not Found" });
  return requireSiteAdmin(request);
}
