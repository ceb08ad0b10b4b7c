import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { jsonColumn, jsonObject } from "./json-column";
import type { Project } from "./project";
import type { Survey } from "./survey";
import type { User } from "./user";

export const IMPORT_JOB_STATES = ["staged", "validating", "ready", "committing", "done", "failed"] as const;
export type ImportJobState = (typeof IMPORT_JOB_STATES)[number];

/**
 * One upload on its way to becoming a survey: the staged file on disk, the technician's choices,
 * the last preview, and where a running commit is (stage and 0–1 fraction) so a page can poll it
 * and pick it up again after being left.
 */
export class ImportJob extends Model<InferAttributes<ImportJob>, InferCreationAttributes<ImportJob>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare userId: ForeignKey<User["id"]> | null;
  declare state: ImportJobState;
  declare stage: string;
  declare fraction: CreationOptional<number>;
  declare error: CreationOptional<string | null>;
  declare surveyId: ForeignKey<Survey["id"]> | null;
  declare fileName: string;
  declare filePath: string;
  declare fileSize: number;
  declare contentSha256: string;
  declare options: Record<string, unknown>;
  declare preview: CreationOptional<Record<string, unknown> | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initImportJob(sequelize: Sequelize) {
  ImportJob.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      state: { type: DataTypes.ENUM(...IMPORT_JOB_STATES), allowNull: false },
      stage: { type: DataTypes.STRING(40), allowNull: false },
      fraction: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      error: { type: DataTypes.TEXT, allowNull: true },
      fileName: { type: DataTypes.STRING(255), allowNull: false },
      filePath: { type: DataTypes.STRING(1024), allowNull: false },
      fileSize: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
      contentSha256: { type: DataTypes.CHAR(64), allowNull: false },
      options: jsonColumn("import_jobs", "options", jsonObject),
      preview: jsonColumn("import_jobs", "preview", jsonObject, { allowNull: true }),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "import_jobs", modelName: "ImportJob",
      indexes: [{ name: "import_jobs_project_created", fields: ["projectId", "createdAt"] }],
    },
  );
}
