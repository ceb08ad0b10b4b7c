import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Water quality, continued:
// - the sampling routine may be "so many samples a day, at least so long apart" (`samplesPerDay`,
//   `minimumGapMinutes`; null: the routine is an interval, `samplingIntervalMinutes`);
// - who is alerted on an exceedance (`alertRecipients`: roles, chosen members, outside addresses;
//   null: the manager, the dive supervisor and the dewatering operator);
// - the unit a turbidity rule is stated in (`unit`, NTU or FNU; NTU for the rules made before).

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("water_quality_settings", "samplesPerDay", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await queryInterface.addColumn("water_quality_settings", "minimumGapMinutes", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await queryInterface.addColumn("water_quality_settings", "alertRecipients", { type: DataTypes.JSON, allowNull: true });
  await queryInterface.addColumn("turbidity_rules", "unit", { type: DataTypes.STRING(3), allowNull: false, defaultValue: "NTU" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `turbidity_rules` DROP COLUMN `unit`");
  await queryInterface.sequelize.query("ALTER TABLE `water_quality_settings` DROP COLUMN `alertRecipients`, DROP COLUMN `minimumGapMinutes`, DROP COLUMN `samplesPerDay`");
};
