import { DEMO_USERS } from "../../../db/seeders/demo-scenario";
import { roleLabel } from "~/lib/auth/roles";

/** The demo sign-ins listed on the sign-in page (demo mode only). */
export function demoAccounts(): Array<{ email: string; role: string }> {
  return DEMO_USERS.map((user) => ({
    email: user.email,
    role: roleLabel(user.role ?? null),
  }));
}
