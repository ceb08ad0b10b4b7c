import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { TubeFill } from "./tube-fill";
import type { User } from "./user";

import { TUBE_STATUSES, type TubeStatus } from "../../shared/dewatering/tubes";

export { TUBE_STATUSES, type TubeStatus };

/**
 * A geotextile tube in the register: its size (project length unit), the dry solids a unit length
 * holds per the supplier's sheet (project bulk mass per length unit) and where it is in its life.
 */
export class GeotextileTube extends Model<InferAttributes<GeotextileTube>, InferCreationAttributes<GeotextileTube>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare name: string;
  declare circumference: number;
  declare length: number;
  declare capacityDryMassPerLength: number;
  declare status: TubeStatus;
  declare notes: string;
  /** The tube's centre on the laydown area, project CRS and length unit; its bearing in degrees clockwise from grid north. */
  declare positionX: CreationOptional<number | null>;
  declare positionY: CreationOptional<number | null>;
  declare bearingDegrees: CreationOptional<number | null>;
  declare createdById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare fills?: NonAttribute<TubeFill[]>;
}

export function initGeotextileTube(sequelize: Sequelize) {
  GeotextileTube.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(60), allowNull: false },
      circumference: { type: DataTypes.DOUBLE, allowNull: false },
      length: { type: DataTypes.DOUBLE, allowNull: false },
      capacityDryMassPerLength: { type: DataTypes.DOUBLE, allowNull: false },
      status: { type: DataTypes.ENUM(...TUBE_STATUSES), allowNull: false },
      notes: { type: DataTypes.TEXT, allowNull: false },
      positionX: { type: DataTypes.DOUBLE, allowNull: true },
      positionY: { type: DataTypes.DOUBLE, allowNull: true },
      bearingDegrees: { type: DataTypes.DOUBLE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: "geotextile_tubes", modelName: "GeotextileTube", indexes: [{ name: "geotextile_tubes_project_name", fields: ["projectId", "name"], unique: true }] },
  );
}
