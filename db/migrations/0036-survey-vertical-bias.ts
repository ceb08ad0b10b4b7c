import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A survey's vertical-reference bias: the most its whole surface may be off (95 %) because of its
// water-level reading or datum, as entered (value and unit) with where the figure comes from. It
// widens the pay period's ± band on removed as area × bias. All three are null when none is recorded.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("surveys", "verticalBiasValue", { type: DataTypes.DOUBLE, allowNull: true });
  await queryInterface.addColumn("surveys", "verticalBiasUnit", { type: DataTypes.ENUM("us-ft", "ft", "m"), allowNull: true });
  await queryInterface.addColumn("surveys", "verticalBiasSource", { type: DataTypes.STRING(200), allowNull: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `surveys` DROP COLUMN `verticalBiasSource`, DROP COLUMN `verticalBiasUnit`, DROP COLUMN `verticalBiasValue`");
};
