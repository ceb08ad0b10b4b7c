import { endSessions } from "./session.server";
import { hashPassword, verifyPassword } from "~/lib/auth/password.server";
import { User } from "~/lib/db.server";

export interface UserView {
  id: number;
  email: string;
  name: string;
  isSiteAdmin: boolean;
  mayCreateProjects: boolean;
}

export function presentUser(user: User): UserView {
  return { id: user.id, email: user.email, name: user.name, isSiteAdmin: user.isSiteAdmin, mayCreateProjects: user.mayCreateProjects };
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function findUserByEmail(email: string): Promise<User | null> {
  return User.findOne({ where: { email: normaliseEmail(email) } });
}

/**
 * The user as a request acts for them, or null: a deleted or disabled account acts for nobody, so
 * a session or API token of a disabled account stops the moment the account is disabled.
 */
export async function getUserView(userId: number): Promise<UserView | null> {
  const user = await User.findByPk(userId);
  return user && user.disabledAt === null ? presentUser(user) : null;
}

/** The acting user renames themself. */
export async function updateOwnName(actingUser: UserView, name: string): Promise<void> {
  await User.update({ name }, { where: { id: actingUser.id } });
}

/**
 * The acting user changes their own password, proving they know the current one. Every other
 * session of theirs ends (someone who knew the old password may be signed in elsewhere); the
 * session `keepSessionId` that made the change stays.
 */
export async function changeOwnPassword(actingUser: UserView, currentPassword: string, newPassword: string, keepSessionId: number | null): Promise<"changed" | "wrong-password"> {
  const user = await User.findByPk(actingUser.id);
  if (!user || !(await verifyPassword(currentPassword, user.passwordHash))) return "wrong-password";
  user.passwordHash = await hashPassword(newPassword);
  await user.save();
  await endSessions(user.id, "password-changed", { except: keepSessionId });
  return "changed";
}
