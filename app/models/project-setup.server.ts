import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { createCrs, type Crs } from "../../shared/crs";
import { cellCentroid, cellCount, cellIndex, cellLabel, createCellGrid, defaultGridOrigin, parseCellLabel } from "../../shared/grid/cell-grid";
import { cellsOutline } from "../../shared/grid/cell-union";
import type { ZoneFileCandidate } from "../../shared/grid/zone-file";
import { parseWorkLimitGeoJson } from "../../shared/grid/work-limit-geojson";
import { describeArea, firstVertexOutside } from "../../shared/grid/area-of-use";
import type { LonLatBounds } from "../../shared/soundings/row-checks";
import { isInsideWorkLimit, type ProjectedMultiPolygon } from "../../shared/grid/work-limit";
import { defaultsFor, unitLabel } from "../../shared/units";
import { SURVEY_ORDERS, type SurveyOrder } from "../../shared/qa/tvu";
import { clipToLimit, zoneOutsideLimit, zoneOverlapArea } from "../../shared/grid/zone-fit";
import { ZONE_COLOURS, defaultZoneColour, isZoneColour, zoneColourName } from "../../shared/zone-colours";
import { emergencyInfoSchema, isEmergencyInfoEmpty, type EmergencyInfo } from "../../shared/dive-plan/emergency-info";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { canCreateProjects } from "~/lib/auth/permissions";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { normaliseEmail, type UserView } from "~/lib/auth/users.server";
import { getSequelize, LENGTH_UNITS, Membership, Project, ProjectSettingsVersion, Survey, User, Zone, type LengthUnit, type VersionedSettings } from "~/lib/db.server";
import { projectGrid } from "~/lib/engine/project-geometry.server";
import { currentSettingsVersion } from "~/lib/engine/recompute.server";
import { findRecomputeJob, latestRecomputeJob, presentRecomputeJob, queueRecompute, type RecomputeJobView } from "~/lib/engine/recompute-jobs.server";
import { lengthUnitOfCrs, resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { isTimeZone } from "~/lib/import/import-options";
import { withProjectLock } from "~/lib/import/project-lock.server";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError, validationErrorFrom, type ErrorDetail } from "~/lib/errors";

/**
 * Setting a project up and changing its settings: the one service the API, the settings page,
 * the new-project form and the demo seeder all go through. Settings are checked as a whole (the
 * CRS decides how the work limit is read, the work limit where the grid starts) and every problem
 * is named by its field; a change to what the figures rest on (work limit, zones, grid,
 * tolerances) is kept as a new settings version and, once surveys exist, recomputes every
 * survey's figures in a background job (recompute-jobs.server.ts).
 */

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive(`${what} must be more than 0`);
const share = (what: string) => z.number({ error: `${what} must be a number` }).finite().gt(0, `${what} must be more than 0`).max(1, `${what} is a share from 0 to 1`);
const text = (max: number) => z.string().trim().max(max, `at most ${max} characters`);

const gridSchema = z.object({
  cellSize: positive("The cell size"),
  rotationDegrees: z.number().finite().min(-360).max(360).optional(),
  originX: z.number().finite().optional(),
  originY: z.number().finite().optional(),
  rasterResolution: positive("The raster resolution").optional(),
  maxEdge: positive("The longest triangle edge").optional(),
});
const tolerancesSchema = z.object({
  firmSand: z.number().finite().min(0, "The firm-sand tolerance cannot be negative").optional(),
  firmShare: share("The firm share").optional(),
  minCoverage: share("The minimum coverage").optional(),
  overDredgeAllowance: z.number({ error: "The over-dredge allowance must be a number" }).finite().min(0, "The over-dredge allowance cannot be negative").optional(),
  /** The IHO S-44 order new imports are judged against by default; not a figures setting (each survey keeps its own). */
  surveyOrder: z.enum(SURVEY_ORDERS, { error: `The survey order is one of the IHO S-44 orders: ${SURVEY_ORDERS.join(", ")}` }).optional(),
});
/** A zone; `id` (a zone of this project) keeps the zone, and what refers to it, through a rename or a new outline. */
const zoneSchema = z.object({
  id: z.number({ error: "A zone's id is a whole number" }).int().positive().optional(),
  name: z.string({ error: "A zone needs a name" }).trim().min(1, "A zone needs a name").max(120, "A zone's name is at most 120 characters"),
  geometry: z.unknown(),
  /** One of the palette's colours; a new zone without one gets the next free default, a kept zone keeps its own. */
  colour: z.string({ error: "A zone's colour is written as in the palette, e.g. \"#0d5c66\"" }).trim().toLowerCase().refine((value): boolean => isZoneColour(value), `A zone's colour must be one of the palette's: ${ZONE_COLOURS.map((colour) => `${colour.value} (${colour.name})`).join(", ")}`).optional(),
});

const identityFields = {
  description: text(5000).optional(),
  agency: text(200).optional(),
  permitNumbers: text(500).optional(),
  timeZone: z.string().trim().refine(isTimeZone, "is not a time zone name such as America/New_York").optional(),
  verticalDatum: text(60).optional(),
  minTeamSize: z.number({ error: "The minimum team size is a whole number" }).int("The minimum team size is a whole number").min(1, "The minimum team size is at least 1").max(20, "The minimum team size is at most 20").optional(),
};

export const newProjectSchema = z.object({
  name: z.string({ error: "The project needs a name" }).trim().min(1, "The project needs a name").max(200),
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, "lower-case letters, digits and single hyphens").max(100).optional(),
  ...identityFields,
  crs: z.string({ error: "Give the CRS as an EPSG code, e.g. EPSG:2237" }).trim().regex(/^EPSG:\d{1,6}$/i, "Give the CRS as an EPSG code, e.g. EPSG:2237"),
  lengthUnit: z.enum(LENGTH_UNITS, { error: `The length unit is one of ${LENGTH_UNITS.join(", ")}` }),
  workLimit: z.unknown().refine((value) => value !== undefined, "The work limit is missing: send it as GeoJSON"),
  grid: gridSchema,
  tolerances: tolerancesSchema.optional(),
  zones: z.array(zoneSchema).max(100).optional(),
  /** Emergency information for the day sheet (all of it optional; a name needs its phone). */
  emergency: emergencyInfoSchema.optional(),
  /** The first manager's e-mail (an existing account); the creator when none is named. */
  manager: z.email("is not an e-mail address").optional(),
});
export type NewProjectInput = z.infer<typeof newProjectSchema>;

