import { DataTypes } from "sequelize";
import type { Migration } from "../umzug";

// Accounts, projects, zones, memberships, invitations, password resets, audit log and sign-in
// attempts. Measures are DOUBLE (DECIMAL reads back as a string); geometry is GeoJSON text in
// lon/lat (Sequelize's GEOMETRY loses the SRID).

const ROLES = ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "outreach", "viewer"];
// Fresh definitions per column: Sequelize writes into attribute definitions.
const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false });
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
const measure = () => ({ type: DataTypes.DOUBLE, allowNull: false });

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.createTable("users", {
    id: id(),
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: false },
    isSiteAdmin: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps(),
  });
  await queryInterface.addIndex("users", ["email"], { name: "users_email_unique", unique: true });

  await queryInterface.createTable("projects", {
    id: id(),
    name: { type: DataTypes.STRING(200), allowNull: false },
    slug: { type: DataTypes.STRING(100), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    crs: { type: DataTypes.STRING(40), allowNull: false },
    lengthUnit: { type: DataTypes.ENUM("us-ft", "ft", "m"), allowNull: false },
    gridOriginE: measure(),
    gridOriginN: measure(),
    cellSize: measure(),
    rasterResolution: measure(),
    maxEdge: measure(),
    rotationDeg: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    tolerance: measure(),
    firmShare: measure(),
    minCoverage: measure(),
    workLimitGeoJson: { type: DataTypes.TEXT("medium"), allowNull: true },
    minTeamSize: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 2 },
    ...timestamps(),
  });
  await queryInterface.addIndex("projects", ["slug"], { name: "projects_slug_unique", unique: true });

  await queryInterface.createTable("zones", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    name: { type: DataTypes.STRING(120), allowNull: false },
    polygonGeoJson: { type: DataTypes.TEXT("medium"), allowNull: false },
    sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...timestamps(),
  });
  await queryInterface.addIndex("zones", ["projectId", "name"], { name: "zones_project_name_unique", unique: true });

  await queryInterface.createTable("memberships", {
    id: id(),
    userId: reference("users", "CASCADE"),
    projectId: reference("projects", "CASCADE"),
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    ...timestamps(),
  });
  await queryInterface.addIndex("memberships", ["userId", "projectId"], { name: "memberships_user_project_unique", unique: true });
  await queryInterface.addIndex("memberships", ["projectId"], { name: "memberships_project" });

  await queryInterface.createTable("invitations", {
    id: id(),
    projectId: reference("projects", "CASCADE"),
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    acceptedAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    invitedById: reference("users", "SET NULL", true),
    ...timestamps(),
  });
  await queryInterface.addIndex("invitations", ["tokenHash"], { name: "invitations_token_hash_unique", unique: true });
  await queryInterface.addIndex("invitations", ["projectId", "email"], { name: "invitations_project_email" });

  await queryInterface.createTable("password_resets", {
    id: id(),
    userId: reference("users", "CASCADE"),
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    ...timestamps(),
  });
  await queryInterface.addIndex("password_resets", ["tokenHash"], { name: "password_resets_token_hash_unique", unique: true });
  await queryInterface.addIndex("password_resets", ["userId"], { name: "password_resets_user" });

  await queryInterface.createTable("audit_events", {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    projectId: reference("projects", "CASCADE", true),
    userId: reference("users", "SET NULL", true),
    action: { type: DataTypes.STRING(60), allowNull: false },
    detail: { type: DataTypes.JSON, allowNull: false },
    ip: { type: DataTypes.STRING(64), allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("audit_events", ["projectId", "createdAt"], { name: "audit_events_project_created" });
  await queryInterface.addIndex("audit_events", ["userId", "createdAt"], { name: "audit_events_user_created" });

  await queryInterface.createTable("login_attempts", {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true, allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: false },
    ip: { type: DataTypes.STRING(64), allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex("login_attempts", ["email", "createdAt"], { name: "login_attempts_email_created" });
  await queryInterface.addIndex("login_attempts", ["ip", "createdAt"], { name: "login_attempts_ip_created" });
};

export const down: Migration = async ({ context: queryInterface }) => {
  for (const table of ["login_attempts", "audit_events", "password_resets", "invitations", "memberships", "zones", "projects", "users"]) {
    await queryInterface.dropTable(table);
  }
};
