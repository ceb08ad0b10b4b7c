import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Jar tests: the dewatering operator's bench check of a polymer dose (the raw sample, the dosed
// jars as JSON, the dose chosen), with photos; photos of haul tickets. Photos are objects in the
// store (app/lib/storage) with their keys here, in the same columns as find photos. On projects:
// the share of a tube's capacity at which it is flagged near capacity (0.9 until the manager sets
// the supplier's or the site plan's figure). On tubes: where each lies on the laydown area (its
// centre in the project CRS and its bearing), so the map can draw it.

const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
const timestamps = () => ({
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
});
const reference = (table: string, onDelete: "CASCADE" | "SET NULL" | "RESTRICT", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});
const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
const text = (length: number, allowNull = false) => ({ type: DataTypes.STRING(length), allowNull });

/** The columns of a stored photo, as find_photos has them (db/models/photo-columns.ts). */
const photoColumns = () => ({
  objectKey: text(300),
  thumbnailKey: text(300),
  contentType: text(60),
  sizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  thumbnailSizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  widthPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  heightPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  originalFileName: text(255),
  /** What the camera wrote, kept in the record only; stripped from the stored image. */
  exif: { type: DataTypes.JSON, allowNull: true },
  uploadedById: reference("users", "SET NULL", true),
});

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("projects", "tubeNearCapacityShare", { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0.9 });
  for (const column of ["positionX", "positionY", "bearingDegrees"]) await queryInterface.addColumn("geotextile_tubes", column, measure(true));

  await queryInterface.createTable("jar_tests", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    testDate: { type: DataTypes.DATEONLY, allowNull: false },
    /** Local time HH:MM, when given. */
    testTime: text(5, true),
    sampleSource: text(200),
    polymerProduct: text(120),
    polymerLot: text(60, true),
    /** The bench stock's concentration, % weight per volume. */
    benchStockPercent: measure(),
    jarVolumeMl: measure(),
    rawTurbidityNtu: measure(true),
    /** The dosed jars: [{doseMgPerL, settlingMinutes, turbidityNtu, clarity}]. */
    jars: { type: DataTypes.JSON, allowNull: false },
    chosenDoseMgPerL: measure(true),
    notes: { type: DataTypes.TEXT, allowNull: false },
    idempotencyKey: text(80, true),
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("jar_tests", ["projectId", "testDate"], { name: "jar_tests_project_day" });
  await queryInterface.addIndex("jar_tests", ["projectId", "idempotencyKey"], { name: "jar_tests_idempotency", unique: true });

  await queryInterface.createTable("jar_test_photos", { id: id(), jarTestId: reference("jar_tests", "CASCADE"), projectId: reference("projects", "CASCADE"), ...photoColumns(), ...timestamps() });
  await queryInterface.addIndex("jar_test_photos", ["jarTestId"], { name: "jar_test_photos_test" });

  await queryInterface.createTable("haul_photos", { id: id(), haulId: reference("hauls", "CASCADE"), projectId: reference("projects", "CASCADE"), ...photoColumns(), ...timestamps() });
  await queryInterface.addIndex("haul_photos", ["haulId"], { name: "haul_photos_haul" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["haul_photos", "jar_test_photos", "jar_tests"]) await queryInterface.dropTable(table);
  await queryInterface.sequelize.query("ALTER TABLE geotextile_tubes DROP COLUMN positionX, DROP COLUMN positionY, DROP COLUMN bearingDegrees");
  await queryInterface.sequelize.query("ALTER TABLE projects DROP COLUMN tubeNearCapacityShare");
};
