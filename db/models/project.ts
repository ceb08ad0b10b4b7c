import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { DEFAULT_HOLD_RADIUS_M, DEFAULT_HOLD_RADIUS_SOURCE } from "../../shared/finds/finds";
import { emergencyInfoSchema, type EmergencyInfo } from "../../shared/dive-plan/emergency-info";
import { SURVEY_ORDERS, type SurveyOrder } from "../../shared/qa/tvu";
import { jsonColumn } from "./json-column";

export const LENGTH_UNITS = ["us-ft", "ft", "m"] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/**
 * A restoration project: its coordinate reference system, length unit, work limit and the grid
 * that cells and rasters are laid on. Lengths (cell size, raster resolution, max edge,
 * tolerance) are in the project's length unit.
 */
export class Project extends Model<InferAttributes<Project>, InferCreationAttributes<Project>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare slug: string;
  declare description: CreationOptional<string>;
  /** The agency or client the work is done for. */
  declare agency: CreationOptional<string>;
  /** Permit numbers as the permits write them, comma-separated. */
  declare permitNumbers: CreationOptional<string>;
  /** IANA time zone the project's work days are counted in. */
  declare timeZone: CreationOptional<string>;
  /** The vertical datum's name, for labels (e.g. NAVD88). */
  declare verticalDatum: CreationOptional<string>;
  /** An EPSG code such as "EPSG:2237". */
  declare crs: string;
  declare lengthUnit: LengthUnit;
  declare gridOriginE: number;
  declare gridOriginN: number;
  declare cellSize: number;
  declare rasterResolution: number;
  /** Longest triangle edge allowed when a survey becomes a surface (no invention across gaps). */
  declare maxEdge: number;
  declare rotationDeg: CreationOptional<number>;
  /** Remaining thickness within which a cell counts as at firm sand. */
  declare tolerance: number;
  /** Share (0..1) of a cell's area that must be within tolerance. */
  declare firmShare: number;
  /** Share (0..1) of a cell's area that must be surveyed for a status. */
  declare minCoverage: number;
  /** The IHO S-44 order the import form offers by default for a survey's QA; each survey keeps the order it was imported with. */
  declare surveyOrder: CreationOptional<SurveyOrder>;
  /** How far below firm sand removal is still paid (0: paid down to firm sand); below it is over-dredge. */
  declare overDredgeAllowance: CreationOptional<number>;
  /** The permitted work limit as a GeoJSON Polygon or MultiPolygon in lon/lat (RFC 7946). */
  declare workLimitGeoJson: string | null;
  declare minTeamSize: CreationOptional<number>;
  /** Specific gravity of the dredged solids (water = 1): 2.65 for mineral sediment until the project's lab gives its own. */
  declare solidsSpecificGravity: CreationOptional<number>;
  /** Cake solids by weight (0–1) a haul ticket without its own sample is counted at; null: every ticket gives its own. */
  declare cakeSolidsByWeight: CreationOptional<number | null>;
  /** A tube at or beyond this share of its capacity is flagged near capacity (0.9 until set). */
  declare tubeNearCapacityShare: CreationOptional<number>;
  /** The finds catalogue's prefix; empty: initials of the slug. */
  declare findCataloguePrefix: CreationOptional<string>;
  /** The stop-work radius around a cultural find, metres (the permit states it in metres), and where it comes from. */
  declare holdRadiusM: CreationOptional<number>;
  declare holdRadiusSource: CreationOptional<string>;
  /** Nearest hospital and hyperbaric chamber with phones, emergency services, site address and access point; null: none set. */
  declare emergencyInfo: CreationOptional<EmergencyInfo | null>;
  /** The working hours, local "HH:MM" in the project's time zone; null: not set. */
  declare workDayStart: CreationOptional<string | null>;
  declare workDayEnd: CreationOptional<string | null>;
  /** When the project was archived (read-only from then on) and by whom; null: open. */
  declare archivedAt: CreationOptional<Date | null>;
  declare archivedById: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initProject(sequelize: Sequelize) {
  // A fresh definition per column: Sequelize writes into attribute definitions.
  const measure = () => ({ type: DataTypes.DOUBLE, allowNull: false });
  Project.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(200), allowNull: false },
      slug: { type: DataTypes.STRING(100), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      agency: { type: DataTypes.STRING(200), allowNull: false, defaultValue: "" },
      permitNumbers: { type: DataTypes.STRING(500), allowNull: false, defaultValue: "" },
      timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: "UTC" },
      verticalDatum: { type: DataTypes.STRING(60), allowNull: false, defaultValue: "" },
      crs: { type: DataTypes.STRING(40), allowNull: false },
      lengthUnit: { type: DataTypes.ENUM(...LENGTH_UNITS), allowNull: false },
      gridOriginE: measure(),
      gridOriginN: measure(),
      cellSize: measure(),
      rasterResolution: measure(),
      maxEdge: measure(),
      rotationDeg: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      tolerance: measure(),
      firmShare: measure(),
      minCoverage: measure(),
      surveyOrder: { type: DataTypes.ENUM(...SURVEY_ORDERS), allowNull: false, defaultValue: "1a" },
      overDredgeAllowance: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      workLimitGeoJson: { type: DataTypes.TEXT("medium"), allowNull: true },
      minTeamSize: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 2 },
      solidsSpecificGravity: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 2.65 },
      cakeSolidsByWeight: { type: DataTypes.DOUBLE, allowNull: true },
      tubeNearCapacityShare: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0.9 },
      findCataloguePrefix: { type: DataTypes.STRING(12), allowNull: false, defaultValue: "" },
      holdRadiusM: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: DEFAULT_HOLD_RADIUS_M },
      holdRadiusSource: { type: DataTypes.STRING(500), allowNull: false, defaultValue: DEFAULT_HOLD_RADIUS_SOURCE },
      emergencyInfo: jsonColumn("projects", "emergencyInfo", emergencyInfoSchema, { allowNull: true }),
      workDayStart: { type: DataTypes.STRING(5), allowNull: true },
      workDayEnd: { type: DataTypes.STRING(5), allowNull: true },
      archivedAt: { type: DataTypes.DATE, allowNull: true },
      archivedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "projects", modelName: "Project", indexes: [{ name: "projects_slug_unique", unique: true, fields: ["slug"] }] },
  );
}
