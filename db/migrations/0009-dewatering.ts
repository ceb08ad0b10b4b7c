import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Dewatering, hauling and lab samples: the dewatering operator's shift log (flow, solids, polymer),
// the geotextile tubes and their fills, the reuse and disposal sites and the haul tickets to them,
// and the lab's sediment samples (dry bulk density, N and P) that turn surveyed volume into mass.
// Two project settings: the solids' specific gravity (2.65, mineral sediment, until the project's
// lab says otherwise) and the cake solids a haul ticket without its own sample is counted at.
//
// What was measured is stored as entered (lengths in the project's unit, flows in the unit read);
// each shift's and ticket's dry solids are computed once, at the time, with the settings then in
// force, and kept in kilograms so that totals are a sum.

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

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("projects", "solidsSpecificGravity", { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 2.65 });
  await queryInterface.addColumn("projects", "cakeSolidsByWeight", { type: DataTypes.DOUBLE, allowNull: true });

  await queryInterface.createTable("dewatering_shifts", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    shiftDate: { type: DataTypes.DATEONLY, allowNull: false },
    /** Local time HH:MM; a shift that ends after midnight ends on the next day. */
    startAt: { type: DataTypes.STRING(5), allowNull: false },
    endAt: { type: DataTypes.STRING(5), allowNull: false },
    pumpHours: measure(),
    slurryFlowValue: measure(),
    slurryFlowUnit: { type: DataTypes.ENUM("gpm", "m3/h"), allowNull: false },
    /** The flow meter's totaliser at the start and end, when the flow was worked out from it (the mean over the pump hours). */
    totaliserStart: measure(true),
    totaliserEnd: measure(true),
    totaliserUnit: { type: DataTypes.ENUM("gal", "m3"), allowNull: true },
    solidsByWeight: measure(true),
    slurrySpecificGravity: measure(true),
    solidsSpecificGravity: measure(),
    polymerProduct: { type: DataTypes.STRING(120), allowNull: true },
    polymerLot: { type: DataTypes.STRING(60), allowNull: true },
    doseMgPerL: measure(true),
    stockPercent: measure(true),
    drySolidsKg: measure(true),
    neatPolymerKg: measure(true),
    notes: { type: DataTypes.TEXT, allowNull: false },
    idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("dewatering_shifts", ["projectId", "shiftDate"], { name: "dewatering_shifts_project_day" });
  await queryInterface.addIndex("dewatering_shifts", ["projectId", "idempotencyKey"], { name: "dewatering_shifts_idempotency", unique: true });

  await queryInterface.createTable("geotextile_tubes", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(60), allowNull: false },
    /** Project length unit. */
    circumference: measure(),
    length: measure(),
    /** Dry solids a unit length holds, from the supplier's sheet: project bulk mass (short tons or tonnes) per project length unit. */
    capacityDryMassPerLength: measure(),
    status: { type: DataTypes.ENUM("filling", "dewatering", "ready-to-open", "opened", "hauled"), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    createdById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("geotextile_tubes", ["projectId", "name"], { name: "geotextile_tubes_project_name", unique: true });

  await queryInterface.createTable("tube_fills", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    tubeId: reference("geotextile_tubes", "CASCADE"),
    /** The shift the fill came from, when it was logged with one. */
    shiftId: reference("dewatering_shifts", "CASCADE", true),
    fillDate: { type: DataTypes.DATEONLY, allowNull: false },
    slurryVolumeM3: measure(true),
    drySolidsKg: measure(),
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("tube_fills", ["tubeId", "fillDate"], { name: "tube_fills_tube_day" });

  await queryInterface.createTable("haul_sites", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.ENUM("reuse", "disposal"), allowNull: false },
    /** The site's permit or agreement number. */
    permitNumber: { type: DataTypes.STRING(120), allowNull: false },
    ...timestamps(),
  });
  await queryInterface.addIndex("haul_sites", ["projectId", "name"], { name: "haul_sites_project_name", unique: true });

  await queryInterface.createTable("hauls", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    haulDate: { type: DataTypes.DATEONLY, allowNull: false },
    ticketNumber: { type: DataTypes.STRING(60), allowNull: false },
    truck: { type: DataTypes.STRING(60), allowNull: false },
    siteId: reference("haul_sites", "RESTRICT"),
    /** One of the two: wet mass on the scale ticket (project bulk mass unit) or the truck body's volume (project volume unit). */
    loadWetMass: measure(true),
    loadVolume: measure(true),
    /** The cake solids used, 0–1: the ticket's own sample or the project default then in force. */
    cakeSolidsByWeight: measure(),
    cakeSolidsFromSample: { type: DataTypes.BOOLEAN, allowNull: false },
    solidsSpecificGravity: measure(),
    drySolidsKg: measure(),
    notes: { type: DataTypes.TEXT, allowNull: false },
    idempotencyKey: { type: DataTypes.STRING(80), allowNull: true },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("hauls", ["projectId", "ticketNumber"], { name: "hauls_project_ticket", unique: true });
  await queryInterface.addIndex("hauls", ["projectId", "haulDate"], { name: "hauls_project_day" });
  await queryInterface.addIndex("hauls", ["projectId", "idempotencyKey"], { name: "hauls_idempotency", unique: true });

  await queryInterface.createTable("sediment_samples", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    sampledOn: { type: DataTypes.DATEONLY, allowNull: false },
    /** The zone the sample stands for (from its cell when a cell was given); null: the project as a whole. */
    zoneId: reference("zones", "SET NULL", true),
    cellLabel: { type: DataTypes.STRING(16), allowNull: true },
    /** Percent solids by weight, 0–100, as the lab reports it. */
    percentSolids: measure(),
    dryBulkDensityKgPerM3: measure(),
    organicMatterPercent: measure(true),
    totalNitrogenMgKg: measure(),
    totalPhosphorusMgKg: measure(),
    lab: { type: DataTypes.STRING(120), allowNull: false },
    reportNumber: { type: DataTypes.STRING(60), allowNull: false },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("sediment_samples", ["projectId", "sampledOn"], { name: "sediment_samples_project_day" });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["sediment_samples", "hauls", "haul_sites", "tube_fills", "geotextile_tubes", "dewatering_shifts"]) await queryInterface.dropTable(table);
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP COLUMN `cakeSolidsByWeight`, DROP COLUMN `solidsSpecificGravity`");
};
