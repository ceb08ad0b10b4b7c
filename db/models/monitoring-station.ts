import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { DepthRule, StationKind } from "../../shared/water-quality/wording";
import type { Project } from "./project";
import type { TurbidityRuleRecord } from "./turbidity-rule";


/** A water-quality monitoring station: background up-current, compliance point in the plume, the return outfall, or other. */
export class MonitoringStation extends Model<InferAttributes<MonitoringStation>, InferCreationAttributes<MonitoringStation>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  declare kind: StationKind;
  /** Easting and northing in the project CRS. */
  declare positionX: number | null;
  declare positionY: number | null;
  declare depthRule: DepthRule | null;
  declare ruleId: ForeignKey<TurbidityRuleRecord["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initMonitoringStation(sequelize: Sequelize) {
  MonitoringStation.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      kind: { type: DataTypes.STRING(16), allowNull: false },
      positionX: { type: DataTypes.DOUBLE, allowNull: true },
      positionY: { type: DataTypes.DOUBLE, allowNull: true },
      depthRule: { type: DataTypes.STRING(16), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "monitoring_stations", modelName: "MonitoringStation", indexes: [{ name: "monitoring_stations_project_name_unique", unique: true, fields: ["projectId", "name"] }] },
  );
}
