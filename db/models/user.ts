import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** A person who signs in. Access to projects comes through Membership; isSiteAdmin passes every check. */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare passwordHash: string;
  declare isSiteAdmin: CreationOptional<boolean>;
  /** A site admin allowed this user to create projects (they become the new project's manager). */
  declare mayCreateProjects: CreationOptional<boolean>;
  /** Set while a site admin has disabled the account: no sign-in, no session, no API token. */
  declare disabledAt: CreationOptional<Date | null>;
  declare disabledById: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initUser(sequelize: Sequelize) {
  User.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      passwordHash: { type: DataTypes.STRING(100), allowNull: false },
      isSiteAdmin: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      mayCreateProjects: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      disabledAt: { type: DataTypes.DATE, allowNull: true },
      disabledById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "users", modelName: "User", indexes: [{ name: "users_email_unique", unique: true, fields: ["email"] }] },
  );
}
