import type { Sequelize } from "sequelize";
import { getSequelize } from "../connection.server";
import { AuditEvent, initAuditEvent } from "./audit-event";
import { Invitation, initInvitation } from "./invitation";
import { LoginAttempt, initLoginAttempt } from "./login-attempt";
import { Membership, initMembership } from "./membership";
import { PasswordReset, initPasswordReset } from "./password-reset";
import { Project, initProject } from "./project";
import { User, initUser } from "./user";
import { Zone, initZone } from "./zone";

export { AuditEvent, Invitation, LoginAttempt, Membership, PasswordReset, Project, User, Zone };
export { ROLES, ROLE_LABELS, isRole, type Role } from "./roles";
export { LENGTH_UNITS, type LengthUnit } from "./project";

let initialised: Sequelize | undefined;

/**
 * Initialises every model on the process's Sequelize instance and wires the associations, once.
 * Later issues add their models here. The schema itself comes from db/migrations only.
 */
export function initModels(): Sequelize {
  const sequelize = getSequelize();
  if (initialised === sequelize) return sequelize;
  initUser(sequelize);
  initProject(sequelize);
  initZone(sequelize);
  initMembership(sequelize);
  initInvitation(sequelize);
  initPasswordReset(sequelize);
  initAuditEvent(sequelize);
  initLoginAttempt(sequelize);

  // Associations, all in one place, with explicit foreign keys.
  Project.hasMany(Zone, { foreignKey: "projectId", as: "zones" });
  Zone.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Project.hasMany(Membership, { foreignKey: "projectId", as: "memberships" });
  Membership.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  User.hasMany(Membership, { foreignKey: "userId", as: "memberships" });
  Membership.belongsTo(User, { foreignKey: "userId", as: "user" });
  Project.hasMany(Invitation, { foreignKey: "projectId", as: "invitations" });
  Invitation.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Invitation.belongsTo(User, { foreignKey: "invitedById", as: "invitedBy" });
  User.hasMany(PasswordReset, { foreignKey: "userId", as: "passwordResets" });
  PasswordReset.belongsTo(User, { foreignKey: "userId", as: "user" });
  AuditEvent.belongsTo(User, { foreignKey: "userId", as: "user" });
  AuditEvent.belongsTo(Project, { foreignKey: "projectId", as: "project" });

  initialised = sequelize;
  return sequelize;
}
