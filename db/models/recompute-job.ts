import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { figuresChangeSchema } from "../../shared/volumes/figures-change";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { ProjectSettingsVersion } from "./project-settings-version";
import type { User } from "./user";

export const RECOMPUTE_JOB_STATES = ["queued", "running", "done", "failed"] as const;
export type RecomputeJobState = (typeof RECOMPUTE_JOB_STATES)[number];

/** What a finished recompute changed, and between which settings versions (null: from before the history began). */
export const recomputeSummarySchema = figuresChangeSchema.extend({ fromVersion: z.number().nullable(), toVersion: z.number().nullable() });
export type RecomputeSummary = z.infer<typeof recomputeSummarySchema>;

/**
 * A recompute of every survey's figures after a settings change, run in the background: where it
 * is (stage and 0–1 fraction, polled by the settings page and API clients) and, once done, what
 * changed between the figures before and after.
 */
export class RecomputeJob extends Model<InferAttributes<RecomputeJob>, InferCreationAttributes<RecomputeJob>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare userId: ForeignKey<User["id"]> | null;
  declare settingsVersionId: ForeignKey<ProjectSettingsVersion["id"]>;
  declare state: RecomputeJobState;
  declare stage: string;
  declare fraction: CreationOptional<number>;
  /** How many times the job was taken up to run (a server stop during a run leaves it to be taken up again). */
  declare attempts: CreationOptional<number>;
  declare error: CreationOptional<string | null>;
  declare summary: CreationOptional<RecomputeSummary | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initRecomputeJob(sequelize: Sequelize) {
  RecomputeJob.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      state: { type: DataTypes.ENUM(...RECOMPUTE_JOB_STATES), allowNull: false },
      stage: { type: DataTypes.STRING(60), allowNull: false },
      fraction: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      error: { type: DataTypes.TEXT, allowNull: true },
      summary: jsonColumn("recompute_jobs", "summary", recomputeSummarySchema, { allowNull: true }),
      finishedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "recompute_jobs", modelName: "RecomputeJob",
      indexes: [
        { name: "recompute_jobs_project_created", fields: ["projectId", "createdAt"] },
        { name: "recompute_jobs_state_updated", fields: ["state", "updatedAt"] },
      ],
    },
  );
}