const clockTime = (what: string) => z.string({ error: `${what} is a time of day, HH:MM` }).trim().regex(/^([01]\d|2[0-3]):[0-5]\d$/, `${what} is a time of day written HH:MM (24-hour), e.g. 07:00`);

/** The working hours, local to the project's time zone; null clears them. A shift past midnight is not a work day here. */
const workDaySchema = z
  .object({ start: clockTime("The work day's start"), end: clockTime("The work day's end") })
  .refine((day) => day.end > day.start, { message: "The work day must end after it starts (same day)", path: ["end"] })
  .nullable();

/** The finds settings: the catalogue prefix and the stop-work hold radius with its source. */
const findsSettingsSchema = z.object({
  cataloguePrefix: z.string().trim().toUpperCase().regex(/^([A-Z0-9]{2,8})?$/, "2 to 8 letters or digits (empty: the initials of the project's short name)").optional(),
  holdRadiusM: z.number({ error: "The hold radius is a number of metres" }).finite().min(1, "The hold radius is at least 1 m").max(2000, "The hold radius is at most 2,000 m").optional(),
  holdRadiusSource: z.string().trim().min(1, "Say where the hold radius comes from (the permit condition)").max(500).optional(),
});

export const projectPatchSchema = z
  .object({
    name: newProjectSchema.shape.name.optional(),
    ...identityFields,
    crs: newProjectSchema.shape.crs.optional(),
    lengthUnit: newProjectSchema.shape.lengthUnit.optional(),
    workLimit: z.unknown().optional(),
    grid: gridSchema.partial().optional(),
    tolerances: tolerancesSchema.optional(),
    zones: z.array(zoneSchema).max(100).optional(),
    finds: findsSettingsSchema.optional(),
    /** Replaces the emergency information as a whole; every field blank clears it. */
    emergency: emergencyInfoSchema.optional(),
    /** The working hours {start, end} ("HH:MM", the project's local time); null clears them. */
    workDay: workDaySchema.optional(),
  })
  .refine((patch) => Object.values(patch).some((value) => value !== undefined), "Send at least one setting to change");
export type ProjectPatch = z.infer<typeof projectPatchSchema>;

/** The settings as the API and the settings page show them. */
export interface ProjectSettings {
  id: number;
  name: string;
  slug: string;
  description: string;
  agency: string;
  permitNumbers: string;
  timeZone: string;
  crs: string;
  crsName: string;
  lengthUnit: LengthUnit;
  verticalDatum: string;
  minTeamSize: number;
  /** Lon/lat GeoJSON (RFC 7946). */
  workLimit: unknown;
  /** Plan area of the work limit, square project units. */
  workLimitArea: number | null;
  grid: { cellSize: number; rotationDegrees: number; originX: number; originY: number; rasterResolution: number; maxEdge: number };
  /**
   * `overDredgeAllowance`: how far below firm sand removal is still paid (project length unit).
   * `surveyOrder`: the IHO S-44 order the import form offers for a new survey (each survey keeps the order it was imported with).
   */
  tolerances: { firmSand: number; firmShare: number; minCoverage: number; overDredgeAllowance: number; surveyOrder: SurveyOrder };
  /** `colour`: one of the palette's (shared/zone-colours.ts). */
  zones: Array<{ id: number; name: string; sortOrder: number; colour: string; geometry: unknown }>;
  /** Cells of the grid over the work limit's extent. */
  cellCount: number | null;
  /** Surveys stored (active or retracted): a change to the figures' settings recomputes them. */
  surveyCount: number;
  /** The catalogue prefix as set (empty: the slug's initials) and the hold radius (metres) with its source. */
  finds: { cataloguePrefix: string; holdRadiusM: number; holdRadiusSource: string };
  /** Nearest hospital and hyperbaric chamber with phones, emergency services, site address and access point; null: none set. */
  emergency: EmergencyInfo | null;
  /** The working hours, "HH:MM" in the project's time zone; null: not set. */
  workDay: { start: string; end: string } | null;
  /** When the project was archived (ISO 8601); null: open. */
  archivedAt: string | null;
}

/** Above this many cells the settings page asks before saving a grid: the map and every recompute slow down with the count. */
export const LARGE_GRID_CELLS = 200_000;

// ——— Checks shared by creating and changing.

interface CheckedCrs {
  crs: Crs;
  name: string;
  code: number | null;
  areaOfUse: LonLatBounds | null;
}

function checkCrs(code: string, lengthUnit: LengthUnit, problems: ErrorDetail[]): CheckedCrs | null {
  let resolved;
  try {
    resolved = resolveCrsDefinition(code);
  } catch (error) {
    problems.push({ field: "crs", message: (error as Error).message });
    return null;
  }
  const unit = lengthUnitOfCrs(resolved);
  if (unit === null) {
    problems.push({ field: "crs", message: `EPSG:${resolved.code} (${resolved.name}) is not in feet or metres; choose a projected CRS such as a state plane or UTM zone` });
    return null;
  }
  if (unit !== lengthUnit) {
    problems.push({ field: "lengthUnit", message: `EPSG:${resolved.code} (${resolved.name}) works in ${resolved.unit}; the length unit must be ${unit}` });
    return null;
  }
  return { crs: createCrs(resolved.definition), name: resolved.name, code: resolved.code, areaOfUse: resolved.areaOfUse };
}

/**
 * A GeoJSON geometry read and checked; each problem goes to `field`. Beyond the shape's own rules,
 * it must lie in the CRS's area of use (EPSG registry), within a margin: coordinates far outside
 * it were read in the wrong CRS, or the CRS is the wrong one.
 */
