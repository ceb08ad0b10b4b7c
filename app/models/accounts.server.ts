import { Op, fn, col } from "sequelize";
import { z } from "zod";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { canManageAccounts } from "~/lib/auth/permissions";
import { endSessions } from "~/lib/auth/session.server";
import type { UserView } from "~/lib/auth/users.server";
import { Membership, Project, SignInSession, User, getSequelize, type Role } from "~/lib/db.server";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "~/lib/errors";
import { randomBytes } from "node:crypto";
import { hashPassword } from "~/lib/auth/password.server";
import { normaliseEmail } from "~/lib/auth/users.server";
import { requestPasswordReset } from "~/models/password-reset.server";
import { urlIdSchema } from "~/lib/http/url-id";

/**
 * The site admin's account management: every account with its memberships, disabling and
 * re-enabling an account, allowing it to create projects. Every change is audited site-wide.
 */
export interface AccountView {
  id: number;
  name: string;
  email: string;
  isSiteAdmin: boolean;
  mayCreateProjects: boolean;
  disabledAt: string | null;
  /** The newest session's start; null when the account never signed in since sessions were kept. */
  lastSignInAt: string | null;
  memberships: Array<{ projectId: number; projectName: string; role: Role }>;
}

export function assertMayManageAccounts(user: UserView): void {
  if (!canManageAccounts(user)) throw new ForbiddenError("Only a site administrator may manage accounts.");
}

