import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Outgoing mail is written here in the same transaction as the record it belongs to (an
// invitation, a reset link), and a background loop sends it with retries: an SMTP server that is
// down no longer half-saves a record, and the mail follows when the server returns.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("outgoing_mails", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    toAddress: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    bodyText: { type: DataTypes.TEXT("medium"), allowNull: false },
    /** What the mail belongs to, e.g. "invitation:12", so a page can say "not sent yet". */
    ref: { type: DataTypes.STRING(80), allowNull: true },
    /** pending → sent, or failed after the last attempt. */
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: "pending" },
    attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    lastError: { type: DataTypes.STRING(500), allowNull: true },
    nextAttemptAt: { type: DataTypes.DATE, allowNull: false },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("outgoing_mails", ["status", "nextAttemptAt"], { name: "outgoing_mails_due" });
  await queryInterface.addIndex("outgoing_mails", ["ref"], { name: "outgoing_mails_ref" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("outgoing_mails");
};