function checkGeometry(field: string, label: string, geoJson: unknown, checked: CheckedCrs, problems: ErrorDetail[]) {
  const parsed = parseWorkLimitGeoJson(geoJson, checked.crs);
  if (!parsed.ok) {
    for (const problem of parsed.problems) problems.push({ field, message: `${label} ${problem.message}.` });
    return null;
  }
  const polygons = parsed.lonLat.type === "Polygon" ? [parsed.lonLat.coordinates] : parsed.lonLat.coordinates;
  const outside = firstVertexOutside(polygons, checked.areaOfUse);
  if (outside) {
    const where = parsed.coordinates === "lon-lat" ? `read as lon/lat, lies at ${outside.lat.toFixed(4)}, ${outside.lon.toFixed(4)}` : `lies at ${outside.lat.toFixed(4)}, ${outside.lon.toFixed(4)} (lat, lon)`;
    problems.push({
      field,
      message: `${label} polygon ${outside.polygon}, ring ${outside.ring}, vertex ${outside.vertex} ${where}, outside the area EPSG:${checked.code} (${checked.name}) is made for (${describeArea(checked.areaOfUse!)}). Check the file's coordinates, or choose the CRS of the site.`,
    });
    return null;
  }
  return parsed;
}

/** A zone may reach outside the work limit by at most this share of one cell's area (rounding of shared vertices). */
const ZONE_OUTSIDE_CELL_SHARE = 0.01;

/** Where the zones are checked against: the work limit in force and the grid's cell size. */
interface ZoneFrame {
  limit: ProjectedMultiPolygon | null;
  cellSize: number;
  lengthUnit: LengthUnit;
}

/**
 * One zone's outline read and checked (shape, area of use, inside the work limit); each problem
 * goes to `field`, worded with `label` (e.g. `Zone "North cove"`, `Feature 3 ("North cove")`).
 */
function checkZoneOutline(field: string, label: string, geometry: unknown, crs: CheckedCrs, frame: ZoneFrame, problems: ErrorDetail[]) {
  const parsed = checkGeometry(field, label, geometry, crs, problems);
  if (parsed && frame.limit) {
    const outside = zoneOutsideLimit(parsed.projected, frame.limit, ZONE_OUTSIDE_CELL_SHARE * frame.cellSize * frame.cellSize);
    if (outside) {
      const where = outside.vertex
        ? `polygon ${outside.vertex.polygon}, ring ${outside.vertex.ring}, vertex ${outside.vertex.vertex} lies outside it`
        : "an edge cuts across the limit's boundary";
      problems.push({
        field,
        message: `${label} must lie inside the work limit: ${Number.isFinite(outside.areaOutside) ? `about ${Math.round(outside.areaOutside).toLocaleString("en-US")} ${unitLabel(frame.lengthUnit, "area")} of it lies outside` : "part of it lies outside"} (${where}). Move its outline inside the limit.`,
      });
      return null;
    }
  }
  return parsed;
}

function checkZones(zones: Array<{ id?: number; name: string; colour?: string; geometry: unknown }>, crs: CheckedCrs, frame: ZoneFrame, problems: ErrorDetail[]) {
  const seen = new Set<string>();
  const ids = new Set<number>();
  return zones.map((zone, index) => {
    const key = zone.name.toLowerCase();
    if (seen.has(key)) problems.push({ field: `zones.${index}.name`, message: `Zone "${zone.name}" is named twice.` });
    seen.add(key);
    if (zone.id !== undefined) {
      if (ids.has(zone.id)) problems.push({ field: `zones.${index}.id`, message: `Zone "${zone.name}": zone id ${zone.id} is given twice.` });
      ids.add(zone.id);
    }
    const parsed = checkZoneOutline(`zones.${index}.geometry`, `Zone "${zone.name}"`, zone.geometry, crs, frame, problems);
    return parsed && { id: zone.id, name: zone.name, sortOrder: index + 1, colour: zone.colour, lonLat: parsed.lonLat, projected: parsed.projected };
  });
}

/**
 * Pairs of zones that share area (square project units), for the page to say which zone their
 * shared cells count in (the earlier one, by the one rule of zone membership); slivers under a
 * hundredth of a cell are left out.
 */
export function zoneOverlaps(zones: ReturnType<typeof checkZones>, cellSize: number): Array<{ first: string; second: string; area: number }> {
  const found: Array<{ first: string; second: string; area: number }> = [];
  const checked = zones.filter((zone): zone is NonNullable<typeof zone> => zone !== null);
  for (let i = 0; i < checked.length; i++) {
    for (let j = i + 1; j < checked.length; j++) {
      const area = zoneOverlapArea(checked[i].projected, checked[j].projected);
      if (area > ZONE_OUTSIDE_CELL_SHARE * cellSize * cellSize) found.push({ first: checked[i].name, second: checked[j].name, area });
    }
  }
  return found;
}

interface GridColumns {
  gridOriginE: number;
  gridOriginN: number;
  cellSize: number;
  rotationDeg: number;
  rasterResolution: number;
  maxEdge: number;
}

function checkGrid(grid: GridColumns, problems: ErrorDetail[]) {
  if (grid.rasterResolution > grid.cellSize) problems.push({ field: "grid.rasterResolution", message: "The raster resolution must not be coarser than the cell size." });
  if (grid.maxEdge < grid.rasterResolution) problems.push({ field: "grid.maxEdge", message: "The longest triangle edge must be at least the raster resolution." });
}

/** The stored (lon/lat) work limit read again in the project's CRS; null when there is none. */
function storedLimit(crs: Crs, lonLatGeoJson: string | null) {
  if (!lonLatGeoJson) return null;
  const parsed = parseWorkLimitGeoJson(JSON.parse(lonLatGeoJson), crs);
  return parsed.ok ? parsed : null;
}