/** What the site admin's account list and the API are filtered by: name or e-mail containing `search`. */
function accountsMatching(search: string) {
  const term = search.trim();
  // LIKE's own wildcards in the search are taken literally.
  const pattern = `%${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return term ? { [Op.or]: [{ name: { [Op.like]: pattern } }, { email: { [Op.like]: pattern } }] } : {};
}

/** Every account (or those whose name or e-mail contains `search`), by name. */
export async function listAccounts(actingUser: UserView, search = ""): Promise<AccountView[]> {
  assertMayManageAccounts(actingUser);
  const users = await User.findAll({ where: accountsMatching(search), order: [["name", "ASC"], ["id", "ASC"]] });
  return presentAccounts(users);
}

/** Accounts shown a page at a time on the site admin's list. */
export const ACCOUNTS_PER_PAGE = 50;

/**
 * One page (1-based) of the accounts whose name or e-mail contains `search`, by name, with the
 * number matching; a page past the last gives the last page.
 */
export async function listAccountPage(actingUser: UserView, search: string, page: number): Promise<{ accounts: AccountView[]; total: number; page: number; pages: number }> {
  assertMayManageAccounts(actingUser);
  const where = accountsMatching(search);
  const total = await User.count({ where });
  const pages = Math.max(1, Math.ceil(total / ACCOUNTS_PER_PAGE));
  const shown = Math.min(Math.max(1, page), pages);
  const users = await User.findAll({ where, order: [["name", "ASC"], ["id", "ASC"]], limit: ACCOUNTS_PER_PAGE, offset: (shown - 1) * ACCOUNTS_PER_PAGE });
  return { accounts: await presentAccounts(users), total, page: shown, pages };
}

async function presentAccounts(users: User[]): Promise<AccountView[]> {
  const ids = users.map((user) => user.id);
  if (ids.length === 0) return [];
  const memberships = await Membership.findAll({ where: { userId: ids }, attributes: ["userId", "projectId", "role"], raw: true });
  const projectIds = [...new Set(memberships.map((m) => m.projectId))];
  const projects = projectIds.length ? await Project.findAll({ where: { id: projectIds }, attributes: ["id", "name"], raw: true }) : [];
  const projectName = new Map(projects.map((p) => [p.id, p.name]));
  const lastSessions = (await SignInSession.findAll({
    where: { userId: ids },
    attributes: ["userId", [fn("MAX", col("createdAt")), "lastAt"]],
    group: ["userId"],
    raw: true,
  })) as unknown as Array<{ userId: number; lastAt: Date | string }>;
  const lastAt = new Map(lastSessions.map((row) => [row.userId, new Date(row.lastAt).toISOString()]));
  return users.map((user) => ({
    id: user.id,
    name: user.name,
    email: user.email,
    isSiteAdmin: user.isSiteAdmin,
    mayCreateProjects: user.mayCreateProjects,
    disabledAt: user.disabledAt ? user.disabledAt.toISOString() : null,
    lastSignInAt: lastAt.get(user.id) ?? null,
    memberships: memberships
      .filter((m) => m.userId === user.id)
      .map((m) => ({ projectId: m.projectId, projectName: projectName.get(m.projectId) ?? `Project ${m.projectId}`, role: m.role }))
      .sort((a, b) => a.projectName.localeCompare(b.projectName)),
  }));
}

export const accountPatchSchema = z
  .object({
    disabled: z.boolean({ message: "disabled must be true or false." }).optional(),
    mayCreateProjects: z.boolean({ message: "mayCreateProjects must be true or false." }).optional(),
  })
  .strict()
  .refine((patch) => patch.disabled !== undefined || patch.mayCreateProjects !== undefined, { message: "Send disabled or mayCreateProjects (true or false) to change." });
export type AccountPatch = z.infer<typeof accountPatchSchema>;

/**
 * Disables or re-enables an account, allows or stops it creating projects. Disabling ends every
 * session of the account in the same transaction (its API tokens stop through getUserView);
 * re-enabling restores sign-in, not the ended sessions. A site admin cannot disable themself.
 */
export async function updateAccount(actingUser: UserView, userId: number, patch: AccountPatch, options: { ip: string | null }): Promise<AccountView> {
  assertMayManageAccounts(actingUser);
  if (patch.disabled === true && userId === actingUser.id) {
    throw new ValidationError({ field: "disabled", message: "You cannot disable your own account; ask another site administrator." });
  }
  await getSequelize().transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new NotFoundError("There is no such account.");
    const audit = (action: (typeof AUDIT_ACTIONS)[keyof typeof AUDIT_ACTIONS], detail: Record<string, unknown>) =>
      recordAudit({ action, userId: actingUser.id, ip: options.ip, detail: { accountId: user.id, email: user.email, ...detail } }, transaction);
    if (patch.disabled === true && user.disabledAt === null) {
      await user.update({ disabledAt: new Date(), disabledById: actingUser.id }, { transaction });
      const ended = await endSessions(user.id, "account-disabled", { transaction });
      await audit(AUDIT_ACTIONS.accountDisabled, { sessionsEnded: ended });
    } else if (patch.disabled === false && user.disabledAt !== null) {
      await user.update({ disabledAt: null, disabledById: null }, { transaction });
      await audit(AUDIT_ACTIONS.accountEnabled, {});
    }
    if (patch.mayCreateProjects !== undefined && patch.mayCreateProjects !== user.mayCreateProjects) {
      await user.update({ mayCreateProjects: patch.mayCreateProjects }, { transaction });
      await audit(AUDIT_ACTIONS.accountProjectCreationChanged, { mayCreateProjects: patch.mayCreateProjects });
    }
  });
  const [view] = await presentAccounts([(await User.findByPk(userId))!]);
  return view;
}

/** An account id as a URL carries it (decimal digits, no leading zero), or a NotFoundError. */
export function parseAccountId(raw: string | undefined): number {
  const parsed = urlIdSchema.safeParse(raw);
  if (!parsed.success) throw new NotFoundError("There is no such account.");
  return parsed.data;
}

/** Sends the account a password-reset link (the same link "Forgot password" sends). */
export async function sendAccountPasswordReset(actingUser: UserView, userId: number, origin: string, ip: string | null): Promise<AccountView> {
  assertMayManageAccounts(actingUser);
  const user = await User.findByPk(userId);
  if (!user) throw new NotFoundError("There is no such account.");
  await requestPasswordReset(user.email, origin, ip ?? "", new Date(), { byAdmin: true });
  await recordAudit({ action: AUDIT_ACTIONS.accountPasswordResetSent, userId: actingUser.id, ip, detail: { accountId: user.id, email: user.email } });
  const [view] = await presentAccounts([user]);
  return view;
}

/**
 * A new account with no usable password (a random one nobody knows): it receives a reset link
 * and chooses its password there. Project access comes later, by invitation or project creation.
 */
export async function createAccount(actingUser: UserView, input: { name: string; email: string }, origin: string, ip: string | null): Promise<AccountView> {
  assertMayManageAccounts(actingUser);
  const email = normaliseEmail(input.email);
  if (await User.findOne({ where: { email } })) throw new ConflictError({ field: "email", message: `${email} already has an account.` });
  const user = await User.create({ email, name: input.name.trim(), passwordHash: await hashPassword(randomBytes(24).toString("base64url")) });
  await recordAudit({ action: AUDIT_ACTIONS.accountCreated, userId: actingUser.id, ip, detail: { accountId: user.id, email } });
  await requestPasswordReset(email, origin, ip ?? "", new Date(), { byAdmin: true });
  const [view] = await presentAccounts([user]);
  return view;
}
