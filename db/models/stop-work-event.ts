import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { MonitoringStation } from "./monitoring-station";
import type { Project } from "./project";
import type { User } from "./user";
import type { WaterQualityReading } from "./water-quality-reading";

/**
 * Work stopped by a turbidity exceedance: open from the exceeding reading until an in-limit
 * resample at the same station and a recorded resumption; the agency notification is recorded on it.
 */
export class StopWorkEvent extends Model<InferAttributes<StopWorkEvent>, InferCreationAttributes<StopWorkEvent>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare stationId: ForeignKey<MonitoringStation["id"]>;
  declare readingId: ForeignKey<WaterQualityReading["id"]>;
  declare openedAt: Date;
  declare notifyBy: Date;
  declare agencyNotifiedAt: Date | null;
  declare agencyNotifiedTo: string | null;
  declare agencyNotifiedHow: string | null;
  declare notifiedById: ForeignKey<User["id"]> | null;
  declare resampleReadingId: number | null;
  declare resumedAt: Date | null;
  declare resumedById: ForeignKey<User["id"]> | null;
  declare resumeNote: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare station?: NonAttribute<MonitoringStation>;
  declare reading?: NonAttribute<WaterQualityReading>;
}

export function initStopWorkEvent(sequelize: Sequelize) {
  StopWorkEvent.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      openedAt: { type: DataTypes.DATE, allowNull: false },
      notifyBy: { type: DataTypes.DATE, allowNull: false },
      agencyNotifiedAt: { type: DataTypes.DATE, allowNull: true },
      agencyNotifiedTo: { type: DataTypes.STRING(200), allowNull: true },
      agencyNotifiedHow: { type: DataTypes.STRING(200), allowNull: true },
      resampleReadingId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      resumedAt: { type: DataTypes.DATE, allowNull: true },
      resumeNote: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "stop_work_events", modelName: "StopWorkEvent", indexes: [{ name: "stop_work_events_project_open", fields: ["projectId", "resumedAt"] }] },
  );
}
