import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";

export const HAUL_SITE_KINDS = ["reuse", "disposal"] as const;

/** Where the dewatered solids go: a reuse site (farm land, fill) or a disposal site, with its permit or agreement number. */
export class HaulSite extends Model<InferAttributes<HaulSite>, InferCreationAttributes<HaulSite>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  declare kind: (typeof HAUL_SITE_KINDS)[number];
  declare permitNumber: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initHaulSite(sequelize: Sequelize) {
  HaulSite.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      kind: { type: DataTypes.ENUM(...HAUL_SITE_KINDS), allowNull: false },
      permitNumber: { type: DataTypes.STRING(120), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "haul_sites", modelName: "HaulSite", indexes: [{ name: "haul_sites_project_name", fields: ["projectId", "name"], unique: true }] },
  );
}
