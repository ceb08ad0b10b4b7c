import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from "sequelize";
import type { Hold } from "./hold";
import type { Project } from "./project";

/** One cell a hold covers. */
export class HoldCell extends Model<InferAttributes<HoldCell>, InferCreationAttributes<HoldCell>> {
  declare id: CreationOptional<number>;
  declare holdId: ForeignKey<Hold["id"]>;
  declare projectId: ForeignKey<Project["id"]>;
  declare row: number;
  declare col: number;
  declare label: string;
  declare hold?: NonAttribute<Hold>;
}

export function initHoldCell(sequelize: Sequelize) {
  HoldCell.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      row: { type: DataTypes.INTEGER, allowNull: false },
      col: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(16), allowNull: false },
    },
    {
      sequelize, tableName: "hold_cells", modelName: "HoldCell", timestamps: false,
      indexes: [
        { name: "hold_cells_hold_cell_unique", unique: true, fields: ["holdId", "row", "col"] },
        { name: "hold_cells_project_cell", fields: ["projectId", "row", "col"] },
      ],
    },
  );
}
