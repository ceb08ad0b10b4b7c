import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Project setup from the browser and the API: a project's identity (agency, permit numbers),
// the time zone its work days are counted in, the vertical datum its labels name; and on users,
// whether a site admin has allowed them to create projects themselves.

const PROJECT_COLUMNS = {
  agency: () => ({ type: DataTypes.STRING(200), allowNull: false, defaultValue: "" }),
  permitNumbers: () => ({ type: DataTypes.STRING(500), allowNull: false, defaultValue: "" }),
  timeZone: () => ({ type: DataTypes.STRING(64), allowNull: false, defaultValue: "UTC" }),
  verticalDatum: () => ({ type: DataTypes.STRING(60), allowNull: false, defaultValue: "" }),
};

export const up: Migration = async ({ context: queryInterface }) => {
  for (const [column, definition] of Object.entries(PROJECT_COLUMNS)) await queryInterface.addColumn("projects", column, definition());
  await queryInterface.addColumn("users", "mayCreateProjects", { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `users` DROP COLUMN `mayCreateProjects`");
  const columns = Object.keys(PROJECT_COLUMNS).map((column) => `DROP COLUMN \`${column}\``).join(", ");
  await queryInterface.sequelize.query(`ALTER TABLE \`projects\` ${columns}`);
};
