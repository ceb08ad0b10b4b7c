import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Project } from "./project";
import { ROLES, type Role } from "./roles";
import type { User } from "./user";

/** A user's one role on one project. */
export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User["id"]>;
  declare projectId: ForeignKey<Project["id"]>;
  declare role: Role;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
  declare project?: NonAttribute<Project>;
}

export function initMembership(sequelize: Sequelize) {
  Membership.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "memberships", modelName: "Membership",
      indexes: [
        { name: "memberships_user_project_unique", unique: true, fields: ["userId", "projectId"] },
        { name: "memberships_project", fields: ["projectId"] },
      ],
    },
  );
}
