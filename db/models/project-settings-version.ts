import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { z } from "zod";
import { surveyOrderSchema } from "../../shared/qa/tvu";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";

/** The settings the figures rest on, as one version keeps them (lengths in the project's unit, geometries lon/lat GeoJSON). */
export const versionedSettingsSchema = z.object({
  grid: z.object({ cellSize: z.number(), rotationDegrees: z.number(), originX: z.number(), originY: z.number(), rasterResolution: z.number(), maxEdge: z.number() }),
  /** `surveyOrder` (IHO S-44): kept from migration 0041 on; versions from before have none. */
  tolerances: z.object({ firmSand: z.number(), firmShare: z.number(), minCoverage: z.number(), overDredgeAllowance: z.number(), surveyOrder: surveyOrderSchema.optional() }),
  workLimit: z.unknown(),
  zones: z.array(z.object({ id: z.number(), name: z.string(), sortOrder: z.number(), geometry: z.unknown() })),
});
export type VersionedSettings = z.infer<typeof versionedSettingsSchema>;

/** The parts a version changed from the one before: "grid", "work limit", "zones", "tolerances"; "as found" for the first kept. */
export const settingsChangedSchema = z.array(z.string());

/**
 * One version of a project's figures settings (work limit, grid, zones, tolerances): a new row
 * each time any of them changes, never edited, so a snapshot or report computed with an earlier
 * version can still say which settings it used.
 */
export class ProjectSettingsVersion extends Model<InferAttributes<ProjectSettingsVersion>, InferCreationAttributes<ProjectSettingsVersion>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare version: number;
  declare settings: VersionedSettings;
  declare changedParts: string[];
  declare changedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare changedBy?: NonAttribute<User | null>;
}

export function initProjectSettingsVersion(sequelize: Sequelize) {
  ProjectSettingsVersion.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      settings: jsonColumn("project_settings_versions", "settings", versionedSettingsSchema),
      changedParts: jsonColumn("project_settings_versions", "changedParts", settingsChangedSchema),
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "project_settings_versions", modelName: "ProjectSettingsVersion", updatedAt: false,
      indexes: [{ name: "settings_versions_project_version_unique", unique: true, fields: ["projectId", "version"] }],
    },
  );
}
