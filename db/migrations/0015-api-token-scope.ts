import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A personal API token gets a scope (read-only tokens may not change anything) and an optional
// expiry, so a token handed to a reporting script cannot upload, and a forgotten one stops by itself.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("api_tokens", "scope", { type: DataTypes.STRING(12), allowNull: false, defaultValue: "read-write" });
  await queryInterface.addColumn("api_tokens", "expiresAt", { type: DataTypes.DATE, allowNull: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `api_tokens` DROP COLUMN `expiresAt`, DROP COLUMN `scope`");
};
