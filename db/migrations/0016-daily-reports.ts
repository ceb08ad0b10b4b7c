import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Daily reports: one per project and local day, holding what was entered by hand (weather, notes)
// and, once signed, the typed name, time and a snapshot of the compiled figures as signed. A signed
// report is locked; corrections are dated amendments beside it.

const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("daily_reports", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    localDate: { type: DataTypes.DATEONLY, allowNull: false },
    entered: { type: DataTypes.JSON, allowNull: false },
    signedByName: { type: DataTypes.STRING(200), allowNull: true },
    signedAt: { type: DataTypes.DATE, allowNull: true },
    signedById: reference("users", "SET NULL", true),
    snapshot: { type: DataTypes.JSON, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("daily_reports", ["projectId", "localDate"], { name: "daily_reports_project_day_unique", unique: true });
  await queryInterface.createTable("daily_report_amendments", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    reportId: reference("daily_reports", "CASCADE"),
    text: { type: DataTypes.TEXT, allowNull: false },
    byName: { type: DataTypes.STRING(200), allowNull: false },
    byId: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("daily_report_amendments", ["reportId", "createdAt"], { name: "daily_report_amendments_report_time" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("daily_report_amendments");
  await queryInterface.dropTable("daily_reports");
};
