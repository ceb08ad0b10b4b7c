import { Op, type Transaction } from "sequelize";
import { Invitation, Membership, Project, User, getSequelize, type OutgoingMailStatus, type Role } from "~/lib/db.server";
import { ConflictError } from "~/lib/errors";
import { UniqueConstraintError } from "sequelize";
import { roleLabel } from "~/lib/auth/roles";
import { mailStates, queueMail } from "~/lib/mail/outbox.server";
import { hashPassword, verifyPassword } from "~/lib/auth/password.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { isMemberByEmail, type MemberView } from "./membership.server";
import { ROLE_LABELS } from "~/lib/auth/roles";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { normaliseEmail, presentUser, type UserView } from "~/lib/auth/users.server";

export const INVITATION_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;

/** The outbox's name for an invitation's mail. */
export const invitationMailRef = (invitationId: number) => `invitation:${invitationId}`;

export interface OpenInvitationView {
  id: number;
  email: string;
  role: Role;
  expiresAt: string;
  invitedBy: string | null;
  /** Whether its mail has gone out: "pending" while the mail server is away, "failed" once given up. */
  mail: OutgoingMailStatus | null;
}

/** Invitations not yet accepted, revoked or expired. */
export async function listOpenInvitations(project: ProjectView, now = new Date()): Promise<OpenInvitationView[]> {
  const invitations = await Invitation.findAll({
    where: { projectId: project.id, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: now } },
    include: [{ model: User, as: "invitedBy" }],
    order: [["createdAt", "DESC"]],
  });
  const mails = await mailStates(invitations.map((i) => invitationMailRef(i.id)));
  return invitations.map((i) => ({
    id: i.id, email: i.email, role: i.role, expiresAt: i.expiresAt.toISOString(), invitedBy: i.invitedBy?.name ?? null,
    mail: mails.get(invitationMailRef(i.id))?.status ?? null,
  }));
}

/**
 * A manager invites someone by e-mail with a role. Any earlier open invitation for the same
 * address is revoked, so only the newest link works. The link goes out by mail. Inviting someone
 * who is already a member is a ConflictError.
 */
export async function createInvitation(
  project: ProjectView, actingUser: UserView, input: { email: string; role: Role }, origin: string, ip: string, now = new Date(),
): Promise<{ token: string }> {
  const email = normaliseEmail(input.email);
  if (await isMemberByEmail(project, email)) throw new ConflictError({ field: "email", message: `${email} is already a member of this project.` });
  const { token, tokenHash } = createLinkToken();
  const expiresAt = new Date(now.getTime() + INVITATION_LIFETIME_MS);
  const link = `${origin}/invite/${token}`;
  await getSequelize().transaction(async (transaction) => {
    await Invitation.update(
      { revokedAt: now },
      { where: { projectId: project.id, email, acceptedAt: null, revokedAt: null }, transaction },
    );
    const invitation = await Invitation.create({ projectId: project.id, email, role: input.role, tokenHash, expiresAt, invitedById: actingUser.id }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.invite, projectId: project.id, userId: actingUser.id, ip, detail: { email, role: input.role } }, transaction);
    // In the same transaction: the invitation and its mail are kept together or not at all.
    await queueMail({
      to: email,
      ref: invitationMailRef(invitation.id),
      subject: `You are invited to ${project.name} on Firmsand`,
      text: [
        `${actingUser.name} invites you to join "${project.name}" on Firmsand as ${roleLabel(input.role, "sentence")}.`,
        "",
        `Open this link to set your password and join: ${link}`,
        "",
        `The link works once and expires on ${expiresAt.toUTCString()}.`,
      ].join("\n"),
    }, transaction);
  });
  return { token };
}

export type MemberAddition = { added: MemberView; invited?: never } | { added?: never; invited: { email: string; role: Role; expiresAt: string } };

/**
 * A manager adds someone by e-mail (the API's way): an existing account joins at once and is told
 * by mail; anyone else gets an invitation. A member already, or a disabled account, is a
 * ConflictError naming `email`.
 */
