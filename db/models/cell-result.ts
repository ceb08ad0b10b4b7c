import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { Survey } from "./survey";
import type { Zone } from "./zone";
import { CELL_STATUSES, type CellStatus } from "../../shared/cell-status";

/**
 * The latest figures of one cell of a project, rewritten whole after every import, retraction
 * or restore. Volumes are in the project's volume unit (yd³ for feet projects, m³ for metres),
 * thickness in its length unit.
 */
export class CellResult extends Model<InferAttributes<CellResult>, InferCreationAttributes<CellResult>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare row: number;
  declare col: number;
  declare label: string;
  declare zoneId: ForeignKey<Zone["id"]> | null;
  declare plannedVolume: number;
  declare removedVolume: number;
  declare depositedVolume: number;
  declare remainingVolume: number;
  declare meanRemainingThickness: number | null;
  declare coverage: number;
  /** Area inside the work limit, project length unit squared. */
  declare areaInLimit: number;
  declare status: CellStatus;
  /** The survey that supplied most of the cell's latest bottom. */
  declare latestSurveyId: ForeignKey<Survey["id"]> | null;
  declare computedAt: Date;
}

export function initCellResult(sequelize: Sequelize) {
  const measure = () => ({ type: DataTypes.DOUBLE, allowNull: false });
  CellResult.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      row: { type: DataTypes.INTEGER, allowNull: false },
      col: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(16), allowNull: false },
      plannedVolume: measure(),
      removedVolume: measure(),
      depositedVolume: measure(),
      remainingVolume: measure(),
      meanRemainingThickness: { type: DataTypes.DOUBLE, allowNull: true },
      coverage: measure(),
      areaInLimit: measure(),
      status: { type: DataTypes.ENUM(...CELL_STATUSES), allowNull: false },
      computedAt: { type: DataTypes.DATE, allowNull: false },
    },
    {
      sequelize, tableName: "cell_results", modelName: "CellResult", timestamps: false,
      indexes: [
        { name: "cell_results_project_cell_unique", unique: true, fields: ["projectId", "row", "col"] },
        { name: "cell_results_project_computed_at", fields: ["projectId", "computedAt"] },
      ],
    },
  );
}
