import { Op, type Transaction, type WhereOptions } from "sequelize";
import { AuditEvent, User } from "~/lib/db.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { instantOfLocal, localClockOf, localDayOf } from "../../../shared/local-time";

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
  surveyBiasSet: "survey-bias-set",
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
  tubeMoved: "tube-moved",
  haulSiteAdded: "haul-site-added",
  haulRecorded: "haul-recorded",
  haulPhotoAdded: "haul-photo-added",
  jarTestRecorded: "jar-test-recorded",
  jarTestPhotoAdded: "jar-test-photo-added",
  sedimentSampleRecorded: "sediment-sample-recorded",
  dewateringSettingsChanged: "dewatering-settings-changed",
  waterQualityConfigured: "water-quality-configured",
  turbidityRuleAdded: "turbidity-rule-added",
  monitoringStationAdded: "monitoring-station-added",
  waterQualityReadingRecorded: "water-quality-reading-recorded",
  waterQualityReadingJudged: "water-quality-reading-judged",
  waterQualityReadingPhotoAdded: "water-quality-reading-photo-added",
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
  dailyReportCountersignRequested: "daily-report-countersign-requested",
  dailyReportCountersigned: "daily-report-countersigned",
  reportSubscriberAdded: "report-subscriber-added",
  reportSubscriberRemoved: "report-subscriber-removed",
  dailyReportBatchSent: "daily-report-batch-sent",
  teamCreated: "team-created",
  teamChanged: "team-changed",
  teamRetired: "team-retired",
  teamReturned: "team-returned",
  teamDeleted: "team-deleted",
  projectArchived: "project-archived",
  projectRestored: "project-restored",
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

/** Every recorded action, for the audit log's filter. */
export const AUDIT_ACTION_NAMES = Object.values(AUDIT_ACTIONS) as AuditAction[];

export { auditActionLabel } from "./action-label";

export interface AuditEventView {
  id: number;
  at: string;
  /** Local date and time in the project's time zone (YYYY-MM-DD, HH:MM). */
  localDay: string;
  localTime: string;
  action: string;
  actor: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
}

export const AUDIT_PAGE_SIZE = 50;

/** What the audit log is narrowed to: a person, an action, local days from and to (inclusive, in the project's time zone). */
export interface AuditFilter {
  userId?: number;
  action?: AuditAction;
  from?: string;
  to?: string;
}

function auditWhere(project: ProjectView, filter: AuditFilter): WhereOptions {
  const createdAt: Record<symbol, Date> = {};
  if (filter.from) createdAt[Op.gte] = new Date(instantOfLocal(filter.from, 0, project.timeZone));
  // Up to the start of the next local day: the whole of `to` is included, whatever its length.
  if (filter.to) createdAt[Op.lt] = new Date(instantOfLocal(filter.to, 24 * 60, project.timeZone));
  return {
    projectId: project.id,
    ...(filter.userId ? { userId: filter.userId } : {}),
    ...(filter.action ? { action: filter.action } : {}),
    ...(filter.from || filter.to ? { createdAt } : {}),
  };
}

/** The people who appear in the project's audit log, for its person filter (name order). */
export async function listAuditPeople(project: ProjectView): Promise<Array<{ id: number; name: string; email: string }>> {
  const rows = (await AuditEvent.findAll({ where: { projectId: project.id, userId: { [Op.ne]: null } }, attributes: ["userId"], group: ["userId"], raw: true })) as unknown as Array<{ userId: number }>;
  if (rows.length === 0) return [];
  const users = await User.findAll({ where: { id: rows.map((row) => row.userId) }, attributes: ["id", "name", "email"], order: [["name", "ASC"], ["id", "ASC"]] });
  return users.map((user) => ({ id: user.id, name: user.name, email: user.email }));
}

/** One page (newest first) of the project's audit log, including its members' sign-ins, narrowed by `filter`. */
export async function listProjectAuditEvents(project: ProjectView, page: number, filter: AuditFilter = {}) {
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: auditWhere(project, filter),
    include: [{ model: User, as: "user", attributes: ["name", "email"] }],
    order: [["createdAt", "DESC"], ["id", "DESC"]],
    limit: AUDIT_PAGE_SIZE,
    offset: (page - 1) * AUDIT_PAGE_SIZE,
  });
  const events: AuditEventView[] = rows.map((event) => ({
    id: Number(event.id),
    at: event.createdAt.toISOString(),
    localDay: localDayOf(event.createdAt.getTime(), project.timeZone),
    localTime: localClockOf(event.createdAt.getTime(), project.timeZone),
    action: event.action,
    actor: event.user ? `${event.user.name} <${event.user.email}>` : null,
    detail: event.detail,
    ip: event.ip,
  }));
  return { events, page, pageCount: Math.max(1, Math.ceil(count / AUDIT_PAGE_SIZE)), total: count };
}
