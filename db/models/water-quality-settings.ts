import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

export const alertRecipientsSchema = z.object({ roles: z.array(z.string()), userIds: z.array(z.number().int()), addresses: z.array(z.string()) });
export type AlertRecipients = z.infer<typeof alertRecipientsSchema>;

/** A project's sampling routine and wildlife settings, each with its source (one row per project, made on first use). */
export class WaterQualitySettings extends Model<InferAttributes<WaterQualitySettings>, InferCreationAttributes<WaterQualitySettings>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare samplingIntervalMinutes: number;
  declare workdayStartMinutes: number;
  declare workdayEndMinutes: number;
  declare samplingSource: string;
  /** Project length unit. */
  declare shutdownDistance: number;
  declare standDownWaitMinutes: number;
  declare standDownSource: string;
  declare species: string[];
  /** "So many samples a day, at least so long apart"; null: the routine is `samplingIntervalMinutes`. */
  declare samplesPerDay: CreationOptional<number | null>;
  declare minimumGapMinutes: CreationOptional<number | null>;
  /** How `minimumGapMinutes` binds: "at-least" (null too) so long apart or more, "at-most" no more than so long apart. */
  declare gapRule: CreationOptional<"at-least" | "at-most" | null>;
  /** Who is alerted on an exceedance; null: the manager, the dive supervisor and the dewatering operator. */
  declare alertRecipients: CreationOptional<AlertRecipients | null>;
  declare updatedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initWaterQualitySettings(sequelize: Sequelize) {
  WaterQualitySettings.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      samplingIntervalMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      workdayStartMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      workdayEndMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      samplingSource: { type: DataTypes.TEXT, allowNull: false },
      shutdownDistance: { type: DataTypes.DOUBLE, allowNull: false },
      standDownWaitMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      standDownSource: { type: DataTypes.TEXT, allowNull: false },
      species: jsonColumn("water_quality_settings", "species", z.array(z.string())),
      samplesPerDay: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      minimumGapMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      gapRule: { type: DataTypes.STRING(8), allowNull: true },
      alertRecipients: jsonColumn("water_quality_settings", "alertRecipients", alertRecipientsSchema, { allowNull: true }),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "water_quality_settings", modelName: "WaterQualitySettings", indexes: [{ name: "water_quality_settings_project_unique", unique: true, fields: ["projectId"] }] },
  );
}
