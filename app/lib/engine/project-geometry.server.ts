import type { Transaction } from "sequelize";
import { createCrs, type Crs } from "../../../shared/crs";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import type { EngineSettings } from "../../../shared/pipeline";
import type { LengthUnit } from "../../../shared/units";
import { Project, Zone } from "../db.server";
import { resolveCrsDefinition } from "../epsg.server";
import type { ComputationZone } from "./project-figures";

/**
 * A project's geometry in its own projected CRS: the work limit and zones (stored as lon/lat
 * GeoJSON, RFC 7946) projected once, and the engine settings from the project's grid.
 */
export interface ProjectGeometry {
  projectId: number;
  crsCode: string;
  crs: Crs;
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

export async function loadProjectGeometry(projectId: number, transaction?: Transaction): Promise<ProjectGeometry> {
  const project = await Project.findByPk(projectId, { transaction });
  if (!project) throw new Error(`project ${projectId} does not exist`);
  const crs = createCrs(resolveCrsDefinition(project.crs).definition);
  const zones = await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"], ["id", "ASC"]], transaction });
  return {
    projectId,
    crsCode: project.crs,
    crs,
    lengthUnit: project.lengthUnit,
    workLimit: project.workLimitGeoJson ? projectGeoJson(crs, project.workLimitGeoJson) : null,
    zones: zones.map((zone) => ({ id: zone.id, name: zone.name, polygon: projectGeoJson(crs, zone.polygonGeoJson) })),
    settings: {
      cellSize: project.cellSize,
      resolution: project.rasterResolution,
      maxEdge: project.maxEdge,
      originX: project.gridOriginE,
      originY: project.gridOriginN,
      rotationDegrees: project.rotationDeg,
      tolerance: project.tolerance,
      firmShare: project.firmShare,
      minCoverage: project.minCoverage,
      surveyNoise: surveyNoiseFor(project.tolerance),
      rasterPrecision: "float32",
    },
  };
}
