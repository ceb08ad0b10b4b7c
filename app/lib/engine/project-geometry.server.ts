import type { Transaction } from "sequelize";
import { createCrs, type Crs } from "../../../shared/crs";
import type { LonLatBounds } from "../../../shared/soundings/row-checks";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import type { EngineSettings } from "../../../shared/pipeline";
import type { LengthUnit } from "../../../shared/units";
import { Project, Zone } from "../db.server";
import { resolveCrsDefinition } from "../geo/epsg.server";
import type { ComputationZone } from "./project-figures";

/**
 * A project's geometry in its own projected CRS: the work limit and zones (stored as lon/lat
 * GeoJSON, RFC 7946) projected once, and the engine settings from the project's grid.
 */
export interface ProjectGeometry {
  projectId: number;
  crsCode: string;
  crs: Crs;
  /** The CRS's area of use (degrees), from the EPSG registry; null for a proj4 string. */
  areaOfUse: LonLatBounds | null;
  lengthUnit: LengthUnit;
  workLimit: ProjectedMultiPolygon | null;
  zones: ComputationZone[];
  settings: EngineSettings;
}

type LonLatGeometry = { type: "Polygon"; coordinates: number[][][] } | { type: "MultiPolygon"; coordinates: number[][][][] };

export function projectGeoJson(crs: Crs, geoJson: string): ProjectedMultiPolygon {
  const geometry = JSON.parse(geoJson) as LonLatGeometry;
  const polygons = geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates;
  return polygons.map((polygon) => polygon.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat))));
}

/**
 * Mean removed thickness at or below which a cell counts as untouched (survey noise, not
 * dredging): the project's firm-sand tolerance, the same figure that bounds the survey's own
 * accuracy (USACE EM 1110-2-1003 table 3-1 via the units module's defaults).
 */
export function surveyNoiseFor(tolerance: number): number {
  return tolerance;
}

/**
 * A project's grid and engine rules in the words the engine and the map use (`originX`,
 * `originY`, `rotationDegrees`, as in shared/grid/cell-grid). The database columns keep their
 * first names (gridOriginE, gridOriginN, rotationDeg): they are read here and nowhere else, so
 * renaming them would need a migration and nothing more.
 */
export interface ProjectGrid {
  /** Grid origin, project coordinates. */
  originX: number;
  originY: number;
  /** Counter-clockwise from east. */
  rotationDegrees: number;
  cellSize: number;
  rasterResolution: number;
  maxEdge: number;
  tolerance: number;
  firmShare: number;
  minCoverage: number;
  /** How far below firm sand removal is still paid; pay periods split removed there (not an engine setting). */
  overDredgeAllowance: number;
}

export function projectGrid(project: Project): ProjectGrid {
  return {
    originX: project.gridOriginE,
    originY: project.gridOriginN,
    rotationDegrees: project.rotationDeg,
    cellSize: project.cellSize,
    rasterResolution: project.rasterResolution,
    maxEdge: project.maxEdge,
    tolerance: project.tolerance,
    firmShare: project.firmShare,
    minCoverage: project.minCoverage,
    overDredgeAllowance: project.overDredgeAllowance,
  };
}

/** The engine's settings for a project's grid. */
export function engineSettingsFor(grid: ProjectGrid): EngineSettings {
  return {
    cellSize: grid.cellSize,
    resolution: grid.rasterResolution,
    maxEdge: grid.maxEdge,
    originX: grid.originX,
    originY: grid.originY,
    rotationDegrees: grid.rotationDegrees,
    tolerance: grid.tolerance,
    firmShare: grid.firmShare,
    minCoverage: grid.minCoverage,
    surveyNoise: surveyNoiseFor(grid.tolerance),
    rasterPrecision: "float32",
  };
}

export async function loadProjectGeometry(projectId: number, transaction?: Transaction): Promise<ProjectGeometry> {
  const project = await Project.findByPk(projectId, { transaction });
  if (!project) throw new Error(`project ${projectId} does not exist`);
  const resolved = resolveCrsDefinition(project.crs);
  const crs = createCrs(resolved.definition);
  const zones = await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"], ["id", "ASC"]], transaction });
  return {
    projectId,
    crsCode: project.crs,
    crs,
    areaOfUse: resolved.areaOfUse,
    lengthUnit: project.lengthUnit,
    workLimit: project.workLimitGeoJson ? projectGeoJson(crs, project.workLimitGeoJson) : null,
    zones: zones.map((zone) => ({ id: zone.id, name: zone.name, polygon: projectGeoJson(crs, zone.polygonGeoJson) })),
    settings: engineSettingsFor(projectGrid(project)),
  };
}
