import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { User } from "./user";
import type { WildlifeStandDown } from "./wildlife-stand-down";

/** A protected animal seen near the work: species, time, distance (project length unit) or gone, observer. */
export class WildlifeSighting extends Model<InferAttributes<WildlifeSighting>, InferCreationAttributes<WildlifeSighting>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare species: string;
  declare seenAt: Date;
  declare localDay: string;
  declare distance: number | null;
  declare gone: boolean;
  declare positionX: number | null;
  declare positionY: number | null;
  declare observer: string;
  declare note: string;
  declare standDownId: ForeignKey<WildlifeStandDown["id"]> | null;
  declare idempotencyKey: string | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare standDown?: NonAttribute<WildlifeStandDown>;
}

export function initWildlifeSighting(sequelize: Sequelize) {
  WildlifeSighting.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      species: { type: DataTypes.STRING(120), allowNull: false },
      seenAt: { type: DataTypes.DATE, allowNull: false },
      localDay: { type: DataTypes.DATEONLY, allowNull: false },
      distance: { type: DataTypes.DOUBLE, allowNull: true },
      gone: { type: DataTypes.BOOLEAN, allowNull: false },
      positionX: { type: DataTypes.DOUBLE, allowNull: true },
      positionY: { type: DataTypes.DOUBLE, allowNull: true },
      observer: { type: DataTypes.STRING(120), allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: false },
      idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "wildlife_sightings", modelName: "WildlifeSighting",
      indexes: [
        { name: "wildlife_sightings_project_time", fields: ["projectId", "seenAt"] },
        { name: "wildlife_sightings_idempotency_unique", unique: true, fields: ["projectId", "idempotencyKey"] },
      ],
    },
  );
}
