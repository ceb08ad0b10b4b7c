import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** One "forgot password" request, kept so requests can be limited per client and per address. */
export class ResetRequest extends Model<InferAttributes<ResetRequest>, InferCreationAttributes<ResetRequest>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare ip: string;
  declare createdAt: CreationOptional<Date>;
}

export function initResetRequest(sequelize: Sequelize) {
  ResetRequest.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      ip: { type: DataTypes.STRING(64), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "reset_requests", modelName: "ResetRequest", updatedAt: false,
      indexes: [
        { name: "reset_requests_email_created", fields: ["email", "createdAt"] },
        { name: "reset_requests_ip_created", fields: ["ip", "createdAt"] },
      ],
    },
  );
}
