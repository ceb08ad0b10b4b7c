import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import { FIND_CATEGORIES, FIND_STATUSES, type FindCategory, type FindStatus } from "../../shared/finds/finds";
import { HAND_VOLUME_UNITS, type HandVolumeUnit } from "../../shared/units";
import type { Dive } from "./dive";
import type { DiveTeam } from "./dive-team";
import type { FindCustody } from "./find-custody";
import type { FindPhoto } from "./find-photo";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * One find: what it is, where and when it came up (cell, optional position in the project CRS,
 * depths in the project length unit) and its catalogue number (prefix, year, sequence; unique).
 * Its location is confidential: only roles allowed "finds.locations.read" ever see those columns.
 */
export class Find extends Model<InferAttributes<Find>, InferCreationAttributes<Find>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare catalogueNumber: string;
  declare catalogueYear: number;
  declare catalogueSequence: number;
  declare category: FindCategory;
  declare description: string;
  declare material: string;
  /** How many; null for a basket line measured by volume alone. */
  declare count: number | null;
  /** A basket line's volume, as entered (the unit beside it). */
  declare volumeValue: number | null;
  declare volumeUnit: HandVolumeUnit | null;
  /** A line of a basket load (debris removed by hand), not a find logged on its own. */
  declare fromBasket: CreationOptional<boolean>;
  declare taxon: string | null;
  declare element: string | null;
  declare condition: string;
  declare cellRow: number | null;
  declare cellCol: number | null;
  declare cellLabel: string | null;
  declare positionX: number | null;
  declare positionY: number | null;
  declare depthBelowSurface: number | null;
  declare depthInMuck: number | null;
  declare diveId: ForeignKey<Dive["id"]> | null;
  declare teamId: ForeignKey<DiveTeam["id"]> | null;
  declare finder: string;
  declare foundAt: Date;
  declare fieldTag: string;
  declare status: CreationOptional<FindStatus>;
  declare accessionNumber: string | null;
  declare statusNote: string | null;
  declare idempotencyKey: string | null;
  declare loggedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare photos?: NonAttribute<FindPhoto[]>;
  declare custody?: NonAttribute<FindCustody[]>;
  declare team?: NonAttribute<DiveTeam>;
}

export function initFind(sequelize: Sequelize) {
  const text = (length: number, allowNull = false) => ({ type: DataTypes.STRING(length), allowNull });
  Find.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      catalogueNumber: text(40),
      catalogueYear: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      catalogueSequence: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      category: { type: DataTypes.ENUM(...FIND_CATEGORIES), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false },
      material: text(120),
      count: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      volumeValue: { type: DataTypes.DOUBLE, allowNull: true },
      volumeUnit: { type: DataTypes.ENUM(...HAND_VOLUME_UNITS), allowNull: true },
      fromBasket: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      taxon: text(120, true),
      element: text(120, true),
      condition: text(200),
      cellRow: { type: DataTypes.INTEGER, allowNull: true },
      cellCol: { type: DataTypes.INTEGER, allowNull: true },
      cellLabel: text(16, true),
      positionX: { type: DataTypes.DOUBLE, allowNull: true },
      positionY: { type: DataTypes.DOUBLE, allowNull: true },
      depthBelowSurface: { type: DataTypes.DOUBLE, allowNull: true },
      depthInMuck: { type: DataTypes.DOUBLE, allowNull: true },
      finder: text(120),
      foundAt: { type: DataTypes.DATE, allowNull: false },
      fieldTag: text(60),
      status: { type: DataTypes.ENUM(...FIND_STATUSES), allowNull: false, defaultValue: "in-field" },
      accessionNumber: text(60, true),
      statusNote: { type: DataTypes.TEXT, allowNull: true },
      idempotencyKey: text(80, true),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "finds", modelName: "Find",
      indexes: [
        { name: "finds_project_sequence_unique", unique: true, fields: ["projectId", "catalogueYear", "catalogueSequence"] },
        { name: "finds_project_catalogue_unique", unique: true, fields: ["projectId", "catalogueNumber"] },
        { name: "finds_project_idempotency_unique", unique: true, fields: ["projectId", "idempotencyKey"] },
      ],
    },
  );
}
