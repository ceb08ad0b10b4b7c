import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Water quality the permit allows: monitoring stations, the permit's turbidity rules (with their
// source), readings with the evaluation stored as it was made on save, stop-work events opened by
// an exceedance, the project's sampling and wildlife settings, sightings and stand-downs.

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
const measure = () => ({ type: DataTypes.DOUBLE, allowNull: true });

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("water_quality_settings", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    /** Longest time between compliance readings while work is active, minutes. */
    samplingIntervalMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    /** The work day in which sampling intervals are counted, local minutes after midnight. */
    workdayStartMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    workdayEndMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    samplingSource: { type: DataTypes.TEXT, allowNull: false },
    /** Project length unit. */
    shutdownDistance: { type: DataTypes.DOUBLE, allowNull: false },
    standDownWaitMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    standDownSource: { type: DataTypes.TEXT, allowNull: false },
    species: { type: DataTypes.JSON, allowNull: false },
    updatedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("water_quality_settings", ["projectId"], { name: "water_quality_settings_project_unique", unique: true });

  await queryInterface.createTable("turbidity_rules", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    kind: { type: DataTypes.STRING(32), allowNull: false },
    limitNtu: measure(),
    inclusive: { type: DataTypes.BOOLEAN, allowNull: false },
    percent: measure(),
    floorNtu: measure(),
    capNtu: measure(),
    pairingWindowMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    notifyWithinHours: { type: DataTypes.DOUBLE, allowNull: false },
    /** Permit number and condition the rule comes from. */
    source: { type: DataTypes.TEXT, allowNull: false },
    createdById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("turbidity_rules", ["projectId"], { name: "turbidity_rules_project" });

  await queryInterface.createTable("monitoring_stations", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    /** Position in the project CRS (easting, northing), optional. */
    positionX: measure(),
    positionY: measure(),
    depthRule: { type: DataTypes.STRING(16), allowNull: true },
    /** A rule of the station's own; null follows the project's rule in force. */
    ruleId: reference("turbidity_rules", "RESTRICT", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("monitoring_stations", ["projectId", "name"], { name: "monitoring_stations_project_name_unique", unique: true });

  await queryInterface.createTable("water_quality_readings", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    stationId: reference("monitoring_stations", "RESTRICT"),
    takenAt: { type: DataTypes.DATE, allowNull: false },
    /** The local day of takenAt in the project time zone, YYYY-MM-DD. */
    localDay: { type: DataTypes.DATEONLY, allowNull: false },
    value: { type: DataTypes.DOUBLE, allowNull: false },
    unit: { type: DataTypes.STRING(3), allowNull: false },
    depth: measure(),
    instrument: { type: DataTypes.STRING(120), allowNull: false },
    calibratedAt: { type: DataTypes.DATE, allowNull: true },
    sampledBy: { type: DataTypes.STRING(120), allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: false },
    ph: measure(),
    dissolvedOxygenMgL: measure(),
    temperatureC: measure(),
    /** The evaluation made on save (compliance readings only). */
    ruleId: reference("turbidity_rules", "RESTRICT", true),
    backgroundReadingId: reference("water_quality_readings", "SET NULL", true),
    paired: { type: DataTypes.BOOLEAN, allowNull: true },
    backgroundNtu: measure(),
    differenceNtu: measure(),
    limitNtu: measure(),
    exceeds: { type: DataTypes.BOOLEAN, allowNull: true },
    idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("water_quality_readings", ["projectId", "takenAt"], { name: "water_quality_readings_project_time" });
  await queryInterface.addIndex("water_quality_readings", ["stationId", "takenAt"], { name: "water_quality_readings_station_time" });
  await queryInterface.addIndex("water_quality_readings", ["projectId", "idempotencyKey"], { name: "water_quality_readings_idempotency_unique", unique: true });

  await queryInterface.createTable("stop_work_events", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    stationId: reference("monitoring_stations", "RESTRICT"),
    /** The exceeding reading that opened the event. */
    readingId: reference("water_quality_readings", "RESTRICT"),
    openedAt: { type: DataTypes.DATE, allowNull: false },
    /** The agency must be told by then (the rule's notification deadline after the exceedance). */
    notifyBy: { type: DataTypes.DATE, allowNull: false },
    agencyNotifiedAt: { type: DataTypes.DATE, allowNull: true },
    agencyNotifiedTo: { type: DataTypes.STRING(200), allowNull: true },
    agencyNotifiedHow: { type: DataTypes.STRING(200), allowNull: true },
    notifiedById: reference("users", "SET NULL", true),
    /** The in-limit resample at the same station the resumption rests on. */
    resampleReadingId: reference("water_quality_readings", "RESTRICT", true),
    resumedAt: { type: DataTypes.DATE, allowNull: true },
    resumedById: reference("users", "SET NULL", true),
    resumeNote: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("stop_work_events", ["projectId", "resumedAt"], { name: "stop_work_events_project_open" });

  await queryInterface.createTable("wildlife_stand_downs", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    species: { type: DataTypes.STRING(120), allowNull: false },
    startedAt: { type: DataTypes.DATE, allowNull: false },
    /** When the animal was seen to have left on its own; null while it is near. */
    departedAt: { type: DataTypes.DATE, allowNull: true },
    /** departedAt plus the wait in force when it started. */
    endsAt: { type: DataTypes.DATE, allowNull: true },
    waitMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    shutdownDistance: { type: DataTypes.DOUBLE, allowNull: false },
    ...timestamps(),
  });
  await queryInterface.addIndex("wildlife_stand_downs", ["projectId", "species", "startedAt"], { name: "wildlife_stand_downs_project_species" });

  await queryInterface.createTable("wildlife_sightings", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    species: { type: DataTypes.STRING(120), allowNull: false },
    seenAt: { type: DataTypes.DATE, allowNull: false },
    localDay: { type: DataTypes.DATEONLY, allowNull: false },
    /** From the work, project length unit; null when the animal is out of sight. */
    distance: measure(),
    gone: { type: DataTypes.BOOLEAN, allowNull: false },
    positionX: measure(),
    positionY: measure(),
    observer: { type: DataTypes.STRING(120), allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: false },
    standDownId: reference("wildlife_stand_downs", "SET NULL", true),
    idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("wildlife_sightings", ["projectId", "seenAt"], { name: "wildlife_sightings_project_time" });
  await queryInterface.addIndex("wildlife_sightings", ["projectId", "idempotencyKey"], { name: "wildlife_sightings_idempotency_unique", unique: true });
};

export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["wildlife_sightings", "wildlife_stand_downs", "stop_work_events", "water_quality_readings", "monitoring_stations", "turbidity_rules", "water_quality_settings"]) {
    await queryInterface.dropTable(table);
  }
};
