import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";

/** In-water work stood down for a protected animal within the shutdown distance: until it leaves on its own and the wait has passed. */
export class WildlifeStandDown extends Model<InferAttributes<WildlifeStandDown>, InferCreationAttributes<WildlifeStandDown>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare species: string;
  declare startedAt: Date;
  declare departedAt: Date | null;
  declare endsAt: Date | null;
  /** The settings in force when it started. */
  declare waitMinutes: number;
  declare shutdownDistance: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initWildlifeStandDown(sequelize: Sequelize) {
  WildlifeStandDown.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      species: { type: DataTypes.STRING(120), allowNull: false },
      startedAt: { type: DataTypes.DATE, allowNull: false },
      departedAt: { type: DataTypes.DATE, allowNull: true },
      endsAt: { type: DataTypes.DATE, allowNull: true },
      waitMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      shutdownDistance: { type: DataTypes.DOUBLE, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "wildlife_stand_downs", modelName: "WildlifeStandDown", indexes: [{ name: "wildlife_stand_downs_project_species", fields: ["projectId", "species", "startedAt"] }] },
  );
}
