import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { Project } from "./project";

/** A cell one logged dive worked (grid row and column, and its label as shown). */
export class DiveCell extends Model<InferAttributes<DiveCell>, InferCreationAttributes<DiveCell>> {
  declare id: CreationOptional<number>;
  /** The dive (a row of dives); Dive declares the association's other side, so this file need not import it. */
  declare diveId: ForeignKey<number>;
  declare projectId: ForeignKey<Project["id"]>;
  declare row: number;
  declare col: number;
  declare label: string;
}

export function initDiveCell(sequelize: Sequelize) {
  DiveCell.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      row: { type: DataTypes.INTEGER, allowNull: false },
      col: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.STRING(16), allowNull: false },
    },
    {
      sequelize, tableName: "dive_cells", modelName: "DiveCell", timestamps: false,
      indexes: [
        { name: "dive_cells_dive_cell_unique", unique: true, fields: ["diveId", "row", "col"] },
        { name: "dive_cells_project_cell", fields: ["projectId", "row", "col"] },
      ],
    },
  );
}
