import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Basket loads by volume: a basket line may give a count, a volume, or both.
// - `finds.count` may be null (a line measured by volume alone: "half a basket of cans");
// - `volumeValue` and `volumeUnit` (US gallons, cubic feet, litres, cubic metres), as entered;
// - `fromBasket`: the entry is a line of a basket load (the debris removed by hand), not a find
//   logged on its own. Entries made before are left as finds logged on their own.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.changeColumn("finds", "count", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await queryInterface.addColumn("finds", "volumeValue", { type: DataTypes.DOUBLE, allowNull: true });
  await queryInterface.addColumn("finds", "volumeUnit", { type: DataTypes.ENUM("gal", "ft3", "L", "m3"), allowNull: true });
  await queryInterface.addColumn("finds", "fromBasket", { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays. A line
// kept by volume alone had no count: it goes back as a count of 1 (the column was required).
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("UPDATE `finds` SET `count` = 1 WHERE `count` IS NULL");
  await queryInterface.sequelize.query("ALTER TABLE `finds` DROP COLUMN `fromBasket`, DROP COLUMN `volumeUnit`, DROP COLUMN `volumeValue`, MODIFY `count` INT UNSIGNED NOT NULL");
};
