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
import { ApiToken, initApiToken } from "./api-token";
import { CellResult, initCellResult } from "./cell-result";
import { ColumnMapping, initColumnMapping } from "./column-mapping";
import { ImportJob, initImportJob } from "./import-job";
import { Sounding, initSounding } from "./sounding";
import { Survey, initSurvey } from "./survey";
import { SurveySnapshot, initSurveySnapshot } from "./survey-snapshot";
import { ShareLink, initShareLink } from "./share-link";
import { Assignment, initAssignment } from "./assignment";
import { DiveTeam, initDiveTeam } from "./dive-team";
import { Shoreline, initShoreline } from "./shoreline";
import { Dive, initDive } from "./dive";
import { DiveCell, initDiveCell } from "./dive-cell";
import { SignInSession, initSignInSession } from "./sign-in-session";
import { Find, initFind } from "./find";
import { FindCustody, initFindCustody } from "./find-custody";
import { FindPhoto, initFindPhoto } from "./find-photo";
import { FindSequence, initFindSequence } from "./find-sequence";
import { Hold, initHold } from "./hold";
import { HoldCell, initHoldCell } from "./hold-cell";
import { HoldNotice, initHoldNotice } from "./hold-notice";

export { AuditEvent, Invitation, LoginAttempt, Membership, PasswordReset, Project, User, Zone };
export { ROLES, ROLE_LABELS, isRole, type Role } from "./roles";
export { LENGTH_UNITS, type LengthUnit } from "./project";
export { ApiToken, CellResult, ColumnMapping, ImportJob, Sounding, Survey, SurveySnapshot };
export { SURVEY_KINDS, SURVEY_STATUSES, type SurveyKind, type SurveyStatus } from "./survey";
export { IMPORT_JOB_STATES, type ImportJobState } from "./import-job";
export { ShareLink };
export { Assignment, DiveTeam, Shoreline };
export { Dive, DiveCell };
export { SignInSession };
export type { DiveTeamMember } from "./dive-team";
export { Find, FindCustody, FindPhoto, FindSequence, Hold, HoldCell, HoldNotice };
export { photoExifSchema, type PhotoExif } from "./find-photo";

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
  initSurvey(sequelize);
  initSounding(sequelize);
  initCellResult(sequelize);
  initSurveySnapshot(sequelize);
  initColumnMapping(sequelize);
  initImportJob(sequelize);
  initApiToken(sequelize);
  initShareLink(sequelize);
  initDiveTeam(sequelize);
  initAssignment(sequelize);
  initShoreline(sequelize);
  initDive(sequelize);
  initDiveCell(sequelize);
  initSignInSession(sequelize);
  initFind(sequelize);
  initFindSequence(sequelize);
  initFindPhoto(sequelize);
  initFindCustody(sequelize);
  initHold(sequelize);
  initHoldCell(sequelize);
  initHoldNotice(sequelize);

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
  User.hasMany(SignInSession, { foreignKey: "userId", as: "sessions" });
  AuditEvent.belongsTo(User, { foreignKey: "userId", as: "user" });
  AuditEvent.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  // Survey import (issue 4).
  Project.hasMany(Survey, { foreignKey: "projectId", as: "surveys" });
  Survey.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Survey.belongsTo(User, { foreignKey: "uploadedById", as: "uploadedBy" });
  Survey.belongsTo(User, { foreignKey: "retractedById", as: "retractedBy" });
  Survey.hasMany(Sounding, { foreignKey: "surveyId", as: "soundings" });
  Sounding.belongsTo(Survey, { foreignKey: "surveyId", as: "survey" });
  Project.hasMany(CellResult, { foreignKey: "projectId", as: "cellResults" });
  CellResult.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  CellResult.belongsTo(Zone, { foreignKey: "zoneId", as: "zone" });
  CellResult.belongsTo(Survey, { foreignKey: "latestSurveyId", as: "latestSurvey" });
  Project.hasMany(SurveySnapshot, { foreignKey: "projectId", as: "snapshots" });
  SurveySnapshot.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  SurveySnapshot.belongsTo(Survey, { foreignKey: "lastSurveyId", as: "lastSurvey" });
  Project.hasOne(ColumnMapping, { foreignKey: "projectId", as: "columnMapping" });
  ColumnMapping.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  ColumnMapping.belongsTo(User, { foreignKey: "updatedById", as: "updatedBy" });
  Project.hasMany(ImportJob, { foreignKey: "projectId", as: "importJobs" });
  ImportJob.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  ImportJob.belongsTo(User, { foreignKey: "userId", as: "user" });
  ImportJob.belongsTo(Survey, { foreignKey: "surveyId", as: "survey" });
  User.hasMany(ApiToken, { foreignKey: "userId", as: "apiTokens" });
  ApiToken.belongsTo(User, { foreignKey: "userId", as: "user" });
  // Dive plans (issue 5).
  Project.hasMany(DiveTeam, { foreignKey: "projectId", as: "diveTeams" });
  DiveTeam.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Project.hasMany(Assignment, { foreignKey: "projectId", as: "assignments" });
  Assignment.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  DiveTeam.hasMany(Assignment, { foreignKey: "teamId", as: "assignments" });
  Assignment.belongsTo(DiveTeam, { foreignKey: "teamId", as: "team" });
  Assignment.belongsTo(User, { foreignKey: "createdById", as: "createdBy" });
  Project.hasOne(Shoreline, { foreignKey: "projectId", as: "shoreline" });
  Shoreline.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Shoreline.belongsTo(User, { foreignKey: "uploadedById", as: "uploadedBy" });
  // The dive log (issue 5): dives made on assigned cells.
  Project.hasMany(Dive, { foreignKey: "projectId", as: "dives" });
  Dive.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  DiveTeam.hasMany(Dive, { foreignKey: "teamId", as: "dives" });
  Dive.belongsTo(DiveTeam, { foreignKey: "teamId", as: "team" });
  Dive.belongsTo(User, { foreignKey: "recordedById", as: "recordedBy" });
  Dive.hasMany(DiveCell, { foreignKey: "diveId", as: "cells" });
  DiveCell.belongsTo(Dive, { foreignKey: "diveId", as: "dive" });
  DiveCell.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  // Public share links (issue 6).
  Project.hasMany(ShareLink, { foreignKey: "projectId", as: "shareLinks" });
  ShareLink.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  ShareLink.belongsTo(User, { foreignKey: "createdById", as: "createdBy" });
  ShareLink.belongsTo(User, { foreignKey: "revokedById", as: "revokedBy" });
  // Finds (issue 17): photos, custody, and the holds around cultural finds.
  Project.hasMany(Find, { foreignKey: "projectId", as: "finds" });
  Find.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Find.belongsTo(Dive, { foreignKey: "diveId", as: "dive" });
  Find.belongsTo(DiveTeam, { foreignKey: "teamId", as: "team" });
  Find.belongsTo(User, { foreignKey: "loggedById", as: "loggedBy" });
  FindSequence.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Find.hasMany(FindPhoto, { foreignKey: "findId", as: "photos" });
  FindPhoto.belongsTo(Find, { foreignKey: "findId", as: "find" });
  FindPhoto.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  FindPhoto.belongsTo(User, { foreignKey: "uploadedById", as: "uploadedBy" });
  Find.hasMany(FindCustody, { foreignKey: "findId", as: "custody" });
  FindCustody.belongsTo(Find, { foreignKey: "findId", as: "find" });
  FindCustody.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  FindCustody.belongsTo(FindPhoto, { foreignKey: "formPhotoId", as: "formPhoto" });
  FindCustody.belongsTo(User, { foreignKey: "recordedById", as: "recordedBy" });
  Project.hasMany(Hold, { foreignKey: "projectId", as: "holds" });
  Hold.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Find.hasOne(Hold, { foreignKey: "findId", as: "hold" });
  Hold.belongsTo(Find, { foreignKey: "findId", as: "find" });
  Hold.belongsTo(User, { foreignKey: "liftedById", as: "liftedBy" });
  Hold.hasMany(HoldCell, { foreignKey: "holdId", as: "cells" });
  HoldCell.belongsTo(Hold, { foreignKey: "holdId", as: "hold" });
  HoldCell.belongsTo(Project, { foreignKey: "projectId", as: "project" });
  Hold.hasMany(HoldNotice, { foreignKey: "holdId", as: "notices" });
  HoldNotice.belongsTo(Hold, { foreignKey: "holdId", as: "hold" });
  HoldNotice.belongsTo(User, { foreignKey: "toldById", as: "toldBy" });

  initialised = sequelize;
  return sequelize;
}
