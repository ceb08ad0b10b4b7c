import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Photos of water-quality readings (the sample bottle, the turbidimeter's display, the plume at
// the station): objects in the store (app/lib/storage) with their keys here, in the same columns
// as the other photo tables (db/models/photo-columns.ts). On the sampling routine: how a
// "so many a day" routine's spacing binds (`gapRule`: "at-least" so long apart or more, "at-most"
// no more than so long apart, as the permit words it; null: at least, as routines saved before).

const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});
const text = (length: number) => ({ type: DataTypes.STRING(length), allowNull: false });
const count = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("water_quality_reading_photos", {
    id: id(),
    readingId: reference("water_quality_readings", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    objectKey: text(300),
    thumbnailKey: text(300),
    contentType: text(60),
    sizeBytes: count(),
    thumbnailSizeBytes: count(),
    widthPx: count(),
    heightPx: count(),
    originalFileName: text(255),
    /** What the camera wrote, kept in the record only; stripped from the stored image. */
    exif: { type: DataTypes.JSON, allowNull: true },
    uploadedById: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("water_quality_reading_photos", ["readingId"], { name: "water_quality_reading_photos_reading" });
  await queryInterface.addColumn("water_quality_settings", "gapRule", { type: DataTypes.STRING(8), allowNull: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `water_quality_settings` DROP COLUMN `gapRule`");
  await queryInterface.dropTable("water_quality_reading_photos");
};
