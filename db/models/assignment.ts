import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { DiveTeam } from "./dive-team";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * One cell of one day's dive plan: which team works it, from which hose or station, with notes.
 * A cell goes to one team per day (unique index). The working depth (project length unit) is the
 * deepest latest-bottom depth in the cell when the plan was made.
 */
export class Assignment extends Model<InferAttributes<Assignment>, InferCreationAttributes<Assignment>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  /** Local work date, YYYY-MM-DD. */
  declare workDate: string;
  declare teamId: ForeignKey<DiveTeam["id"]>;
  declare row: number;
  declare col: number;
  declare label: string;
  declare hose: string;
  declare notes: string;
  declare workingDepth: number | null;
  declare plannedBottomMinutes: number | null;
  /** Why a cell already confirmed by the closeout goes back into work. */
  declare confirmedReason: string | null;
  declare createdById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare team?: NonAttribute<DiveTeam>;
}

export function initAssignment(sequelize: Sequelize) {
  Assignment.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      workDate: { type: DataTypes.DATEONLY, allowNull: false },
      row: { type: DataTypes.INTEGER, allowNull: false },
      col: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(16), allowNull: false },
      hose: { type: DataTypes.STRING(120), allowNull: false },
      notes: { type: DataTypes.TEXT, allowNull: false },
      workingDepth: { type: DataTypes.DOUBLE, allowNull: true },
      plannedBottomMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      confirmedReason: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "assignments", modelName: "Assignment",
      indexes: [
        { name: "assignments_project_day_cell_unique", unique: true, fields: ["projectId", "workDate", "row", "col"] },
        { name: "assignments_team_day", fields: ["teamId", "workDate"] },
      ],
    },
  );
}
