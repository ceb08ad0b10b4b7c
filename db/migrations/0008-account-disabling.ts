import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A site admin can disable an account: it cannot sign in, its sessions and API tokens stop at once.
// Who disabled it is kept beside when (a site admin may later leave; their row stays).

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("users", "disabledAt", { type: DataTypes.DATE, allowNull: true });
  await queryInterface.addColumn("users", "disabledById", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  // Named, so that down can drop it.
  await queryInterface.addConstraint("users", {
    type: "foreign key", name: "users_disabled_by_fk", fields: ["disabledById"],
    references: { table: "users", field: "id" }, onDelete: "SET NULL", onUpdate: "CASCADE",
  });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `users` DROP FOREIGN KEY `users_disabled_by_fk`");
  await queryInterface.sequelize.query("ALTER TABLE `users` DROP COLUMN `disabledById`, DROP COLUMN `disabledAt`");
};
