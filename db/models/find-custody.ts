import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { CUSTODY_PURPOSES, type CustodyPurpose } from "../../shared/finds/finds";
import type { Find } from "./find";
import type { FindPhoto } from "./find-photo";
import type { Project } from "./project";
import type { User } from "./user";

/** One handover of a find: from whom to whom, where to, when, why, signed by the receiver's typed name. */
export class FindCustody extends Model<InferAttributes<FindCustody>, InferCreationAttributes<FindCustody>> {
  declare id: CreationOptional<number>;
  declare findId: ForeignKey<Find["id"]>;
  declare projectId: ForeignKey<Project["id"]>;
  declare fromName: string;
  declare toName: string;
  declare place: string;
  declare purpose: CustodyPurpose;
  declare handedAt: Date;
  declare receiverSignature: string;
  declare note: string | null;
  declare formPhotoId: ForeignKey<FindPhoto["id"]> | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initFindCustody(sequelize: Sequelize) {
  FindCustody.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      fromName: { type: DataTypes.STRING(120), allowNull: false },
      toName: { type: DataTypes.STRING(120), allowNull: false },
      place: { type: DataTypes.STRING(200), allowNull: false },
      purpose: { type: DataTypes.ENUM(...CUSTODY_PURPOSES), allowNull: false },
      handedAt: { type: DataTypes.DATE, allowNull: false },
      receiverSignature: { type: DataTypes.STRING(120), allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "find_custody", modelName: "FindCustody", indexes: [{ name: "find_custody_find_time", fields: ["findId", "handedAt"] }] },
  );
}
