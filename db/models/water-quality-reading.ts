import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { TurbidityUnit } from "../../shared/water-quality/turbidity-rule";
import type { MonitoringStation } from "./monitoring-station";
import type { Project } from "./project";
import type { TurbidityRuleRecord } from "./turbidity-rule";
import type { User } from "./user";
import type { WaterQualityReadingPhoto } from "./water-quality-reading-photo";

/** A turbidity reading (with optional pH, dissolved oxygen, temperature) and, for a compliance reading, the evaluation made on save. */
export class WaterQualityReading extends Model<InferAttributes<WaterQualityReading>, InferCreationAttributes<WaterQualityReading>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare stationId: ForeignKey<MonitoringStation["id"]>;
  declare takenAt: Date;
  /** Local day in the project time zone, YYYY-MM-DD. */
  declare localDay: string;
  declare value: number;
  declare unit: TurbidityUnit;
  /** Sample depth, project length unit. */
  declare depth: number | null;
  declare instrument: string;
  declare calibratedAt: Date | null;
  declare sampledBy: string;
  declare note: string;
  declare ph: number | null;
  declare dissolvedOxygenMgL: number | null;
  declare temperatureC: number | null;
  declare ruleId: ForeignKey<TurbidityRuleRecord["id"]> | null;
  declare backgroundReadingId: number | null;
  declare paired: boolean | null;
  declare backgroundNtu: number | null;
  declare differenceNtu: number | null;
  declare limitNtu: number | null;
  declare exceeds: boolean | null;
  declare idempotencyKey: string | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare station?: NonAttribute<MonitoringStation>;
  declare rule?: NonAttribute<TurbidityRuleRecord>;
  declare photos?: NonAttribute<WaterQualityReadingPhoto[]>;
}

export function initWaterQualityReading(sequelize: Sequelize) {
  WaterQualityReading.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      takenAt: { type: DataTypes.DATE, allowNull: false },
      localDay: { type: DataTypes.DATEONLY, allowNull: false },
      value: { type: DataTypes.DOUBLE, allowNull: false },
      unit: { type: DataTypes.STRING(3), allowNull: false },
      depth: { type: DataTypes.DOUBLE, allowNull: true },
      instrument: { type: DataTypes.STRING(120), allowNull: false },
      calibratedAt: { type: DataTypes.DATE, allowNull: true },
      sampledBy: { type: DataTypes.STRING(120), allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: false },
      ph: { type: DataTypes.DOUBLE, allowNull: true },
      dissolvedOxygenMgL: { type: DataTypes.DOUBLE, allowNull: true },
      temperatureC: { type: DataTypes.DOUBLE, allowNull: true },
      backgroundReadingId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      paired: { type: DataTypes.BOOLEAN, allowNull: true },
      backgroundNtu: { type: DataTypes.DOUBLE, allowNull: true },
      differenceNtu: { type: DataTypes.DOUBLE, allowNull: true },
      limitNtu: { type: DataTypes.DOUBLE, allowNull: true },
      exceeds: { type: DataTypes.BOOLEAN, allowNull: true },
      idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "water_quality_readings", modelName: "WaterQualityReading",
      indexes: [
        { name: "water_quality_readings_project_time", fields: ["projectId", "takenAt"] },
        { name: "water_quality_readings_station_time", fields: ["stationId", "takenAt"] },
        { name: "water_quality_readings_idempotency_unique", unique: true, fields: ["projectId", "idempotencyKey"] },
      ],
    },
  );
}
