import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { GeotextileTube } from "./geotextile-tube";
import type { Project } from "./project";
import type { User } from "./user";

/** Slurry pumped into a tube: when, how much (m³, when known) and the dry solids it carried (kg). */
export class TubeFill extends Model<InferAttributes<TubeFill>, InferCreationAttributes<TubeFill>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare tubeId: ForeignKey<GeotextileTube["id"]>;
  /** The shift it came from (a row of dewatering_shifts), when logged with one. */
  declare shiftId: ForeignKey<number> | null;
  declare fillDate: string;
  declare slurryVolumeM3: number | null;
  declare drySolidsKg: number;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare tube?: NonAttribute<GeotextileTube>;
}

export function initTubeFill(sequelize: Sequelize) {
  TubeFill.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      fillDate: { type: DataTypes.DATEONLY, allowNull: false },
      slurryVolumeM3: { type: DataTypes.DOUBLE, allowNull: true },
      drySolidsKg: { type: DataTypes.DOUBLE, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "tube_fills", modelName: "TubeFill", indexes: [{ name: "tube_fills_tube_day", fields: ["tubeId", "fillDate"] }] },
  );
}
