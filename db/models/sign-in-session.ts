import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { User } from "./user";

/** One signed-in browser: only the cookie token's SHA-256 is stored. */
export class SignInSession extends Model<InferAttributes<SignInSession>, InferCreationAttributes<SignInSession>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User["id"]>;
  declare tokenHash: string;
  declare userAgent: string;
  declare ip: string | null;
  declare lastSeenAt: Date;
  declare expiresAt: Date;
  declare endedAt: CreationOptional<Date | null>;
  declare endedReason: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
}

export function initSignInSession(sequelize: Sequelize) {
  SignInSession.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      userAgent: { type: DataTypes.STRING(300), allowNull: false },
      ip: { type: DataTypes.STRING(64), allowNull: true },
      lastSeenAt: { type: DataTypes.DATE, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      endedAt: { type: DataTypes.DATE, allowNull: true },
      endedReason: { type: DataTypes.STRING(40), allowNull: true },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "sign_in_sessions", modelName: "SignInSession", updatedAt: false,
      indexes: [
        { name: "sign_in_sessions_token_hash_unique", unique: true, fields: ["tokenHash"] },
        { name: "sign_in_sessions_user_open", fields: ["userId", "endedAt"] },
      ],
    },
  );
}
