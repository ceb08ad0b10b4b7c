import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { ProjectSettingsVersion } from "./project-settings-version";
import { z } from "zod";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";
import type { Survey } from "./survey";
import type { FigureTotals } from "../../shared/volumes/figure-totals";

/** Totals are counts and volumes: numbers only. */
const totalsSchema = z.record(z.string(), z.number());

/**
 * The state of the project after every survey of one date (all active surveys up to that date):
 * project and zone totals in the project's volume unit.
 * Per-cell figures are kept compact: little-endian Float32Array bytes of remaining and removed
 * volume and Uint8Array status codes, laid out row-major over the cell grid
 * (index = (row − firstRow) · cellCols + (col − firstCol)).
 */
export class SurveySnapshot extends Model<InferAttributes<SurveySnapshot>, InferCreationAttributes<SurveySnapshot>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare surveyedOn: string;
  declare lastSurveyId: ForeignKey<Survey["id"]>;
  declare totals: FigureTotals;
  declare zones: Array<{ zoneId: number | null; name: string; totals: FigureTotals }>;
  declare cellCols: number;
  declare cellRows: number;
  declare firstCol: number;
  declare firstRow: number;
  declare remainingVolumes: Buffer;
  declare removedVolumes: Buffer;
  declare statuses: Buffer;
  declare computedAt: Date;
  /** The settings version the snapshot was computed with (null: computed before the history began). */
  declare settingsVersionId: CreationOptional<number | null>;
  declare settingsVersion?: NonAttribute<ProjectSettingsVersion | null>;
}

export function initSurveySnapshot(sequelize: Sequelize) {
  SurveySnapshot.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      surveyedOn: { type: DataTypes.DATEONLY, allowNull: false },
      totals: jsonColumn("survey_snapshots", "totals", totalsSchema),
      zones: jsonColumn("survey_snapshots", "zones", z.array(z.object({ zoneId: z.number().nullable(), name: z.string(), totals: totalsSchema }))),
      cellCols: { type: DataTypes.INTEGER, allowNull: false },
      cellRows: { type: DataTypes.INTEGER, allowNull: false },
      firstCol: { type: DataTypes.INTEGER, allowNull: false },
      firstRow: { type: DataTypes.INTEGER, allowNull: false },
      remainingVolumes: { type: DataTypes.BLOB("medium"), allowNull: false },
      removedVolumes: { type: DataTypes.BLOB("medium"), allowNull: false },
      statuses: { type: DataTypes.BLOB("medium"), allowNull: false },
      computedAt: { type: DataTypes.DATE, allowNull: false },
      settingsVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    },
    {
      sequelize, tableName: "survey_snapshots", modelName: "SurveySnapshot", timestamps: false,
      indexes: [{ name: "survey_snapshots_project_date_unique", unique: true, fields: ["projectId", "surveyedOn"] }],
    },
  );
}
