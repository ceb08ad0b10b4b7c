// The demo scenario as the database seed needs it. The scenario itself (invented place, people,
// geometry, grid) is defined once in sample-data/scenario.ts, shared with the sample survey
// generator, so the seeded project and the generated sounding files describe the same site.
import { GRID, PEOPLE, PROJECT, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import type { Role } from "../models/roles";

export const DEMO_PASSWORD = "firmsand-demo";

export const DEMO_PROJECT = {
  name: PROJECT.name,
  slug: PROJECT.slug,
  description: `${PROJECT.owner}. ${PROJECT.description}`,
  crs: PROJECT.crs,
  lengthUnit: PROJECT.lengthUnit,
  gridOriginE: GRID.originEastingFt,
  gridOriginN: GRID.originNorthingFt,
  cellSize: GRID.cellSizeFt,
  rasterResolution: GRID.rasterResolutionFt,
  maxEdge: GRID.maxTriangleEdgeFt,
  rotationDeg: GRID.rotationDegrees,
  tolerance: GRID.toleranceFt,
  firmShare: GRID.firmShare,
  minCoverage: GRID.minCoverage,
  /** A diver, a tender and a standby diver: the smallest crew the demo's dive plan allows. */
  minTeamSize: 3,
};

export const DEMO_WORK_LIMIT = WORK_LIMIT;

export const DEMO_ZONES = ZONES.map((zone, index) => ({ name: zone.name, sortOrder: index + 1, polygon: zone.polygon }));

export const DEMO_USERS: Array<{ email: string; name: string; role: Role | null; isSiteAdmin: boolean }> = PEOPLE.map((person) => ({
  email: person.email,
  name: person.name,
  role: person.role,
  isSiteAdmin: person.siteAdmin,
}));
