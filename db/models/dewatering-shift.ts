import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Project } from "./project";
import type { TubeFill } from "./tube-fill";
import type { User } from "./user";

export const FLOW_UNITS = ["gpm", "m3/h"] as const;

/**
 * One dewatering shift as the operator logs it: when, how long the pump ran, the slurry's flow and
 * solids (by weight, or its specific gravity), the polymer dosed; its dry solids and neat polymer
 * computed at the time, in kilograms. The tubes it filled are TubeFill rows.
 */
export class DewateringShift extends Model<InferAttributes<DewateringShift>, InferCreationAttributes<DewateringShift>> {
  declare id: CreationOptional<number>;
  declare projectId: ForeignKey<Project["id"]>;
  /** Local date the shift began, YYYY-MM-DD. */
  declare shiftDate: string;
  declare startAt: string;
  declare endAt: string;
  declare pumpHours: number;
  declare slurryFlowValue: number;
  declare slurryFlowUnit: (typeof FLOW_UNITS)[number];
  /** Totaliser readings the flow was worked out from (their mean over the pump hours); null when the flow was read. */
  declare totaliserStart: number | null;
  declare totaliserEnd: number | null;
  declare totaliserUnit: "gal" | "m3" | null;
  declare solidsByWeight: number | null;
  declare slurrySpecificGravity: number | null;
  declare solidsSpecificGravity: number;
  declare polymerProduct: string | null;
  declare polymerLot: string | null;
  declare doseMgPerL: number | null;
  declare stockPercent: number | null;
  declare drySolidsKg: number | null;
  declare neatPolymerKg: number | null;
  declare notes: string;
  declare idempotencyKey: string | null;
  declare recordedById: ForeignKey<User["id"]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare fills?: NonAttribute<TubeFill[]>;
}

export function initDewateringShift(sequelize: Sequelize) {
  const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
  DewateringShift.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      shiftDate: { type: DataTypes.DATEONLY, allowNull: false },
      startAt: { type: DataTypes.STRING(5), allowNull: false },
      endAt: { type: DataTypes.STRING(5), allowNull: false },
      pumpHours: measure(),
      slurryFlowValue: measure(),
      slurryFlowUnit: { type: DataTypes.ENUM(...FLOW_UNITS), allowNull: false },
      totaliserStart: measure(true),
      totaliserEnd: measure(true),
      totaliserUnit: { type: DataTypes.ENUM("gal", "m3"), allowNull: true },
      solidsByWeight: measure(true),
      slurrySpecificGravity: measure(true),
      solidsSpecificGravity: measure(),
      polymerProduct: { type: DataTypes.STRING(120), allowNull: true },
      polymerLot: { type: DataTypes.STRING(60), allowNull: true },
      doseMgPerL: measure(true),
      stockPercent: measure(true),
      drySolidsKg: measure(true),
      neatPolymerKg: measure(true),
      notes: { type: DataTypes.TEXT, allowNull: false },
      idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    {
      sequelize, tableName: "dewatering_shifts", modelName: "DewateringShift",
      indexes: [
        { name: "dewatering_shifts_project_day", fields: ["projectId", "shiftDate"] },
        { name: "dewatering_shifts_idempotency", fields: ["projectId", "idempotencyKey"], unique: true },
      ],
    },
  );
}
