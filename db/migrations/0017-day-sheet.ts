import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// The day sheet: the project's emergency information (nearest hospital and hyperbaric chamber with
// their phones, the emergency services number, the site address and access point) as one JSON
// value on the project, and a flag on each logged dive saying its diver was a visitor rather than
// one of the team's listed people.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("projects", "emergencyInfo", { type: DataTypes.JSON, allowNull: true });
  await queryInterface.addColumn("dives", "diverIsVisitor", { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `dives` DROP COLUMN `diverIsVisitor`");
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP COLUMN `emergencyInfo`");
};