function projectedLimit(crs: Crs, lonLatGeoJson: string | null): ProjectedMultiPolygon | null {
  return storedLimit(crs, lonLatGeoJson)?.projected ?? null;
}

/** Creates `zones`; one without a colour gets the first the project's zones (`taken`, kept up to date) do not have yet. */
async function createZones(projectId: number, zones: ReturnType<typeof checkZones>, transaction: Transaction, taken: string[] = []): Promise<void> {
  for (const zone of zones) {
    if (!zone) continue;
    const colour = zone.colour ?? defaultZoneColour(taken, zone.sortOrder - 1);
    taken.push(colour);
    await Zone.create({ projectId, name: zone.name, sortOrder: zone.sortOrder, colour, polygonGeoJson: JSON.stringify(zone.lonLat) }, { transaction });
  }
}

/**
 * Makes the project's zones those given: a zone named by its id, else by its name (either case),
 * is kept and changed in place, so what refers to it (sediment samples, cell results) keeps it;
 * the rest are created, and zones not given are removed. Renames go through a name no zone can
 * have, so two zones may swap names under the unique (project, name) index.
 */
async function replaceZones(projectId: number, zones: ReturnType<typeof checkZones>, transaction: Transaction): Promise<void> {
  const existing = await Zone.findAll({ where: { projectId }, transaction, lock: transaction.LOCK.UPDATE });
  const byId = new Map(existing.map((zone) => [zone.id, zone]));
  const byName = new Map(existing.map((zone) => [zone.name.toLowerCase(), zone]));
  const kept = new Map<Zone, NonNullable<(typeof zones)[number]>>();
  const created: Array<NonNullable<(typeof zones)[number]>> = [];
  for (const zone of zones) {
    if (!zone) continue;
    const byItsName = byName.get(zone.name.toLowerCase());
    const row = zone.id !== undefined ? byId.get(zone.id) : byItsName && !zones.some((other) => other?.id === byItsName.id) ? byItsName : undefined;
    if (row && !kept.has(row)) kept.set(row, zone);
    else created.push(zone);
  }
  const keptIds = [...kept.keys()].map((zone) => zone.id);
  await Zone.destroy({ where: { projectId, ...(keptIds.length > 0 ? { id: { [Op.notIn]: keptIds } } : {}) }, transaction });
  for (const [row, zone] of kept) if (row.name !== zone.name) await row.update({ name: `\u0001${row.id}` }, { transaction });
  for (const [row, zone] of kept) await row.update({ name: zone.name, sortOrder: zone.sortOrder, colour: zone.colour ?? row.colour, polygonGeoJson: JSON.stringify(zone.lonLat) }, { transaction });
  await createZones(projectId, created, transaction, [...kept].map(([row, zone]) => zone.colour ?? row.colour));
}

async function freeSlug(name: string, transaction: Transaction): Promise<string> {
  const base = name.normalize("NFKD").toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 90) || "project";
  const taken = new Set((await Project.findAll({ where: { slug: { [Op.like]: `${base}%` } }, attributes: ["slug"], transaction })).map((project) => project.slug));
  let slug = base;
  for (let suffix = 2; taken.has(slug); suffix++) slug = `${base}-${suffix}`;
  return slug;
}

// ——— The settings history.

/** The figures settings of `settings` as a version keeps them. */
function versionedOf(settings: ProjectSettings): VersionedSettings {
  return {
    grid: settings.grid,
    tolerances: settings.tolerances,
    workLimit: settings.workLimit,
    zones: settings.zones.map((zone) => ({ id: zone.id, name: zone.name, sortOrder: zone.sortOrder, geometry: zone.geometry })),
  };
}

/** Which parts of the figures settings differ between two versions' values, in the history's words. */
function changedParts(before: VersionedSettings, after: VersionedSettings): string[] {
  const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);
  const parts: string[] = [];
  if (!same(before.workLimit, after.workLimit)) parts.push("work limit");
  if (!same(before.grid, after.grid)) parts.push("grid");
  if (!same(before.zones, after.zones)) parts.push("zones");
  if (!same(before.tolerances, after.tolerances)) parts.push("tolerances");
  return parts;
}

/** Keeps `settings` as the project's next settings version (1 for a new project). */
async function keepSettingsVersion(projectId: number, settings: VersionedSettings, changed: string[], userId: number | null, transaction: Transaction): Promise<ProjectSettingsVersion> {
  const latest = await currentSettingsVersion(projectId, transaction);
  return ProjectSettingsVersion.create({ projectId, version: (latest?.version ?? 0) + 1, settings, changedParts: changed, changedById: userId }, { transaction });
}

export interface SettingsVersionView {
  version: number;
  /** ISO 8601. */
  savedAt: string;
  /** Who saved it; null when the account is gone or for the settings as found when the history began. */
  savedBy: string | null;
  changed: string[];
  grid: VersionedSettings["grid"];
  tolerances: VersionedSettings["tolerances"];
  zones: string[];
}

/** The project's settings versions, newest first (`limit` of them), as the settings page and the API show them. */
export async function listSettingsVersions(project: ProjectView, limit = 50): Promise<SettingsVersionView[]> {
  const versions = await ProjectSettingsVersion.findAll({
    where: { projectId: project.id }, order: [["version", "DESC"]], limit,
    include: [{ model: User, as: "changedBy", attributes: ["id", "name", "email"] }],
  });
  return versions.map((row) => ({
    version: row.version,
    savedAt: row.createdAt.toISOString(),
    savedBy: row.changedBy ? row.changedBy.name || row.changedBy.email : null,
    changed: row.changedParts,
    grid: row.settings.grid,
    tolerances: row.settings.tolerances,
    zones: row.settings.zones.map((zone) => zone.name),
  }));
}

// ——— Creating.

/** A ForbiddenError unless the permission table lets `user` create projects (routes ask before reading a body). */
export function assertMayCreateProjects(user: UserView): void {
  if (!canCreateProjects(user)) throw new ForbiddenError("Only a site admin, or a user a site admin has allowed, may create projects.");
}

