import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** One sign-in attempt, kept so failures can be rate-limited per account and per client address. */
export class LoginAttempt extends Model<InferAttributes<LoginAttempt>, InferCreationAttributes<LoginAttempt>> {
  declare id: CreationOptional<number>;
  /** The e-mail as typed (lower-cased); the account may not exist. */
  declare email: string;
  declare ip: string;
  declare succeeded: boolean;
  declare createdAt: CreationOptional<Date>;
}

export function initLoginAttempt(sequelize: Sequelize) {
  LoginAttempt.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      ip: { type: DataTypes.STRING(64), allowNull: false },
      succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "login_attempts", modelName: "LoginAttempt", updatedAt: false,
      indexes: [
        { name: "login_attempts_email_created", fields: ["email", "createdAt"] },
        { name: "login_attempts_ip_created", fields: ["ip", "createdAt"] },
      ],
    },
  );
}
