import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { jsonColumn, jsonObject } from "./json-column";
import type { Project } from "./project";
import type { User } from "./user";
import { SURVEY_KINDS, type SurveyKind } from "../../shared/surveys-in-force";

export { SURVEY_KINDS, type SurveyKind };
export const SURVEY_STATUSES = ["active", "retracted"] as const;
export type SurveyStatus = (typeof SURVEY_STATUSES)[number];

/**
 * One imported sounding file: a baseline (with probe to refusal), a progress pass or a closeout.
 * Retracting is a soft delete: the soundings stay, the statistics are recomputed without them.
 */
export class Survey extends Model<InferAttributes<Survey>, InferCreationAttributes<Survey>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare kind: SurveyKind;
  /** Local survey date, YYYY-MM-DD. */
  declare surveyedOn: string;
  /** IANA time zone of the times in the file. */
  declare timeZone: string;
  /** Water-surface elevation the depths are read from (project length unit); null when the file has elevations. */
  declare waterSurfaceElevation: number | null;
  declare fileHasElevations: boolean;
  /** Vertical datum of the water surface and elevations, e.g. "NAVD88". */
  declare datum: string;
  /** CRS the file's coordinates were given in (they are stored converted to the project's). */
  declare crs: string;
  /** Length unit of the file's depths (stored converted to the project's). */
  declare lengthUnit: "us-ft" | "ft" | "m";
  declare fileName: string;
  declare contentSha256: string;
  /** Data rows in the file. */
  declare rowCount: number;
  /** Soundings stored (rows minus excluded or dropped ones). */
  declare soundingCount: number;
  declare uploadedById: ForeignKey<User["id"]> | null;
  declare status: CreationOptional<SurveyStatus>;
  declare retractedReason: CreationOptional<string | null>;
  declare retractedById: ForeignKey<User["id"]> | null;
  declare retractedAt: CreationOptional<Date | null>;
  declare qa: Record<string, unknown>;
  /** Share (0–1) of the work limit's cells this survey covered, when known. */
  declare coverage: CreationOptional<number | null>;
  /** The most the survey's vertical reference (water level, datum) may be off, 95 %, as entered: value, its unit and where it comes from; all null when none is recorded. */
  declare verticalBiasValue: CreationOptional<number | null>;
  declare verticalBiasUnit: CreationOptional<"us-ft" | "ft" | "m" | null>;
  declare verticalBiasSource: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare uploadedBy?: NonAttribute<User | null>;
  declare retractedBy?: NonAttribute<User | null>;
}

export function initSurvey(sequelize: Sequelize) {
  Survey.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.ENUM(...SURVEY_KINDS), allowNull: false },
      surveyedOn: { type: DataTypes.DATEONLY, allowNull: false },
      timeZone: { type: DataTypes.STRING(64), allowNull: false },
      waterSurfaceElevation: { type: DataTypes.DOUBLE, allowNull: true },
      fileHasElevations: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      datum: { type: DataTypes.STRING(40), allowNull: false },
      crs: { type: DataTypes.STRING(40), allowNull: false },
      lengthUnit: { type: DataTypes.ENUM("us-ft", "ft", "m"), allowNull: false },
      fileName: { type: DataTypes.STRING(255), allowNull: false },
      contentSha256: { type: DataTypes.CHAR(64), allowNull: false },
      rowCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      soundingCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      status: { type: DataTypes.ENUM(...SURVEY_STATUSES), allowNull: false, defaultValue: "active" },
      retractedReason: { type: DataTypes.TEXT, allowNull: true },
      retractedAt: { type: DataTypes.DATE, allowNull: true },
      qa: jsonColumn("surveys", "qa", jsonObject),
      coverage: { type: DataTypes.DOUBLE, allowNull: true },
      verticalBiasValue: { type: DataTypes.DOUBLE, allowNull: true },
      verticalBiasUnit: { type: DataTypes.ENUM("us-ft", "ft", "m"), allowNull: true },
      verticalBiasSource: { type: DataTypes.STRING(200), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "surveys", modelName: "Survey",
      indexes: [
        { name: "surveys_project_surveyed_on", fields: ["projectId", "surveyedOn"] },
        { name: "surveys_project_sha256", fields: ["projectId", "contentSha256"] },
      ],
    },
  );
}
