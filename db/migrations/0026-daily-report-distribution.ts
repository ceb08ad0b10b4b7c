import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Daily reports, sent and countersigned:
// - the agency inspector's countersignature on a signed report (typed name, time, the address the
//   one-time link went to), and the one-time countersign links themselves (only the token's SHA-256);
// - a project's report subscribers: members or outside addresses who receive each signed report;
// - an outgoing mail's attachments, named by their object-storage keys (the bytes stay in storage).

const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("daily_reports", "countersignedByName", { type: DataTypes.STRING(200), allowNull: true });
  await queryInterface.addColumn("daily_reports", "countersignedEmail", { type: DataTypes.STRING(254), allowNull: true });
  await queryInterface.addColumn("daily_reports", "countersignedAt", { type: DataTypes.DATE, allowNull: true });
  await queryInterface.createTable("daily_report_countersign_requests", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    reportId: reference("daily_reports", "CASCADE"),
    email: { type: DataTypes.STRING(254), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    requestedById: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("daily_report_countersign_requests", ["tokenHash"], { name: "countersign_requests_token_unique", unique: true });
  await queryInterface.createTable("report_subscribers", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    email: { type: DataTypes.STRING(254), allowNull: false },
    userId: reference("users", "CASCADE", true),
    addedById: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("report_subscribers", ["projectId", "email"], { name: "report_subscribers_project_email_unique", unique: true });
  await queryInterface.addColumn("outgoing_mails", "attachments", { type: DataTypes.JSON, allowNull: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `outgoing_mails` DROP COLUMN `attachments`");
  await queryInterface.dropTable("report_subscribers");
  await queryInterface.dropTable("daily_report_countersign_requests");
  await queryInterface.sequelize.query("ALTER TABLE `daily_reports` DROP COLUMN `countersignedAt`, DROP COLUMN `countersignedEmail`, DROP COLUMN `countersignedByName`");
};