/**
 * Creates a project from `input` with its zones and first manager (the named account, else the
 * creator), in one transaction (the caller's, when given, as the seeder's). Throws ForbiddenError
 * when `actor` may not create projects, ValidationError naming each bad field.
 */
export async function createProject(actor: UserView, input: NewProjectInput, options: { ip?: string | null; transaction?: Transaction } = {}): Promise<{ id: number }> {
  assertMayCreateProjects(actor);
  const problems: ErrorDetail[] = [];
  const checked = checkCrs(input.crs, input.lengthUnit, problems);
  const limit = checked && checkGeometry("workLimit", "The work limit", input.workLimit, checked, problems);
  const zones = checked ? checkZones(input.zones ?? [], checked, { limit: limit ? limit.projected : null, cellSize: input.grid.cellSize, lengthUnit: input.lengthUnit }, problems) : [];
  // Read in the caller's transaction: the seeder creates the manager's account in it.
  const manager = input.manager ? await User.findOne({ where: { email: normaliseEmail(input.manager) }, transaction: options.transaction }) : null;
  if (input.manager && !manager) problems.push({ field: "manager", message: `No account has the e-mail ${input.manager}; create it first or name an existing one.` });
  const defaults = defaultsFor(input.lengthUnit);
  const cellSize = input.grid.cellSize;
  const rotationDeg = input.grid.rotationDegrees ?? 0;
  const [defaultX, defaultY] = limit ? defaultGridOrigin(limit.projected, cellSize, rotationDeg) : [0, 0];
  const grid: GridColumns = {
    cellSize,
    rotationDeg,
    gridOriginE: input.grid.originX ?? defaultX,
    gridOriginN: input.grid.originY ?? defaultY,
    rasterResolution: input.grid.rasterResolution ?? Math.min(defaults.resolution, cellSize),
    maxEdge: input.grid.maxEdge ?? Math.max(defaults.maxEdge, 2 * cellSize),
  };
  checkGrid(grid, problems);
  if (problems.length > 0 || !checked || !limit) throw new ValidationError(problems);

  const create = async (transaction: Transaction) => {
    const project = await Project.create(
      {
        name: input.name,
        slug: input.slug ?? (await freeSlug(input.name, transaction)),
        description: input.description ?? "",
        agency: input.agency ?? "",
        permitNumbers: input.permitNumbers ?? "",
        timeZone: input.timeZone ?? "UTC",
        verticalDatum: input.verticalDatum ?? "",
        crs: input.crs.toUpperCase(),
        lengthUnit: input.lengthUnit,
        ...grid,
        tolerance: input.tolerances?.firmSand ?? defaults.tolerance,
        firmShare: input.tolerances?.firmShare ?? 0.95,
        minCoverage: input.tolerances?.minCoverage ?? 0.8,
        overDredgeAllowance: input.tolerances?.overDredgeAllowance ?? 0,
        // What the import form offered before the project had its own (IHO S-44 order 1a).
        surveyOrder: input.tolerances?.surveyOrder ?? "1a",
        workLimitGeoJson: JSON.stringify(limit.lonLat),
        // A diver, a tender and a standby diver (practice; the dive plan refuses smaller teams).
        minTeamSize: input.minTeamSize ?? 3,
        emergencyInfo: input.emergency && !isEmergencyInfoEmpty(input.emergency) ? input.emergency : null,
      },
      { transaction },
    );
    await createZones(project.id, zones, transaction);
    await Membership.create({ projectId: project.id, userId: manager?.id ?? actor.id, role: "manager" }, { transaction });
    const settings = await settingsOf(project, transaction);
    await keepSettingsVersion(project.id, versionedOf(settings), ["created"], actor.id, transaction);
    await recordAudit(
      { action: AUDIT_ACTIONS.projectCreated, projectId: project.id, userId: actor.id, ip: options.ip ?? null, detail: { after: auditable(settings), workLimitCoordinates: limit.coordinates, manager: manager?.email ?? actor.email } },
      transaction,
    );
    return { id: project.id };
  };
  return options.transaction ? create(options.transaction) : getSequelize().transaction(create);
}

// ——— Reading.

async function settingsOf(project: Project, transaction?: Transaction): Promise<ProjectSettings> {
  const resolved = resolveCrsDefinition(project.crs);
  const crs = createCrs(resolved.definition);
  const limit = storedLimit(crs, project.workLimitGeoJson);
  const grid = projectGrid(project);
  const zones = await Zone.findAll({ where: { projectId: project.id }, order: [["sortOrder", "ASC"], ["name", "ASC"]], transaction });
  return {
    id: project.id,
    name: project.name,
    slug: project.slug,
    description: project.description,
    agency: project.agency,
    permitNumbers: project.permitNumbers,
    timeZone: project.timeZone,
    crs: project.crs,
    crsName: resolved.name,
    lengthUnit: project.lengthUnit,
    verticalDatum: project.verticalDatum,
    minTeamSize: project.minTeamSize,
    workLimit: project.workLimitGeoJson ? JSON.parse(project.workLimitGeoJson) : null,
    workLimitArea: limit?.area ?? null,
    grid: { cellSize: grid.cellSize, rotationDegrees: grid.rotationDegrees, originX: grid.originX, originY: grid.originY, rasterResolution: grid.rasterResolution, maxEdge: grid.maxEdge },
    tolerances: { firmSand: grid.tolerance, firmShare: grid.firmShare, minCoverage: grid.minCoverage, overDredgeAllowance: grid.overDredgeAllowance, surveyOrder: project.surveyOrder },
    zones: zones.map((zone) => ({ id: zone.id, name: zone.name, sortOrder: zone.sortOrder, colour: zone.colour, geometry: JSON.parse(zone.polygonGeoJson) })),
    cellCount: limit ? cellCount(createCellGrid(limit.projected, grid)) : null,
    surveyCount: await Survey.count({ where: { projectId: project.id }, transaction }),
    finds: { cataloguePrefix: project.findCataloguePrefix, holdRadiusM: project.holdRadiusM, holdRadiusSource: project.holdRadiusSource },
    emergency: project.emergencyInfo ?? null,
    workDay: project.workDayStart && project.workDayEnd ? { start: project.workDayStart, end: project.workDayEnd } : null,
    archivedAt: project.archivedAt ? project.archivedAt.toISOString() : null,
  };
}

