import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { HaulPhoto } from "./haul-photo";
import type { HaulSite } from "./haul-site";
import type { Project } from "./project";
import type { User } from "./user";

/**
 * A haul ticket: a truck load of dewatered solids to a site, weighed (wet mass, project bulk mass
 * unit) or measured in the truck body (project volume unit), with the cake solids it is counted at
 * and its dry solids (kg) computed at the time.
 */
export class Haul extends Model<InferAttributes<Haul>, InferCreationAttributes<Haul>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare haulDate: string;
  declare ticketNumber: string;
  declare truck: string;
  declare siteId: ForeignKey<HaulSite["id"]>;
  declare loadWetMass: number | null;
  declare loadVolume: number | null;
  declare cakeSolidsByWeight: number;
  declare cakeSolidsFromSample: boolean;
  declare solidsSpecificGravity: number;
  declare drySolidsKg: number;
  declare notes: string;
  declare idempotencyKey: string | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare site?: NonAttribute<HaulSite>;
  declare photos?: NonAttribute<HaulPhoto[]>;
}

export function initHaul(sequelize: Sequelize) {
  const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
  Haul.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      haulDate: { type: DataTypes.DATEONLY, allowNull: false },
      ticketNumber: { type: DataTypes.STRING(60), allowNull: false },
      truck: { type: DataTypes.STRING(60), allowNull: false },
      loadWetMass: measure(true),
      loadVolume: measure(true),
      cakeSolidsByWeight: measure(),
      cakeSolidsFromSample: { type: DataTypes.BOOLEAN, allowNull: false },
      solidsSpecificGravity: measure(),
      drySolidsKg: measure(),
      notes: { type: DataTypes.TEXT, allowNull: false },
      idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "hauls", modelName: "Haul",
      indexes: [
        { name: "hauls_project_ticket", fields: ["projectId", "ticketNumber"], unique: true },
        { name: "hauls_project_day", fields: ["projectId", "haulDate"] },
        { name: "hauls_idempotency", fields: ["projectId", "idempotencyKey"], unique: true },
      ],
    },
  );
}
