import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// The dive log: dives actually made on the day's assigned cells (who, when, how long, how deep),
// recorded by the dive supervisor, and the cells each dive worked (one row per cell, so the cell
// inspector finds a cell's dives through an index).

const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
const timestamps = () => ({
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
});
const reference = (table: string, onDelete: "CASCADE" | "SET NULL" | "RESTRICT", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("dives", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    diveDate: { type: DataTypes.DATEONLY, allowNull: false },
    teamId: reference("dive_teams", "RESTRICT"),
    diverName: { type: DataTypes.STRING(120), allowNull: false },
    /** Left surface and left bottom, local time HH:MM; null when only the bottom time was written down. */
    leftSurfaceAt: { type: DataTypes.STRING(5), allowNull: true },
    leftBottomAt: { type: DataTypes.STRING(5), allowNull: true },
    bottomMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    /** Maximum depth of the dive, project length unit. */
    maxDepth: { type: DataTypes.DOUBLE, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("dives", ["projectId", "diveDate"], { name: "dives_project_day" });
  await queryInterface.addIndex("dives", ["teamId", "diveDate"], { name: "dives_team_day" });

  await queryInterface.createTable("dive_cells", {
    id: id(),
    diveId: reference("dives", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    row: { type: DataTypes.INTEGER, allowNull: false },
    col: { type: DataTypes.INTEGER, allowNull: false },
    label: { type: DataTypes.STRING(16), allowNull: false },
  });
  await queryInterface.addIndex("dive_cells", ["diveId", "row", "col"], { name: "dive_cells_dive_cell_unique", unique: true });
  await queryInterface.addIndex("dive_cells", ["projectId", "row", "col"], { name: "dive_cells_project_cell" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["dive_cells", "dives"]) await queryInterface.dropTable(table);
};