/** The settings without the geometries' coordinates (the audit log keeps their areas, zone names and colours instead). */
function auditable(settings: ProjectSettings) {
  const { workLimit: _limit, zones, ...rest } = settings;
  return { ...rest, zones: zones.map((zone) => zone.name), zoneColours: Object.fromEntries(zones.map((zone) => [zone.name, zoneColourName(zone.colour)])) };
}

export async function getProjectSettings(project: ProjectView): Promise<ProjectSettings> {
  const row = await Project.findByPk(project.id);
  if (!row) throw new NotFoundError("There is no such project.");
  return settingsOf(row);
}

/**
 * What a work limit would be before it is saved, for the settings page's preview: read and checked
 * as a PATCH would (a ValidationError naming each problem), nothing stored.
 */
export async function previewWorkLimit(project: ProjectView, geoJson: unknown) {
  const row = await Project.findByPk(project.id);
  if (!row) throw new NotFoundError("There is no such project.");
  const problems: ErrorDetail[] = [];
  const checked = checkCrs(row.crs, row.lengthUnit, problems);
  const limit = checked && checkGeometry("workLimit", "The work limit", geoJson, checked, problems);
  if (!limit) throw new ValidationError(problems);
  return { lonLat: limit.lonLat, coordinates: limit.coordinates, area: limit.area, cellCount: cellCount(createCellGrid(limit.projected, projectGrid(row))) };
}

/** The cell count a grid change would give over the stored work limit (null without one). */
export async function prospectiveCellCount(project: ProjectView, grid: NonNullable<ProjectPatch["grid"]>): Promise<number | null> {
  const row = await Project.findByPk(project.id);
  if (!row) throw new NotFoundError("There is no such project.");
  const limit = projectedLimit(createCrs(resolveCrsDefinition(row.crs).definition), row.workLimitGeoJson);
  if (!limit) return null;
  const stored = projectGrid(row);
  const cellSize = grid.cellSize ?? stored.cellSize;
  if (!(cellSize > 0)) return null;
  return cellCount(createCellGrid(limit, { cellSize, rotationDegrees: grid.rotationDegrees ?? stored.rotationDegrees, originX: grid.originX ?? stored.originX, originY: grid.originY ?? stored.originY }));
}

/** A zone read from a file, checked as a zone of this project would be, before anything is stored. */
export interface ZoneFilePreview {
  /** Where it is in the file ("feature 3", "polygon 2"). */
  source: string;
  /** From the file's name or zone property; null when the file gives none (the page asks). */
  name: string | null;
  /** Lon/lat, as stored; null when refused. */
  lonLat: { type: "Polygon" | "MultiPolygon"; coordinates: unknown } | null;
  /** Plan area, square project units; null when refused. */
  area: number | null;
  /** Each problem, naming the feature and the rule. */
  problems: string[];
}

/**
 * The zones a file would give (one per feature or polygon, shared/grid/zone-file.ts), each
 * checked by the one zone check against the stored work limit and cell size: shape, area of use,
 * inside the limit. Nothing is stored; a ValidationError when the file holds no zone at all.
 */
export async function previewZoneFile(project: ProjectView, candidates: ZoneFileCandidate[]): Promise<ZoneFilePreview[]> {
  const row = await Project.findByPk(project.id);
  if (!row) throw new NotFoundError("There is no such project.");
  const problems: ErrorDetail[] = [];
  const checked = checkCrs(row.crs, row.lengthUnit, problems);
  if (!checked) throw new ValidationError(problems);
  const frame: ZoneFrame = { limit: projectedLimit(checked.crs, row.workLimitGeoJson), cellSize: row.cellSize, lengthUnit: row.lengthUnit };
  if (!frame.limit) throw new ValidationError({ field: "zonesFile", message: "Zones lie inside the work limit: set the work limit first." });
  return candidates.map((candidate) => {
    const own: ErrorDetail[] = [];
    const label = `${candidate.source[0].toUpperCase()}${candidate.source.slice(1)}${candidate.name ? ` ("${candidate.name}")` : ""}`;
    const parsed = checkZoneOutline("zonesFile", label, candidate.geometry, checked, frame, own);
    return { source: candidate.source, name: candidate.name, lonLat: parsed ? parsed.lonLat : null, area: parsed ? parsed.area : null, problems: own.map((problem) => problem.message) };
  });
}

/**
 * Zones from a file saved through the same change as any zone edit (checks, settings version,
 * recompute, audit): `replace` makes them the project's zones (a zone of the same name keeps its
 * id and what refers to it), `add` puts them after the zones there are.
 */
export async function saveZonesFromFile(
  project: ProjectView, actor: UserView, input: { mode: "add" | "replace"; zones: Array<{ name: string; geometry: unknown }> }, options: { ip?: string | null } = {},
) {
  const current = input.mode === "add" ? (await getProjectSettings(project)).zones.map((zone) => ({ id: zone.id, name: zone.name, colour: zone.colour, geometry: zone.geometry })) : [];
  const patch = projectPatchSchema.safeParse({ zones: [...current, ...input.zones] });
  if (!patch.success) throw validationErrorFrom(patch.error);
  return updateProjectSettings(project, actor, patch.data, options);
}

/**
 * A zone made of grid cells (the selection on the map): the union of the cells' squares, clipped
 * to the work limit (a zone lies inside it), added after the project's zones through the same
 * change as any zone edit. A cell whose centre lies outside the work limit is drawn in but
 * cannot be held by the zone (a zone holds a cell by its centre): `centresOutside` names them.
 */
