import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { User } from "./user";
import type { Zone } from "./zone";

/**
 * A lab's result for a sediment sample: percent solids, dry bulk density of the muck in place
 * (kg/m³), organic matter (loss on ignition), total N and P (mg/kg dry weight), and the zone it
 * stands for (null: the project as a whole).
 */
export class SedimentSample extends Model<InferAttributes<SedimentSample>, InferCreationAttributes<SedimentSample>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare sampledOn: string;
  declare zoneId: ForeignKey<Zone["id"]> | null;
  declare cellLabel: string | null;
  declare percentSolids: number;
  declare dryBulkDensityKgPerM3: number;
  declare organicMatterPercent: number | null;
  declare totalNitrogenMgKg: number;
  declare totalPhosphorusMgKg: number;
  declare lab: string;
  declare reportNumber: string;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare zone?: NonAttribute<Zone>;
}

export function initSedimentSample(sequelize: Sequelize) {
  const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
  SedimentSample.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      sampledOn: { type: DataTypes.DATEONLY, allowNull: false },
      cellLabel: { type: DataTypes.STRING(16), allowNull: true },
      percentSolids: measure(),
      dryBulkDensityKgPerM3: measure(),
      organicMatterPercent: measure(true),
      totalNitrogenMgKg: measure(),
      totalPhosphorusMgKg: measure(),
      lab: { type: DataTypes.STRING(120), allowNull: false },
      reportNumber: { type: DataTypes.STRING(60), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "sediment_samples", modelName: "SedimentSample", indexes: [{ name: "sediment_samples_project_day", fields: ["projectId", "sampledOn"] }] },
  );
}
