import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Finds: what comes up from the bottom, where and when, with photos (objects in the store, keys
// here), custody handovers and status; the catalogue's per-year sequence (never reused); and the
// stop-work holds a cultural find or human remains places on the cells around it, with who must be
// told and when each was, and who authorised resuming. On projects: the catalogue prefix and the
// hold radius with its source.

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
const text = (length: number, allowNull = false) => ({ type: DataTypes.STRING(length), allowNull });

const PROJECT_COLUMNS = {
  findCataloguePrefix: () => ({ type: DataTypes.STRING(12), allowNull: false, defaultValue: "" }),
  holdRadiusM: () => ({ type: DataTypes.DOUBLE, allowNull: false, defaultValue: 50 }),
  // The default's words are shared/finds/finds.ts's DEFAULT_HOLD_RADIUS_SOURCE (a migration keeps its own copy).
  holdRadiusSource: () => ({
    type: DataTypes.STRING(500), allowNull: false,
    defaultValue: "Permit condition: work stops within a 100-metre-diameter area (50 m radius) around a cultural find or human remains; notify the same business day.",
  }),
};

export const up: Migration = async ({ context: queryInterface }) => {
  for (const [column, definition] of Object.entries(PROJECT_COLUMNS)) await queryInterface.addColumn("projects", column, definition());

  await queryInterface.createTable("find_sequences", {
    projectId: { ...reference("projects", "CASCADE"), primaryKey: true },
    year: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true },
    lastSequence: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  });

  await queryInterface.createTable("finds", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    catalogueNumber: text(40),
    catalogueYear: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    catalogueSequence: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    category: { type: DataTypes.ENUM("cultural", "faunal", "human-remains", "historic-debris", "modern-debris"), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    material: text(120),
    count: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    taxon: text(120, true),
    element: text(120, true),
    condition: text(200),
    cellRow: { type: DataTypes.INTEGER, allowNull: true },
    cellCol: { type: DataTypes.INTEGER, allowNull: true },
    cellLabel: text(16, true),
    /** Project CRS, project length unit. */
    positionX: { type: DataTypes.DOUBLE, allowNull: true },
    positionY: { type: DataTypes.DOUBLE, allowNull: true },
    depthBelowSurface: { type: DataTypes.DOUBLE, allowNull: true },
    depthInMuck: { type: DataTypes.DOUBLE, allowNull: true },
    diveId: reference("dives", "SET NULL", true),
    teamId: reference("dive_teams", "SET NULL", true),
    finder: text(120),
    foundAt: { type: DataTypes.DATE, allowNull: false },
    fieldTag: text(60),
    status: { type: DataTypes.ENUM("in-field", "site-store", "at-lab", "curated", "released"), allowNull: false, defaultValue: "in-field" },
    accessionNumber: text(60, true),
    statusNote: { type: DataTypes.TEXT, allowNull: true },
    idempotencyKey: text(80, true),
    loggedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("finds", ["projectId", "catalogueYear", "catalogueSequence"], { name: "finds_project_sequence_unique", unique: true });
  await queryInterface.addIndex("finds", ["projectId", "catalogueNumber"], { name: "finds_project_catalogue_unique", unique: true });
  await queryInterface.addIndex("finds", ["projectId", "idempotencyKey"], { name: "finds_project_idempotency_unique", unique: true });

  await queryInterface.createTable("find_photos", {
    id: id(),
    findId: reference("finds", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    objectKey: text(300),
    thumbnailKey: text(300),
    contentType: text(60),
    sizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    thumbnailSizeBytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    widthPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    heightPx: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    originalFileName: text(255),
    /** What the camera wrote (GPS position, time taken, camera), kept in the record only; stripped from the stored image. */
    exif: { type: DataTypes.JSON, allowNull: true },
    uploadedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("find_photos", ["findId"], { name: "find_photos_find" });

  await queryInterface.createTable("find_custody", {
    id: id(),
    findId: reference("finds", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    fromName: text(120),
    toName: text(120),
    place: text(200),
    purpose: { type: DataTypes.ENUM("to-site-store", "to-state-lab", "to-conservator", "returned"), allowNull: false },
    handedAt: { type: DataTypes.DATE, allowNull: false },
    /** The receiver's name as they typed it: their signature. */
    receiverSignature: text(120),
    note: { type: DataTypes.TEXT, allowNull: true },
    /** A photo of the signed paper form, when there is one. */
    formPhotoId: reference("find_photos", "SET NULL", true),
    recordedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("find_custody", ["findId", "handedAt"], { name: "find_custody_find_time" });

  await queryInterface.createTable("holds", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    findId: reference("finds", "CASCADE"),
    radiusM: { type: DataTypes.DOUBLE, allowNull: false },
    radiusSource: text(500),
    placedAt: { type: DataTypes.DATE, allowNull: false },
    liftedAt: { type: DataTypes.DATE, allowNull: true },
    liftedById: reference("users", "SET NULL", true),
    authorisedBy: text(200, true),
    liftNote: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("holds", ["projectId", "liftedAt"], { name: "holds_project_open" });

  await queryInterface.createTable("hold_cells", {
    id: id(),
    holdId: reference("holds", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    row: { type: DataTypes.INTEGER, allowNull: false },
    col: { type: DataTypes.INTEGER, allowNull: false },
    label: text(16),
  });
  await queryInterface.addIndex("hold_cells", ["holdId", "row", "col"], { name: "hold_cells_hold_cell_unique", unique: true });
  await queryInterface.addIndex("hold_cells", ["projectId", "row", "col"], { name: "hold_cells_project_cell" });

  await queryInterface.createTable("hold_notices", {
    id: id(),
    holdId: reference("holds", "CASCADE"),
    agency: { type: DataTypes.ENUM("historic-preservation-office", "medical-examiner", "state-archaeologist"), allowNull: false },
    toldAt: { type: DataTypes.DATE, allowNull: true },
    toldById: reference("users", "SET NULL", true),
    note: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("hold_notices", ["holdId", "agency"], { name: "hold_notices_hold_agency_unique", unique: true });
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["hold_notices", "hold_cells", "holds", "find_custody", "find_photos", "finds", "find_sequences"]) await queryInterface.dropTable(table);
  const columns = Object.keys(PROJECT_COLUMNS).map((column) => `DROP COLUMN \`${column}\``).join(", ");
  await queryInterface.sequelize.query(`ALTER TABLE \`projects\` ${columns}`);
};
