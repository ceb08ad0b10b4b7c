import { DataTypes, QueryTypes } from "sequelize";
import type { Migration } from "../umzug";

// The settings history and the background recompute:
// - project_settings_versions: each version of the settings the figures rest on (work limit, grid,
//   zones, tolerances) with who saved it and when, so a report can say which settings it used;
// - recompute_jobs: a recompute after such a change, run in the background, with its stage,
//   fraction and, once done, the summary of what changed;
// - survey_snapshots.settingsVersionId: the settings version a snapshot was computed with.
// Every existing project gets version 1, its settings as they stand (no author: "as found").

const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

interface ProjectRow {
  id: number;
  gridOriginE: number;
  gridOriginN: number;
  cellSize: number;
  rotationDeg: number;
  rasterResolution: number;
  maxEdge: number;
  tolerance: number;
  firmShare: number;
  minCoverage: number;
  overDredgeAllowance: number;
  workLimitGeoJson: string | null;
}

interface ZoneRow {
  id: number;
  projectId: number;
  name: string;
  sortOrder: number;
  polygonGeoJson: string;
}

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("project_settings_versions", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    settings: { type: DataTypes.JSON, allowNull: false },
    changedParts: { type: DataTypes.JSON, allowNull: false },
    changedById: reference("users", "SET NULL", true),
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("project_settings_versions", ["projectId", "version"], { name: "settings_versions_project_version_unique", unique: true });
  await queryInterface.createTable("recompute_jobs", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE"),
    userId: reference("users", "SET NULL", true),
    settingsVersionId: reference("project_settings_versions", "CASCADE"),
    state: { type: DataTypes.ENUM("queued", "running", "done", "failed"), allowNull: false },
    stage: { type: DataTypes.STRING(60), allowNull: false },
    fraction: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    error: { type: DataTypes.TEXT, allowNull: true },
    summary: { type: DataTypes.JSON, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("recompute_jobs", ["projectId", "createdAt"], { name: "recompute_jobs_project_created" });
  await queryInterface.addColumn("survey_snapshots", "settingsVersionId", { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  // Named, so that down can drop it.
  await queryInterface.addConstraint("survey_snapshots", {
    type: "foreign key", name: "survey_snapshots_settings_version_fk", fields: ["settingsVersionId"],
    references: { table: "project_settings_versions", field: "id" }, onDelete: "SET NULL", onUpdate: "CASCADE",
  });

  const sequelize = queryInterface.sequelize;
  const projects = await sequelize.query<ProjectRow>(
    "SELECT id, gridOriginE, gridOriginN, cellSize, rotationDeg, rasterResolution, maxEdge, tolerance, firmShare, minCoverage, overDredgeAllowance, workLimitGeoJson FROM projects",
    { type: QueryTypes.SELECT },
  );
  const zones = await sequelize.query<ZoneRow>("SELECT id, projectId, name, sortOrder, polygonGeoJson FROM zones ORDER BY sortOrder, name", { type: QueryTypes.SELECT });
  const now = new Date();
  for (const project of projects) {
    const settings = {
      grid: { cellSize: project.cellSize, rotationDegrees: project.rotationDeg, originX: project.gridOriginE, originY: project.gridOriginN, rasterResolution: project.rasterResolution, maxEdge: project.maxEdge },
      tolerances: { firmSand: project.tolerance, firmShare: project.firmShare, minCoverage: project.minCoverage, overDredgeAllowance: project.overDredgeAllowance },
      workLimit: project.workLimitGeoJson ? JSON.parse(project.workLimitGeoJson) : null,
      zones: zones.filter((zone) => zone.projectId === project.id).map((zone) => ({ id: zone.id, name: zone.name, sortOrder: zone.sortOrder, geometry: JSON.parse(zone.polygonGeoJson) })),
    };
    await queryInterface.bulkInsert("project_settings_versions", [{ projectId: project.id, version: 1, settings: JSON.stringify(settings), changedParts: JSON.stringify(["as found"]), changedById: null, createdAt: now }]);
  }
  await sequelize.query(
    "UPDATE survey_snapshots s JOIN project_settings_versions v ON v.projectId = s.projectId AND v.version = 1 SET s.settingsVersionId = v.id",
  );
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `survey_snapshots` DROP FOREIGN KEY `survey_snapshots_settings_version_fk`");
  await queryInterface.sequelize.query("ALTER TABLE `survey_snapshots` DROP COLUMN `settingsVersionId`");
  await queryInterface.dropTable("recompute_jobs");
  await queryInterface.dropTable("project_settings_versions");
};
