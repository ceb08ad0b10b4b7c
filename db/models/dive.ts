import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { DiveCell } from "./dive-cell";
import type { DiveTeam } from "./dive-team";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * One dive actually made, as the dive supervisor logs it: the day, the team, the diver, when the
 * diver left the surface and the bottom (or just the bottom time), the maximum depth (project
 * length unit) and notes. The cells it worked are DiveCell rows.
 */
export class Dive extends Model<InferAttributes<Dive>, InferCreationAttributes<Dive>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  /** Local work date, YYYY-MM-DD. */
  declare diveDate: string;
  declare teamId: ForeignKey<DiveTeam["id"]>;
  declare diverName: string;
  /** The diver is not on the team's roster (a visitor), as logged. */
  declare diverIsVisitor: CreationOptional<boolean>;
  /** HH:MM, local time; null when only the bottom time was logged. */
  declare leftSurfaceAt: string | null;
  declare leftBottomAt: string | null;
  declare bottomMinutes: number;
  declare maxDepth: number;
  declare notes: string;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare team?: NonAttribute<DiveTeam>;
  declare cells?: NonAttribute<DiveCell[]>;
}

export function initDive(sequelize: Sequelize) {
  Dive.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      diveDate: { type: DataTypes.DATEONLY, allowNull: false },
      diverName: { type: DataTypes.STRING(120), allowNull: false },
      diverIsVisitor: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      leftSurfaceAt: { type: DataTypes.STRING(5), allowNull: true },
      leftBottomAt: { type: DataTypes.STRING(5), allowNull: true },
      bottomMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      maxDepth: { type: DataTypes.DOUBLE, allowNull: false },
      notes: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "dives", modelName: "Dive",
      indexes: [
        { name: "dives_project_day", fields: ["projectId", "diveDate"] },
        { name: "dives_team_day", fields: ["teamId", "diveDate"] },
      ],
    },
  );
}
