import type { Transaction } from "sequelize";
import { AuditEvent, User } from "~/lib/db.server";
import type { ProjectView } from "~/lib/auth/project-view.server";

/** Every action Firmsand records; later issues add imports, assignments and the like. */
export const AUDIT_ACTIONS = {
  signIn: "sign-in",
  signOut: "sign-out",
  signInFailed: "sign-in-failed",
  invite: "invite",
  inviteRevoked: "invite-revoked",
  inviteAccepted: "invite-accepted",
  memberAdded: "member-added",
  roleChanged: "role-changed",
  memberRemoved: "member-removed",
  passwordResetRequested: "password-reset-requested",
  passwordReset: "password-reset",
  passwordChanged: "password-changed",
  apiTokenCreated: "api-token-created",
  apiTokenRevoked: "api-token-revoked",
  surveyImported: "survey-imported",
  surveyRetracted: "survey-retracted",
  surveyRestored: "survey-restored",
  assignmentCreated: "assignment-created",
  planEmailed: "plan-emailed",
  shorelineUploaded: "shoreline-uploaded",
  shorelineReplaced: "shoreline-replaced",
  shorelineRemoved: "shoreline-removed",
  diveRecorded: "dive-recorded",
  shareLinkCreated: "share-link-created",
  shareLinkUpdated: "share-link-updated",
  shareLinkRevoked: "share-link-revoked",
  projectCreated: "project-created",
  projectSettingsChanged: "project-settings-changed",
  accountDisabled: "account-disabled",
  accountEnabled: "account-enabled",
  accountProjectCreationChanged: "account-project-creation-changed",
  accountPasswordResetSent: "account-password-reset-sent",
  accountCreated: "account-created",
  payPeriodSigned: "pay-period-signed",
  dewateringShiftRecorded: "dewatering-shift-recorded",
  tubeRegistered: "tube-registered",
  tubeFilled: "tube-filled",
  tubeStatusChanged: "tube-status-changed",
  haulSiteAdded: "haul-site-added",
  haulRecorded: "haul-recorded",
  sedimentSampleRecorded: "sediment-sample-recorded",
  dewateringSettingsChanged: "dewatering-settings-changed",
  waterQualityConfigured: "water-quality-configured",
  turbidityRuleAdded: "turbidity-rule-added",
  monitoringStationAdded: "monitoring-station-added",
  waterQualityReadingRecorded: "water-quality-reading-recorded",
  stopWorkOpened: "stop-work-opened",
  stopWorkAgencyNotified: "stop-work-agency-notified",
  stopWorkResumed: "stop-work-resumed",
  wildlifeSightingRecorded: "wildlife-sighting-recorded",
  findLogged: "find-logged",
  findPhotoAdded: "find-photo-added",
  findCustodyRecorded: "find-custody-recorded",
  findStatusChanged: "find-status-changed",
  findsExported: "finds-exported",
  holdPlaced: "hold-placed",
  holdNoticeRecorded: "hold-notice-recorded",
  holdLifted: "hold-lifted",
  dailyReportNotesEntered: "daily-report-notes-entered",
  dailyReportSigned: "daily-report-signed",
  dailyReportAmended: "daily-report-amended",
} as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[keyof typeof AUDIT_ACTIONS];

export interface AuditInput {
  action: AuditAction;
  projectId?: number | null;
  userId?: number | null;
  ip?: string | null;
  detail?: Record<string, unknown>;
}

export async function recordAudit(input: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    { action: input.action, projectId: input.projectId ?? null, userId: input.userId ?? null, ip: input.ip ?? null, detail: input.detail ?? {} },
    { transaction },
  );
}

export interface AuditEventView {
  id: number;
  at: string;
  action: string;
  actor: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
}

export const AUDIT_PAGE_SIZE = 50;

/** One page (newest first) of the project's audit log, including its members' sign-ins. */
export async function listProjectAuditEvents(project: ProjectView, page: number) {
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: { projectId: project.id },
    include: [{ model: User, as: "user", attributes: ["name", "email"] }],
    order: [["createdAt", "DESC"], ["id", "DESC"]],
    limit: AUDIT_PAGE_SIZE,
    offset: (page - 1) * AUDIT_PAGE_SIZE,
  });
  const events: AuditEventView[] = rows.map((event) => ({
    id: Number(event.id),
    at: event.createdAt.toISOString(),
    action: event.action,
    actor: event.user ? `${event.user.name} <${event.user.email}>` : null,
    detail: event.detail,
    ip: event.ip,
  }));
  return { events, page, pageCount: Math.max(1, Math.ceil(count / AUDIT_PAGE_SIZE)), total: count };
}
