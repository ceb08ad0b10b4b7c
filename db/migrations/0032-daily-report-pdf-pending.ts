import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A signed daily report whose PDF is not stored yet: the signature is committed first, then the
// PDF is rendered, stored and sent to the subscribers; while the file storage cannot be reached
// the report waits here and is retried (`pdfDueAt`: the next attempt, null once stored;
// `pdfAttempts`, `pdfLastError`: what the page says while it waits).

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("daily_reports", "pdfDueAt", { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn("daily_reports", "pdfAttempts", { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
  await queryInterface.addColumn("daily_reports", "pdfLastError", { type: DataTypes.STRING(500), allowNull: true });
  await queryInterface.addIndex("daily_reports", ["pdfDueAt"], { name: "daily_reports_pdf_due" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `daily_reports` DROP INDEX `daily_reports_pdf_due`, DROP COLUMN `pdfLastError`, DROP COLUMN `pdfAttempts`, DROP COLUMN `pdfDueAt`");
};
