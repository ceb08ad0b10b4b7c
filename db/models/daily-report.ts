import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { z } from "zod";
import { jsonColumn, jsonObject } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

export const weatherSchema = z.object({
  conditions: z.string(),
  airTemperature: z.string(),
  wind: z.string(),
  rain: z.string(),
  effect: z.string(),
});

/** One piece of equipment's day: hours working, hours idle and, when idle, why (in words). */
export const equipmentLineSchema = z.object({
  name: z.string(),
  workingHours: z.number(),
  idleHours: z.number(),
  idleReason: z.string(),
});

/** A crew's head count entered over the compiled one, with the reason in words (may be empty). */
export const crewHeadCountSchema = z.object({ team: z.string(), headCount: z.number().int(), reason: z.string() });

/** A spell of weather downtime in local wall-clock time on the report's day (HH:MM, the end may be 24:00). */
export const weatherDowntimeSchema = z.object({ start: z.string(), end: z.string(), reason: z.string() });

/** An inspection or a visit with its local times (HH:MM; `left` "" when not entered). */
export const visitorLineSchema = z.object({ arrived: z.string(), left: z.string(), name: z.string(), organisation: z.string(), purpose: z.string() });

/**
 * What the supervisor enters by hand on a day's report. Reports saved before equipment hours, head
 * counts, weather downtime or visitor lines read as none of them; their free-text `inspections` stay.
 */
export const enteredNotesSchema = z.object({
  weather: weatherSchema.nullable(),
  equipment: z.array(equipmentLineSchema).default([]),
  crews: z.array(crewHeadCountSchema).default([]),
  weatherDowntime: z.array(weatherDowntimeSchema).default([]),
  visitors: z.array(visitorLineSchema).default([]),
  inspections: z.string(),
  safety: z.string(),
  notes: z.string(),
});
export type EnteredNotesRecord = z.infer<typeof enteredNotesSchema>;

/**
 * A project's report for one local day: the entered notes and, once signed, the typed name, time
 * and the compiled figures as signed (its shape is checked by shared/daily-report). Locked once signed.
 */
export class DailyReport extends Model<InferAttributes<DailyReport>, InferCreationAttributes<DailyReport>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare localDate: string;
  declare entered: EnteredNotesRecord;
  declare signedByName: string | null;
  declare signedAt: Date | null;
  declare signedById: ForeignKey<User["id"]> | null;
  declare snapshot: Record<string, unknown> | null;
  /** The agency inspector's countersignature: typed name, the address the one-time link went to, time. */
  declare countersignedByName: CreationOptional<string | null>;
  declare countersignedEmail: CreationOptional<string | null>;
  declare countersignedAt: CreationOptional<Date | null>;
  /** A signed report whose PDF is not stored (and sent) yet: the next attempt; null once stored. */
  declare pdfDueAt: CreationOptional<Date | null>;
  declare pdfAttempts: CreationOptional<number>;
  declare pdfLastError: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare amendments?: NonAttribute<DailyReportAmendment[]>;
  declare project?: NonAttribute<Project>;
}

/** A dated correction to a signed daily report, shown beside it. */
export class DailyReportAmendment extends Model<InferAttributes<DailyReportAmendment>, InferCreationAttributes<DailyReportAmendment>> {
  declare id: CreationOptional<number>;
  declare reportId: ForeignKey<DailyReport["id"]>;
  declare text: string;
  declare byName: string;
  declare byId: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
}

/**
 * A one-time link, sent by e-mail, that lets the agency's inspector countersign a signed report
 * without an account. Only the token's SHA-256 is stored; the link is spent once used.
 */
export class CountersignRequest extends Model<InferAttributes<CountersignRequest>, InferCreationAttributes<CountersignRequest>> {
  declare id: CreationOptional<number>;
  declare reportId: ForeignKey<DailyReport["id"]>;
  declare email: string;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare revokedAt: CreationOptional<Date | null>;
  /** Once used: the inspector's typed name, and how many amendments the report carried then (the version countersigned). */
  declare countersignedName: CreationOptional<string | null>;
  declare amendmentsSeen: CreationOptional<number | null>;
  declare requestedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare report?: NonAttribute<DailyReport>;
}

/** Someone who receives a project's signed daily reports by e-mail: a member or an outside address. */
export class ReportSubscriber extends Model<InferAttributes<ReportSubscriber>, InferCreationAttributes<ReportSubscriber>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare email: string;
  declare userId: ForeignKey<User["id"]> | null;
  declare addedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
}

export function initDailyReport(sequelize: Sequelize) {
  DailyReport.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      localDate: { type: DataTypes.DATEONLY, allowNull: false },
      entered: jsonColumn("daily_reports", "entered", enteredNotesSchema),
      signedByName: { type: DataTypes.STRING(200), allowNull: true },
      signedAt: { type: DataTypes.DATE, allowNull: true },
      snapshot: jsonColumn("daily_reports", "snapshot", jsonObject, { allowNull: true }),
      countersignedByName: { type: DataTypes.STRING(200), allowNull: true },
      countersignedEmail: { type: DataTypes.STRING(254), allowNull: true },
      countersignedAt: { type: DataTypes.DATE, allowNull: true },
      pdfDueAt: { type: DataTypes.DATE, allowNull: true },
      pdfAttempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      pdfLastError: { type: DataTypes.STRING(500), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "daily_reports", modelName: "DailyReport",
      indexes: [{ name: "daily_reports_project_day_unique", unique: true, fields: ["projectId", "localDate"] }, { name: "daily_reports_pdf_due", fields: ["pdfDueAt"] }],
    },
  );
  DailyReportAmendment.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      text: { type: DataTypes.TEXT, allowNull: false },
      byName: { type: DataTypes.STRING(200), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "daily_report_amendments", modelName: "DailyReportAmendment", updatedAt: false, indexes: [{ name: "daily_report_amendments_report_time", fields: ["reportId", "createdAt"] }] },
  );
  CountersignRequest.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      countersignedName: { type: DataTypes.STRING(200), allowNull: true },
      amendmentsSeen: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "daily_report_countersign_requests", modelName: "CountersignRequest", indexes: [{ name: "countersign_requests_token_unique", unique: true, fields: ["tokenHash"] }] },
  );
  ReportSubscriber.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: "report_subscribers", modelName: "ReportSubscriber", updatedAt: false, indexes: [{ name: "report_subscribers_project_email_unique", unique: true, fields: ["projectId", "email"] }] },
  );
}
