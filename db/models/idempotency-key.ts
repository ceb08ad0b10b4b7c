import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * A client's `Idempotency-Key` and the answer its write gave (app/lib/api/idempotency.server.ts).
 * The row is inserted in the record's own transaction; the answer is filled in once it is built.
 * The response is kept as text (not a JSON column): it is replayed byte for byte, never queried.
 */
export class IdempotencyKey extends Model<InferAttributes<IdempotencyKey>, InferCreationAttributes<IdempotencyKey>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User["id"]>;
  declare projectId: ForeignKey<Project["id"]>;
  declare idemKey: string;
  declare scope: string;
  declare fingerprint: string;
  declare recordId: number | null;
  declare statusCode: number | null;
  declare responseBody: string | null;
  declare location: string | null;
  declare createdAt: CreationOptional<Date>;
}

export function initIdempotencyKey(sequelize: Sequelize) {
  IdempotencyKey.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      idemKey: { type: DataTypes.STRING(100), allowNull: false },
      scope: { type: DataTypes.STRING(300), allowNull: false },
      fingerprint: { type: DataTypes.CHAR(64), allowNull: false },
      recordId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      statusCode: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: true },
      responseBody: { type: DataTypes.TEXT("medium"), allowNull: true },
      location: { type: DataTypes.STRING(300), allowNull: true },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "idempotency_keys", modelName: "IdempotencyKey", updatedAt: false,
      indexes: [
        { name: "idempotency_keys_user_key_unique", unique: true, fields: ["userId", "idemKey"] },
        { name: "idempotency_keys_created", fields: ["createdAt"] },
      ],
    },
  );
}
