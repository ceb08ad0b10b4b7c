import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Survey import: surveys and their soundings, the latest per-cell figures, one snapshot per
// survey date, remembered column mappings, import jobs (progress for the pages) and personal API
// tokens. Measures are DOUBLE; soundings are written with multi-row INSERTs in chunks.

const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
const bigId = () => ({ type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
const timestamps = () => ({
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
});
const reference = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});
const measure = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("surveys", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    kind: { type: DataTypes.ENUM("baseline", "progress", "closeout"), allowNull: false },
    surveyedOn: { type: DataTypes.DATEONLY, allowNull: false },
    timeZone: { type: DataTypes.STRING(64), allowNull: false },
    waterSurfaceElevation: measure(true),
    fileHasElevations: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    datum: { type: DataTypes.STRING(40), allowNull: false },
    crs: { type: DataTypes.STRING(40), allowNull: false },
    lengthUnit: { type: DataTypes.ENUM("us-ft", "ft", "m"), allowNull: false },
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    contentSha256: { type: DataTypes.CHAR(64), allowNull: false },
    rowCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    soundingCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    uploadedById: reference("users", "SET NULL", true),
    status: { type: DataTypes.ENUM("active", "retracted"), allowNull: false, defaultValue: "active" },
    retractedReason: { type: DataTypes.TEXT, allowNull: true },
    retractedById: reference("users", "SET NULL", true),
    retractedAt: { type: DataTypes.DATE, allowNull: true },
    qa: { type: DataTypes.JSON, allowNull: false },
    coverage: measure(true),
    ...timestamps(),
  });
  await queryInterface.addIndex("surveys", ["projectId", "surveyedOn"], { name: "surveys_project_surveyed_on" });
  await queryInterface.addIndex("surveys", ["projectId", "contentSha256"], { name: "surveys_project_sha256" });

  await queryInterface.createTable("soundings", {
    id: bigId(),
    surveyId: reference("surveys", "CASCADE"),
    sourceRow: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    easting: measure(),
    northing: measure(),
    depth: measure(true),
    probe: measure(true),
    elevation: measure(),
    refusalElevation: measure(true),
    time: { type: DataTypes.STRING(40), allowNull: true },
    pointId: { type: DataTypes.STRING(64), allowNull: true },
  });
  await queryInterface.addIndex("soundings", ["surveyId", "sourceRow"], { name: "soundings_survey_row" });

  await queryInterface.createTable("cell_results", {
    id: bigId(),
    projectId: reference("projects", "CASCADE"),
    row: { type: DataTypes.INTEGER, allowNull: false },
    col: { type: DataTypes.INTEGER, allowNull: false },
    label: { type: DataTypes.STRING(16), allowNull: false },
    zoneId: reference("zones", "SET NULL", true),
    plannedVolume: measure(),
    removedVolume: measure(),
    depositedVolume: measure(),
    remainingVolume: measure(),
    meanRemainingThickness: measure(true),
    coverage: measure(),
    areaInLimit: measure(),
    status: { type: DataTypes.ENUM("no-data", "untouched", "in-work", "at-firm-sand", "confirmed"), allowNull: false },
    latestSurveyId: reference("surveys", "SET NULL", true),
    computedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("cell_results", ["projectId", "row", "col"], { name: "cell_results_project_cell_unique", unique: true });

  await queryInterface.createTable("survey_snapshots", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    surveyedOn: { type: DataTypes.DATEONLY, allowNull: false },
    lastSurveyId: reference("surveys", "CASCADE"),
    totals: { type: DataTypes.JSON, allowNull: false },
    zones: { type: DataTypes.JSON, allowNull: false },
    cellCols: { type: DataTypes.INTEGER, allowNull: false },
    cellRows: { type: DataTypes.INTEGER, allowNull: false },
    firstCol: { type: DataTypes.INTEGER, allowNull: false },
    firstRow: { type: DataTypes.INTEGER, allowNull: false },
    remainingVolumes: { type: DataTypes.BLOB("medium"), allowNull: false },
    removedVolumes: { type: DataTypes.BLOB("medium"), allowNull: false },
    statuses: { type: DataTypes.BLOB("medium"), allowNull: false },
    computedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("survey_snapshots", ["projectId", "surveyedOn"], { name: "survey_snapshots_project_date_unique", unique: true });

  await queryInterface.createTable("column_mappings", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    mapping: { type: DataTypes.JSON, allowNull: false },
    updatedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("column_mappings", ["projectId"], { name: "column_mappings_project_unique", unique: true });

  await queryInterface.createTable("import_jobs", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    userId: reference("users", "SET NULL", true),
    state: { type: DataTypes.ENUM("staged", "validating", "ready", "committing", "done", "failed"), allowNull: false },
    stage: { type: DataTypes.STRING(40), allowNull: false },
    fraction: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    error: { type: DataTypes.TEXT, allowNull: true },
    surveyId: reference("surveys", "SET NULL", true),
    fileName: { type: DataTypes.STRING(255), allowNull: false },
    filePath: { type: DataTypes.STRING(1024), allowNull: false },
    fileSize: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    contentSha256: { type: DataTypes.CHAR(64), allowNull: false },
    options: { type: DataTypes.JSON, allowNull: false },
    preview: { type: DataTypes.JSON, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("import_jobs", ["projectId", "createdAt"], { name: "import_jobs_project_created" });

  await queryInterface.createTable("api_tokens", {
    id: id(),
    userId: reference("users", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    lastUsedAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("api_tokens", ["tokenHash"], { name: "api_tokens_token_hash_unique", unique: true });
  await queryInterface.addIndex("api_tokens", ["userId"], { name: "api_tokens_user" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["api_tokens", "import_jobs", "column_mappings", "survey_snapshots", "cell_results", "soundings", "surveys"]) {
    await queryInterface.dropTable(table);
  }
};
