import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Public progress share links: a name, the SHA-256 of the link's token (the token itself is shown
// once and never stored), the short text outreach writes for the public page, and revocation.

const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("share_links", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    publicText: { type: DataTypes.TEXT, allowNull: false },
    createdById: reference("users", "SET NULL", true),
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    revokedById: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("share_links", ["tokenHash"], { name: "share_links_token_hash_unique", unique: true });
  await queryInterface.addIndex("share_links", ["projectId", "createdAt"], { name: "share_links_project_created" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.dropTable("share_links");
};
