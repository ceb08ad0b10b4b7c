import { Membership, User, getSequelize, type Role } from "~/lib/db.server";
import { ConflictError, NotFoundError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";

export interface MemberView {
  membershipId: number;
  userId: number;
  name: string;
  email: string;
  role: Role;
}

export async function listMembers(project: ProjectView): Promise<MemberView[]> {
  const memberships = await Membership.findAll({
    where: { projectId: project.id },
    include: [{ model: User, as: "user", required: true }],
    order: [[{ model: User, as: "user" }, "name", "ASC"]],
  });
  return memberships.map((m) => ({ membershipId: m.id, userId: m.userId, name: m.user!.name, email: m.user!.email, role: m.role }));
}

async function otherManagerCount(project: ProjectView, exceptMembershipId: number): Promise<number> {
  const managers = await Membership.findAll({ where: { projectId: project.id, role: "manager" }, attributes: ["id"] });
  return managers.filter((m) => m.id !== exceptMembershipId).length;
}

const noLongerMember = () => new NotFoundError("That person is no longer a member of this project.");

/** A manager changes a member's role; the project always keeps at least one manager (else ConflictError). */
export async function changeMemberRole(project: ProjectView, actingUser: UserView, membershipId: number, role: Role, ip: string): Promise<void> {
  const membership = await Membership.findOne({ where: { id: membershipId, projectId: project.id }, include: [{ model: User, as: "user" }] });
  if (!membership) throw noLongerMember();
  if (membership.role === role) return;
  if (membership.role === "manager" && (await otherManagerCount(project, membership.id)) === 0) {
    throw new ConflictError("A project needs at least one manager: make someone else manager first.");
  }
  const previousRole = membership.role;
  await getSequelize().transaction(async (transaction) => {
    membership.role = role;
    await membership.save({ transaction });
    await recordAudit(
      { action: AUDIT_ACTIONS.roleChanged, projectId: project.id, userId: actingUser.id, ip, detail: { member: membership.user?.email, from: previousRole, to: role } },
      transaction,
    );
  });
}

/** A manager removes a member; the last manager cannot be removed (ConflictError). */
export async function removeMember(project: ProjectView, actingUser: UserView, membershipId: number, ip: string): Promise<void> {
  const membership = await Membership.findOne({ where: { id: membershipId, projectId: project.id }, include: [{ model: User, as: "user" }] });
  if (!membership) throw noLongerMember();
  if (membership.role === "manager" && (await otherManagerCount(project, membership.id)) === 0) {
    throw new ConflictError("A project needs at least one manager: the last manager cannot be removed.");
  }
  await getSequelize().transaction(async (transaction) => {
    await membership.destroy({ transaction });
    await recordAudit(
      { action: AUDIT_ACTIONS.memberRemoved, projectId: project.id, userId: actingUser.id, ip, detail: { member: membership.user?.email, role: membership.role } },
      transaction,
    );
  });
}

export async function isMemberByEmail(project: ProjectView, email: string): Promise<boolean> {
  const user = await User.findOne({ where: { email } });
  if (!user) return false;
  return (await Membership.count({ where: { projectId: project.id, userId: user.id } })) > 0;
}

