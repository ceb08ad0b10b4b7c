import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { Survey } from "./survey";
import type { User } from "./user";

const volumes = {
  removedVolume: z.number(),
  paidVolume: z.number(),
  overDredgeVolume: z.number(),
  depositedVolume: z.number(),
  remainingVolume: z.number(),
  /** ± 95 % on removed from the surveys' vertical uncertainty, and the removed volume's shift per unit of reference bias. */
  removedBandVolume: z.number(),
  biasVolumePerUnit: z.number(),
};
const periodSurvey = z.object({ id: z.number(), kind: z.string(), surveyedOn: z.string(), datum: z.string(), fileName: z.string(), contentSha256: z.string() });

/** A signed pay period's figures as issued: the surveys, settings and method they rest on, the project and zone rows (project volume unit). */
export const payPeriodSnapshotSchema = z.object({
  from: periodSurvey,
  to: periodSurvey,
  volumeLabel: z.string(),
  lengthLabel: z.string(),
  settings: z.object({ overDredgeAllowance: z.number(), firmSandTolerance: z.number(), cellSize: z.number(), rasterResolution: z.number(), maxEdge: z.number() }),
  method: z.string(),
  uncertainty: z.string(),
  total: z.object({ ...volumes, cells: z.number() }),
  zones: z.array(z.object({ zoneId: z.number().nullable(), name: z.string(), cells: z.number(), ...volumes })),
});
export type PayPeriodSnapshot = z.infer<typeof payPeriodSnapshotSchema>;

/**
 * A pay period's report as the manager signed it (typed name and time). Kept as issued: never
 * updated; a later recompute of the same period is shown beside it as a difference.
 */
export class PayPeriodReport extends Model<InferAttributes<PayPeriodReport>, InferCreationAttributes<PayPeriodReport>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare fromSurveyId: ForeignKey<Survey["id"]>;
  declare toSurveyId: ForeignKey<Survey["id"]>;
  /** The name the signer typed. */
  declare signedName: string;
  declare signedById: ForeignKey<User["id"]> | null;
  declare signedAt: Date;
  declare snapshot: PayPeriodSnapshot;
  declare createdAt: CreationOptional<Date>;
}

export function initPayPeriodReport(sequelize: Sequelize) {
  PayPeriodReport.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      signedName: { type: DataTypes.STRING(200), allowNull: false },
      signedAt: { type: DataTypes.DATE, allowNull: false },
      snapshot: jsonColumn("pay_period_reports", "snapshot", payPeriodSnapshotSchema),
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "pay_period_reports", modelName: "PayPeriodReport", updatedAt: false,
      indexes: [{ name: "pay_period_reports_project_signed", fields: ["projectId", "signedAt"] }],
    },
  );
}
