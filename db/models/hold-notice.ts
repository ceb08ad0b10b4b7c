import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { HOLD_AGENCIES, type HoldAgency } from "../../shared/finds/finds";
import type { Hold } from "./hold";
import type { User } from "./user";

/** Who must be told of a hold, and when they were. */
export class HoldNotice extends Model<InferAttributes<HoldNotice>, InferCreationAttributes<HoldNotice>> {
  declare id: CreationOptional<number>;
  declare holdId: ForeignKey<Hold["id"]>;
  declare agency: HoldAgency;
  declare toldAt: Date | null;
  declare toldById: ForeignKey<User["id"]> | null;
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initHoldNotice(sequelize: Sequelize) {
  HoldNotice.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      agency: { type: DataTypes.ENUM(...HOLD_AGENCIES), allowNull: false },
      toldAt: { type: DataTypes.DATE, allowNull: true },
      note: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "hold_notices", modelName: "HoldNotice", indexes: [{ name: "hold_notices_hold_agency_unique", unique: true, fields: ["holdId", "agency"] }] },
  );
}
