import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

/** The column mapping last used on a project (sounding field → header in the file), offered again on the next upload. */
export class ColumnMapping extends Model<InferAttributes<ColumnMapping>, InferCreationAttributes<ColumnMapping>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare mapping: Record<string, string>;
  declare updatedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initColumnMapping(sequelize: Sequelize) {
  ColumnMapping.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      mapping: jsonColumn("column_mappings", "mapping", z.record(z.string(), z.string())),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "column_mappings", modelName: "ColumnMapping",
      indexes: [{ name: "column_mappings_project_unique", unique: true, fields: ["projectId"] }],
    },
  );
}