export async function createZoneFromCells(
  project: ProjectView, actor: UserView, input: { name: string; colour?: string; cells: string[] }, options: { ip?: string | null } = {},
) {
  const row = await Project.findByPk(project.id);
  if (!row) throw new NotFoundError("There is no such project.");
  const crs = createCrs(resolveCrsDefinition(row.crs).definition);
  const limit = projectedLimit(crs, row.workLimitGeoJson);
  if (!limit) throw new ValidationError({ field: "cells", message: "The project has no work limit, so it has no cells yet." });
  const grid = createCellGrid(limit, projectGrid(row));
  const labels = [...new Set(input.cells.map((label) => label.trim().toUpperCase()).filter((label) => label !== ""))];
  if (labels.length === 0) throw new ValidationError({ field: "cells", message: "Select the zone's cells on the map first." });
  const cells: Array<{ row: number; col: number }> = [];
  const unknown: string[] = [];
  for (const label of labels) {
    const cell = parseCellLabel(label);
    if (!cell || cellIndex(grid, cell.row, cell.col) < 0) unknown.push(label);
    else cells.push(cell);
  }
  if (unknown.length > 0) {
    throw new ValidationError({ field: "cells", message: `${unknown.slice(0, 10).join(", ")}${unknown.length > 10 ? ` and ${unknown.length - 10} more` : ""} ${unknown.length === 1 ? "is not a cell" : "are not cells"} of this project's grid (labels such as C7).` });
  }
  // Squares wholly inside stay squares; along the limit they are cut to it.
  const union = cellsOutline(grid, cells);
  let outline: ProjectedMultiPolygon;
  try {
    outline = zoneOutsideLimit(union, limit, 0) === null ? union : clipToLimit(union, limit);
  } catch {
    throw new ValidationError({ field: "cells", message: "The selected cells could not be cut to the work limit; leave out the cells along its edge and try again." });
  }
  if (outline.length === 0) throw new ValidationError({ field: "cells", message: "The selected cells lie outside the work limit." });
  const centresOutside = cells.filter((cell) => !isInsideWorkLimit(outline, ...cellCentroid(grid, cell.row, cell.col))).map((cell) => cellLabel(cell.row, cell.col));
  const geometry = { type: "MultiPolygon", coordinates: outline.map((rings) => rings.map((ring) => ring.map(([x, y]) => crs.toLonLat(x, y)))) };
  const { zones } = await getProjectSettings(project);
  const patch = projectPatchSchema.safeParse({ zones: [...zones.map((zone) => ({ id: zone.id, name: zone.name, colour: zone.colour, geometry: zone.geometry })), { name: input.name, colour: input.colour, geometry }] });
  if (!patch.success) throw validationErrorFrom(patch.error);
  const result = await updateProjectSettings(project, actor, patch.data, options);
  return { ...result, cells: cells.length, centresOutside };
}

// ——— Changing.

/**
 * Applies `patch` to the project's settings. A change to the work limit, zones, grid or tolerances
 * is kept as a new settings version (who, when, the values); on a project with surveys it also
 * queues a recompute of every survey's figures, which runs in the background once this transaction
 * commits (`recompute`: its job's id; the stored figures are the earlier ones until it is done);
 * the over-dredge allowance and the survey order are kept in the version but recompute nothing.
 * The CRS and length unit may change only before the first survey. The audit log gets the settings
 * before and after. `overlaps` names the zones that share area, when zones were given (allowed: a
 * shared cell counts in the earlier zone).
 */
