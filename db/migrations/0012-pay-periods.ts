import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Pay periods: the over-dredge allowance (how far below firm sand removal is still paid, project
// length unit; 0 pays down to firm sand) among a project's tolerances, and the signed reports of
// pay periods, each a snapshot of its figures as issued (never updated: a later recompute is
// shown beside it as a difference).

const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("projects", "overDredgeAllowance", { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 });
  await queryInterface.createTable("pay_period_reports", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    fromSurveyId: reference("surveys", "CASCADE"),
    toSurveyId: reference("surveys", "CASCADE"),
    signedName: { type: DataTypes.STRING(200), allowNull: false },
    signedById: reference("users", "SET NULL", true),
    signedAt: { type: DataTypes.DATE, allowNull: false },
    snapshot: { type: DataTypes.JSON, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("pay_period_reports", ["projectId", "signedAt"], { name: "pay_period_reports_project_signed" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("pay_period_reports");
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP COLUMN `overDredgeAllowance`");
};
