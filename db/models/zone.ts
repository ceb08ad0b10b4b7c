import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";

/** A named part of a project's work limit that cells roll up into. */
export class Zone extends Model<InferAttributes<Zone>, InferCreationAttributes<Zone>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  /** GeoJSON Polygon or MultiPolygon in lon/lat. */
  declare polygonGeoJson: string;
  declare sortOrder: CreationOptional<number>;
  /** One of the palette's colours (shared/zone-colours.ts), chosen by the manager or given by default. */
  declare colour: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initZone(sequelize: Sequelize) {
  Zone.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      polygonGeoJson: { type: DataTypes.TEXT("medium"), allowNull: false },
      sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      colour: { type: DataTypes.STRING(7), allowNull: false, defaultValue: "#0d5c66" },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "zones", modelName: "Zone",
      indexes: [{ name: "zones_project_name_unique", unique: true, fields: ["projectId", "name"] }],
    },
  );
}
