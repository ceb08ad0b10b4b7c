import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A recompute that a server stop cut short is started again by the next server (at its start, and
// whenever a job's heartbeat has gone silent): `attempts` counts how many times a job was taken up,
// so one that stops the server every time (out of memory, say) is given up after a few tries
// instead of being restarted for ever. The index serves the look for waiting and silent jobs.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("recompute_jobs", "attempts", { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
  // Jobs already finished or already waiting had (or will have) one attempt counted at their claim.
  await queryInterface.sequelize.query("UPDATE `recompute_jobs` SET `attempts` = 1 WHERE `state` <> 'queued'");
  await queryInterface.addIndex("recompute_jobs", ["state", "updatedAt"], { name: "recompute_jobs_state_updated" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `recompute_jobs` DROP INDEX `recompute_jobs_state_updated`, DROP COLUMN `attempts`");
};
