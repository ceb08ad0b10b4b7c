import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Dive plans: a project's dive teams (members, hoses), the day's cell assignments (one team per
// cell per day, enforced by a unique index), and an optional shoreline layer for the map.

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
  await queryInterface.createTable("dive_teams", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    station: { type: DataTypes.STRING(200), allowNull: false, defaultValue: "" },
    hoses: { type: DataTypes.JSON, allowNull: false },
    members: { type: DataTypes.JSON, allowNull: false },
    sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...timestamps(),
  });
  await queryInterface.addIndex("dive_teams", ["projectId", "name"], { name: "dive_teams_project_name_unique", unique: true });

  await queryInterface.createTable("assignments", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    workDate: { type: DataTypes.DATEONLY, allowNull: false },
    teamId: reference("dive_teams", "RESTRICT"),
    row: { type: DataTypes.INTEGER, allowNull: false },
    col: { type: DataTypes.INTEGER, allowNull: false },
    label: { type: DataTypes.STRING(16), allowNull: false },
    hose: { type: DataTypes.STRING(120), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    workingDepth: { type: DataTypes.DOUBLE, allowNull: true },
    plannedBottomMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    confirmedReason: { type: DataTypes.TEXT, allowNull: true },
    createdById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("assignments", ["projectId", "workDate", "row", "col"], { name: "assignments_project_day_cell_unique", unique: true });
  await queryInterface.addIndex("assignments", ["teamId", "workDate"], { name: "assignments_team_day" });

  await queryInterface.createTable("shorelines", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    geoJson: { type: DataTypes.TEXT("medium"), allowNull: false },
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    uploadedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("shorelines", ["projectId"], { name: "shorelines_project_unique", unique: true });
};

export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["shorelines", "assignments", "dive_teams"]) await queryInterface.dropTable(table);
};
