import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// A report amended after its countersignature can be countersigned again; each countersignature
// stays on record with the link it came through: the typed name and how many amendments the report
// carried when it was countersigned (the version the inspector read). The report row keeps the
// latest countersignature, as before. Links used before this change are filled in from their report.

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("daily_report_countersign_requests", "countersignedName", { type: DataTypes.STRING(200), allowNull: true });
  await queryInterface.addColumn("daily_report_countersign_requests", "amendmentsSeen", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await queryInterface.sequelize.query(
    "UPDATE `daily_report_countersign_requests` AS r JOIN `daily_reports` AS d ON d.`id` = r.`reportId` " +
      "SET r.`countersignedName` = d.`countersignedByName`, " +
      "r.`amendmentsSeen` = (SELECT COUNT(*) FROM `daily_report_amendments` AS a WHERE a.`reportId` = d.`id` AND a.`createdAt` < d.`countersignedAt`) " +
      "WHERE r.`usedAt` IS NOT NULL AND d.`countersignedAt` IS NOT NULL AND r.`usedAt` = d.`countersignedAt`",
  );
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `daily_report_countersign_requests` DROP COLUMN `amendmentsSeen`, DROP COLUMN `countersignedName`");
};
