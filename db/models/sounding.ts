import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Survey } from "./survey";

/**
 * One sounding in project coordinates and project length unit. Depths are below the water
 * surface (positive down); elevation = water surface − depth, refusal elevation = water surface −
 * probe. Written in bulk (multi-row INSERTs), read in bulk for the computation.
 */
export class Sounding extends Model<InferAttributes<Sounding>, InferCreationAttributes<Sounding>> {
  declare id: CreationOptional<number>;
  declare surveyId: ForeignKey<Survey["id"]>;
  /** Spreadsheet row in the file (header = row 1). */
  declare sourceRow: number;
  declare easting: number;
  declare northing: number;
  declare depth: number | null;
  declare probe: number | null;
  declare elevation: number;
  declare refusalElevation: number | null;
  declare time: string | null;
  declare pointId: string | null;
}

export function initSounding(sequelize: Sequelize) {
  Sounding.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      sourceRow: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      easting: { type: DataTypes.DOUBLE, allowNull: false },
      northing: { type: DataTypes.DOUBLE, allowNull: false },
      depth: { type: DataTypes.DOUBLE, allowNull: true },
      probe: { type: DataTypes.DOUBLE, allowNull: true },
      elevation: { type: DataTypes.DOUBLE, allowNull: false },
      refusalElevation: { type: DataTypes.DOUBLE, allowNull: true },
      time: { type: DataTypes.STRING(40), allowNull: true },
      pointId: { type: DataTypes.STRING(64), allowNull: true },
    },
    {
      sequelize, tableName: "soundings", modelName: "Sounding", timestamps: false,
      indexes: [{ name: "soundings_survey_row", fields: ["surveyId", "sourceRow"] }],
    },
  );
}
