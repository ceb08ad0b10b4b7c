import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Project setup, continued:
// - a dive team that has dives, assignments or finds on record is retired rather than deleted
//   (`retiredAt`), so the logs keep naming it and it can be brought back;
// - a finished project is archived (`archivedAt`, and who archived it): read-only, still readable;
// - the project's working hours (`workDayStart`, `workDayEnd`, local "HH:MM"; null: not set).

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("dive_teams", "retiredAt", { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn("projects", "archivedAt", { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn("projects", "archivedById", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await queryInterface.addConstraint("projects", {
    type: "foreign key", name: "projects_archived_by_fk", fields: ["archivedById"],
    references: { table: "users", field: "id" }, onDelete: "SET NULL", onUpdate: "CASCADE",
  });
  await queryInterface.addColumn("projects", "workDayStart", { type: DataTypes.STRING(5), allowNull: true });
  await queryInterface.addColumn("projects", "workDayEnd", { type: DataTypes.STRING(5), allowNull: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP FOREIGN KEY `projects_archived_by_fk`");
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP COLUMN `workDayEnd`, DROP COLUMN `workDayStart`, DROP COLUMN `archivedById`, DROP COLUMN `archivedAt`");
  await queryInterface.sequelize.query("ALTER TABLE `dive_teams` DROP COLUMN `retiredAt`");
};
