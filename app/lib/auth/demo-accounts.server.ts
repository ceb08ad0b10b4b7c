import { DEMO_USERS } from "../../../db/seeders/demo-scenario";
import { ROLE_LABELS } from "~/lib/db.server";

/** The demo sign-ins listed on the sign-in page (demo mode only). */
export function demoAccounts(): Array<{ email: string; role: string }> {
  return DEMO_USERS.map((user) => ({
    email: user.email,
    role: user.role ? ROLE_LABELS[user.role] : "Site administrator",
  }));
}
