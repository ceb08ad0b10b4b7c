import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { User } from "./user";

export const API_TOKEN_SCOPES = ["read-only", "read-write"] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];

/** A personal API token (sent as `Authorization: Bearer`); only its SHA-256 hash is stored. */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User["id"]>;
  declare name: string;
  declare tokenHash: string;
  declare scope: CreationOptional<ApiTokenScope>;
  /** After this the token signs nobody in; null: until revoked. */
  declare expiresAt: CreationOptional<Date | null>;
  declare lastUsedAt: CreationOptional<Date | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
}

export function initApiToken(sequelize: Sequelize) {
  ApiToken.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      scope: { type: DataTypes.STRING(12), allowNull: false, defaultValue: "read-write", validate: { isIn: [API_TOKEN_SCOPES] } },
      expiresAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "api_tokens", modelName: "ApiToken",
      indexes: [
        { name: "api_tokens_token_hash_unique", unique: true, fields: ["tokenHash"] },
        { name: "api_tokens_user", fields: ["userId"] },
      ],
    },
  );
}