export async function addMemberByEmail(
  project: ProjectView, actingUser: UserView, input: { email: string; role: Role }, origin: string, ip: string, now = new Date(),
): Promise<MemberAddition> {
  const email = normaliseEmail(input.email);
  const user = await User.findOne({ where: { email } });
  if (!user) {
    await createInvitation(project, actingUser, { email, role: input.role }, origin, ip, now);
    return { invited: { email, role: input.role, expiresAt: new Date(now.getTime() + INVITATION_LIFETIME_MS).toISOString() } };
  }
  if (user.disabledAt) throw new ConflictError({ field: "email", message: `The account ${email} is disabled; a site administrator must re-enable it before it can join.` });
  const roleLabel = ROLE_LABELS[input.role].toLowerCase();
  try {
    const membership = await getSequelize().transaction(async (transaction) => {
      const created = await Membership.create({ projectId: project.id, userId: user.id, role: input.role }, { transaction });
      // Any open invitation for the address is settled by the membership.
      await Invitation.update({ revokedAt: now }, { where: { projectId: project.id, email, acceptedAt: null, revokedAt: null }, transaction });
      await recordAudit({ action: AUDIT_ACTIONS.memberAdded, projectId: project.id, userId: actingUser.id, ip, detail: { member: email, role: input.role } }, transaction);
      await queueMail({
        to: email,
        subject: `You were added to ${project.name} on Firmsand`,
        text: [
          `${actingUser.name} added you to "${project.name}" on Firmsand as ${roleLabel}.`,
          "",
          `Sign in with your Firmsand account to open it: ${origin}/projects/${project.id}`,
        ].join("\n"),
      }, transaction);
      return created;
    });
    return { added: { membershipId: membership.id, userId: user.id, name: user.name, email: user.email, role: membership.role } };
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError({ field: "email", message: `${email} is already a member of this project.` });
    throw error;
  }
}

export async function revokeInvitation(project: ProjectView, actingUser: UserView, invitationId: number, ip: string): Promise<boolean> {
  const invitation = await Invitation.findOne({ where: { id: invitationId, projectId: project.id, acceptedAt: null, revokedAt: null } });
  if (!invitation) return false;
  invitation.revokedAt = new Date();
  await invitation.save();
  await recordAudit({ action: AUDIT_ACTIONS.inviteRevoked, projectId: project.id, userId: actingUser.id, ip, detail: { email: invitation.email } });
  return true;
}

export type InvitationLookup =
  | { status: "open"; invitation: { email: string; role: Role; projectId: number; projectName: string; hasAccount: boolean } }
  | { status: "expired" | "used" | "unknown" };

async function findByToken(token: string, transaction?: Transaction) {
  return Invitation.findOne({
    where: { tokenHash: hashLinkToken(token) },
    include: [{ model: Project, as: "project" }],
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
}

function statusOf(invitation: Invitation | null, now: Date): "open" | "expired" | "used" | "unknown" {
  if (!invitation) return "unknown";
  if (invitation.acceptedAt || invitation.revokedAt) return "used";
  if (invitation.expiresAt.getTime() <= now.getTime()) return "expired";
  return "open";
}

export async function lookUpInvitation(token: string, now = new Date()): Promise<InvitationLookup> {
  const invitation = await findByToken(token);
  const status = statusOf(invitation, now);
  if (status !== "open" || !invitation) return { status: status === "open" ? "unknown" : status };
  const hasAccount = (await User.count({ where: { email: invitation.email } })) > 0;
  return {
    status: "open",
    invitation: { email: invitation.email, role: invitation.role, projectId: invitation.projectId, projectName: invitation.project!.name, hasAccount },
  };
}

export type AcceptInvitationResult =
  | { ok: true; user: UserView; projectId: number }
  | { ok: false; reason: "expired" | "used" | "unknown" | "wrong-password" };

/**
 * Accepts an invitation once: a new person sets their name and password; someone who already
 * has an account proves it with their password. Either way they become a member with the role.
 */
export async function acceptInvitation(
  token: string, input: { name: string; password: string }, ip: string, now = new Date(),
): Promise<AcceptInvitationResult> {
  return getSequelize().transaction(async (transaction) => {
    const invitation = await findByToken(token, transaction);
    const status = statusOf(invitation, now);
    if (status !== "open" || !invitation) return { ok: false, reason: status === "open" ? "unknown" : status };
    let user = await User.findOne({ where: { email: invitation.email }, transaction });
    if (user) {
      if (!(await verifyPassword(input.password, user.passwordHash))) return { ok: false, reason: "wrong-password" };
    } else {
      user = await User.create({ email: invitation.email, name: input.name, passwordHash: await hashPassword(input.password) }, { transaction });
    }
    const existing = await Membership.findOne({ where: { userId: user.id, projectId: invitation.projectId }, transaction });
    if (!existing) await Membership.create({ userId: user.id, projectId: invitation.projectId, role: invitation.role }, { transaction });
    invitation.acceptedAt = now;
    await invitation.save({ transaction });
    await recordAudit(
      { action: AUDIT_ACTIONS.inviteAccepted, projectId: invitation.projectId, userId: user.id, ip, detail: { email: invitation.email, role: invitation.role } },
      transaction,
    );
    return { ok: true, user: presentUser(user), projectId: invitation.projectId };
  });
}
