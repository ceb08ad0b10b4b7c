import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { User } from "./user";

/** The optional shoreline (water area) a manager uploads for the map: GeoJSON polygons in lon/lat. */
export class Shoreline extends Model<InferAttributes<Shoreline>, InferCreationAttributes<Shoreline>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare geoJson: string;
  declare fileName: string;
  declare uploadedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initShoreline(sequelize: Sequelize) {
  Shoreline.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      geoJson: { type: DataTypes.TEXT("medium"), allowNull: false },
      fileName: { type: DataTypes.STRING(255), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "shorelines", modelName: "Shoreline", indexes: [{ name: "shorelines_project_unique", unique: true, fields: ["projectId"] }] },
  );
}
