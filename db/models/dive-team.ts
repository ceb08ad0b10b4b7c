import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { z } from "zod";
import { DIAMETER_UNITS, type TeamEquipment } from "../../shared/dive-plan/equipment";
import { jsonColumn } from "./json-column";
import type { Project } from "./project";

/** A stored hose or pump (shared/dive-plan/equipment.ts), checked as it is read. */
const teamEquipmentSchema: z.ZodType<TeamEquipment> = z.object({
  name: z.string(),
  diameter: z.number().nullable(),
  diameterUnit: z.enum(DIAMETER_UNITS),
});

export interface DiveTeamMember {
  name: string;
  email: string;
  /** What the person does on the team (diver, tender, standby diver...); empty when not said. */
  duty: string;
  /** The project member this is, when the person has an account (named crew have none). */
  userId?: number;
}

/** A project's dive team: its people (who get the plan sheet by e-mail) and the hoses and pumps it runs. */
export class DiveTeam extends Model<InferAttributes<DiveTeam>, InferCreationAttributes<DiveTeam>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  declare station: CreationOptional<string>;
  /** The hoses the team works (an assignment names one), each with its diameter (migration 0042). */
  declare hoses: TeamEquipment[];
  /** The pumps the team runs, each with its diameter. */
  declare pumps: CreationOptional<TeamEquipment[]>;
  declare members: DiveTeamMember[];
  declare sortOrder: CreationOptional<number>;
  /** When the team was retired (it has records, so it was not deleted); null: in service. */
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initDiveTeam(sequelize: Sequelize) {
  DiveTeam.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      station: { type: DataTypes.STRING(200), allowNull: false, defaultValue: "" },
      hoses: jsonColumn("dive_teams", "hoses", z.array(teamEquipmentSchema)),
      pumps: jsonColumn("dive_teams", "pumps", z.array(teamEquipmentSchema), { defaultValue: [] }),
      members: jsonColumn("dive_teams", "members", z.array(z.object({ name: z.string(), email: z.string(), duty: z.string(), userId: z.number().int().optional() }))),
      sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      retiredAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "dive_teams", modelName: "DiveTeam",
      indexes: [{ name: "dive_teams_project_name_unique", unique: true, fields: ["projectId", "name"] }],
    },
  );
}