export function updateProjectSettings(
  project: ProjectView, actor: UserView, patch: ProjectPatch, options: { ip?: string | null } = {},
): Promise<{ settings: ProjectSettings; settingsVersion: number | null; recompute: { jobId: number } | null; overlaps: Array<{ first: string; second: string; area: number }> }> {
  return withProjectLock(project.id, () =>
    getSequelize().transaction(async (transaction) => {
      const row = await Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!row) throw new NotFoundError("There is no such project.");
      const before = await settingsOf(row, transaction);
      const surveys = await Survey.count({ where: { projectId: project.id }, transaction });
      const problems: ErrorDetail[] = [];
      const crsCode = patch.crs?.toUpperCase() ?? row.crs;
      const lengthUnit = patch.lengthUnit ?? row.lengthUnit;
      const coordinatesChange = crsCode !== row.crs || lengthUnit !== row.lengthUnit;
      if (coordinatesChange && surveys > 0) {
        throw new ConflictError({ field: patch.crs ? "crs" : "lengthUnit", message: "The coordinate system and length unit cannot change once surveys are stored: their soundings are in the old ones." });
      }
      const checked = checkCrs(crsCode, lengthUnit, problems);
      const limit = checked && patch.workLimit !== undefined ? checkGeometry("workLimit", "The work limit", patch.workLimit, checked, problems) : null;
      if (!checked) throw new ValidationError(problems);

      const projected = limit?.projected ?? projectedLimit(checked.crs, row.workLimitGeoJson);
      const cellSize = patch.grid?.cellSize ?? row.cellSize;
      // Zones are checked against the work limit and cell size they will be used with.
      const zones = patch.zones ? checkZones(patch.zones, checked, { limit: projected, cellSize, lengthUnit }, problems) : null;
      if (patch.zones) {
        const known = new Set((await Zone.findAll({ where: { projectId: project.id }, attributes: ["id"], transaction })).map((zone) => zone.id));
        patch.zones.forEach((zone, index) => {
          if (zone.id !== undefined && !known.has(zone.id)) problems.push({ field: `zones.${index}.id`, message: `Zone "${zone.name}": this project has no zone with id ${zone.id}.` });
        });
      }
      const rotationDeg = patch.grid?.rotationDegrees ?? row.rotationDeg;
      // A new CRS moves every coordinate: the origin starts again from the work limit unless given.
      const [defaultX, defaultY] = coordinatesChange && projected ? defaultGridOrigin(projected, cellSize, rotationDeg) : [row.gridOriginE, row.gridOriginN];
      const grid: GridColumns = {
        cellSize,
        rotationDeg,
        gridOriginE: patch.grid?.originX ?? defaultX,
        gridOriginN: patch.grid?.originY ?? defaultY,
        rasterResolution: patch.grid?.rasterResolution ?? row.rasterResolution,
        maxEdge: patch.grid?.maxEdge ?? row.maxEdge,
      };
      checkGrid(grid, problems);
      if (problems.length > 0) throw new ValidationError(problems);

      const identity = { name: patch.name, description: patch.description, agency: patch.agency, permitNumbers: patch.permitNumbers, timeZone: patch.timeZone, verticalDatum: patch.verticalDatum, minTeamSize: patch.minTeamSize };
      for (const [key, value] of Object.entries(identity)) if (value !== undefined) row.set(key as keyof typeof identity, value as never);
      row.set({ crs: crsCode, lengthUnit, ...grid });
      if (patch.tolerances?.firmSand !== undefined) row.tolerance = patch.tolerances.firmSand;
      if (patch.tolerances?.firmShare !== undefined) row.firmShare = patch.tolerances.firmShare;
      if (patch.tolerances?.minCoverage !== undefined) row.minCoverage = patch.tolerances.minCoverage;
      // Not a figures change: the stored figures do not split paid from over-dredge; pay periods read it when asked.
      if (patch.tolerances?.overDredgeAllowance !== undefined) row.overDredgeAllowance = patch.tolerances.overDredgeAllowance;
      // Not a figures change either: a survey's QA and its share of a pay period's band use the order it
      // was imported with, kept on the survey; this is the order the next imports are offered.
      if (patch.tolerances?.surveyOrder !== undefined) row.surveyOrder = patch.tolerances.surveyOrder;
      if (limit) row.workLimitGeoJson = JSON.stringify(limit.lonLat);
      // Finds settings touch no figures; a new radius applies to holds placed from now on.
      if (patch.finds?.cataloguePrefix !== undefined) row.findCataloguePrefix = patch.finds.cataloguePrefix;
      if (patch.finds?.holdRadiusM !== undefined) row.holdRadiusM = patch.finds.holdRadiusM;
      if (patch.finds?.holdRadiusSource !== undefined) row.holdRadiusSource = patch.finds.holdRadiusSource;
      // Emergency information touches no figures; all blank clears it.
      if (patch.emergency !== undefined) row.emergencyInfo = isEmergencyInfoEmpty(patch.emergency) ? null : patch.emergency;
      // Working hours touch no figures.
      if (patch.workDay !== undefined) row.set({ workDayStart: patch.workDay?.start ?? null, workDayEnd: patch.workDay?.end ?? null });
      const figuresChange = (["workLimitGeoJson", "cellSize", "rotationDeg", "gridOriginE", "gridOriginN", "rasterResolution", "maxEdge", "tolerance", "firmShare", "minCoverage"] as const).some((key) => row.changed(key));
      await row.save({ transaction });
      if (zones) await replaceZones(project.id, zones, transaction);
      const after = await settingsOf(row, transaction);
      const changed = changedParts(versionedOf(before), versionedOf(after));
      const version = changed.length > 0 ? await keepSettingsVersion(project.id, versionedOf(after), changed, actor.id, transaction) : null;
      // Only the over-dredge allowance or the survey order changed: no stored figure rests on them.
      const recomputed = surveys > 0 && version !== null && (figuresChange || changed.includes("zones"));
      const job = recomputed ? await queueRecompute(project.id, actor.id, version.id, transaction) : null;
      await recordAudit(
        {
          action: AUDIT_ACTIONS.projectSettingsChanged,
          projectId: project.id,
          userId: actor.id,
          ip: options.ip ?? null,
          detail: {
            before: auditable(before), after: auditable(after), ...(limit ? { workLimitCoordinates: limit.coordinates } : {}),
            recomputed, ...(version ? { settingsVersion: version.version } : {}), ...(job ? { recomputeJobId: job.id } : {}),
          },
        },
        transaction,
      );
      const current = version ?? (await currentSettingsVersion(project.id, transaction));
      return { settings: after, settingsVersion: current?.version ?? null, recompute: job ? { jobId: job.id } : null, overlaps: zones ? zoneOverlaps(zones, cellSize) : [] };
    }),
  );
}

/**
 * Starts a recompute of every survey's figures with the settings in force (after one failed or
 * was given up): the job already waiting or running when there is one, else a new one. A
 * ConflictError for a project without surveys (there is nothing to recompute).
 */
export async function recomputeProjectFigures(project: ProjectView, actor: UserView): Promise<{ jobId: number; started: boolean }> {
  // The latest job, a silent one taken up first (it then waits or runs again).
  const latest = await latestRecomputeJob(project.id);
  if (latest && (latest.state === "queued" || latest.state === "running")) return { jobId: latest.id, started: false };
  return getSequelize().transaction(async (transaction) => {
    const row = await Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError("There is no such project.");
    if ((await Survey.count({ where: { projectId: project.id }, transaction })) === 0) {
      throw new ConflictError({ message: "This project has no surveys yet, so there are no figures to recompute." });
    }
    const version = (await currentSettingsVersion(project.id, transaction)) ?? (await keepSettingsVersion(project.id, versionedOf(await settingsOf(row, transaction)), ["as found"], null, transaction));
    const job = await queueRecompute(project.id, actor.id, version.id, transaction);
    return { jobId: job.id, started: true };
  });
}

/** One of the project's recomputes as the API and the settings page show it; NotFoundError for none. */
export async function getRecomputeJob(project: ProjectView, jobId: number): Promise<RecomputeJobView> {
  const job = await findRecomputeJob(project.id, jobId);
  if (!job) throw new NotFoundError("There is no such recompute in this project.");
  return presentRecomputeJob(job, project.lengthUnit);
}

/** The project's latest recompute (null when it has had none), for the settings page to pick up. */
export async function getLatestRecompute(project: ProjectView): Promise<RecomputeJobView | null> {
  const job = await latestRecomputeJob(project.id);
  return job ? presentRecomputeJob(job, project.lengthUnit) : null;
}
