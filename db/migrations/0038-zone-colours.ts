import { DataTypes, QueryTypes } from "sequelize";
import type { Migration } from "../umzug";

// Each zone gets a colour from the palette the manager chooses from (shared/zone-colours.ts): the
// map draws its outline and name in it, the settings and progress views show it beside the name.
// Existing zones get the defaults in their project's order (first zone first colour, and so on,
// round again after the last), as a new zone would. The values are copied here, not imported:
// a migration keeps the values of its day.
const PALETTE = ["#0d5c66", "#aa6600", "#552288", "#777755", "#770022", "#9955aa", "#333366", "#3366cc"];

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("zones", "colour", { type: DataTypes.STRING(7), allowNull: false, defaultValue: PALETTE[0] });
  const zones = await queryInterface.sequelize.query<{ id: number; projectId: number }>(
    "SELECT id, projectId FROM zones ORDER BY projectId, sortOrder, name",
    { type: QueryTypes.SELECT },
  );
  let project: number | null = null;
  let place = 0;
  for (const zone of zones) {
    place = zone.projectId === project ? place + 1 : 0;
    project = zone.projectId;
    await queryInterface.sequelize.query("UPDATE zones SET colour = ? WHERE id = ?", { replacements: [PALETTE[place % PALETTE.length], zone.id] });
  }
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `zones` DROP COLUMN `colour`");
};
