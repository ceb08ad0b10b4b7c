import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { TurbidityRuleKind, TurbidityUnit } from "../../shared/water-quality/turbidity-rule";
import type { Project } from "./project";
import type { User } from "./user";

/** A permit's turbidity rule with its source (permit number and condition). The newest is the project's rule in force; a station may name its own. */
export class TurbidityRuleRecord extends Model<InferAttributes<TurbidityRuleRecord>, InferCreationAttributes<TurbidityRuleRecord>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare kind: TurbidityRuleKind;
  declare limitNtu: number | null;
  declare inclusive: boolean;
  declare percent: number | null;
  declare floorNtu: number | null;
  declare capNtu: number | null;
  declare pairingWindowMinutes: number;
  declare notifyWithinHours: number;
  declare source: string;
  /** The unit the rule's figures are stated in (NTU, or FNU where the permit states it so). */
  declare unit: CreationOptional<TurbidityUnit>;
  declare createdById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initTurbidityRule(sequelize: Sequelize) {
  TurbidityRuleRecord.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.STRING(32), allowNull: false },
      limitNtu: { type: DataTypes.DOUBLE, allowNull: true },
      inclusive: { type: DataTypes.BOOLEAN, allowNull: false },
      percent: { type: DataTypes.DOUBLE, allowNull: true },
      floorNtu: { type: DataTypes.DOUBLE, allowNull: true },
      capNtu: { type: DataTypes.DOUBLE, allowNull: true },
      pairingWindowMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      notifyWithinHours: { type: DataTypes.DOUBLE, allowNull: false },
      source: { type: DataTypes.TEXT, allowNull: false },
      unit: { type: DataTypes.STRING(3), allowNull: false, defaultValue: "NTU" },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "turbidity_rules", modelName: "TurbidityRule", indexes: [{ name: "turbidity_rules_project", fields: ["projectId"] }] },
  );
}
