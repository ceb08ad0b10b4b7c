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
  /** A diver, a tender and a standby diver: the smallest crew the demo's dive plan allows. */
  minTeamSize: 3,
};

/** The demo project as the project-setup service takes it (lon/lat GeoJSON, lengths in us-ft). */
/**
 * The demo's emergency information: invented places, and phone numbers in the 555-01xx range
 * set aside for fiction, so nobody real is ever rung from a demo sheet.
 */
export const DEMO_EMERGENCY = {
  hospitalName: "Fennick County Memorial Hospital (emergency department)",
  hospitalPhone: "(555) 555-0142",
  chamberName: "Saltmarsh Hyperbaric Medicine Center",
  chamberPhone: "(555) 555-0178",
  emergencyNumber: "(555) 555-0100",
  siteAddress: "4100 Wickerbill Spring Road, Fennick County (invented)",
  accessPoint: "South boat ramp at the spring-run parking lot; gate code from the dive supervisor",
};

export function demoProjectInput(managerEmail: string) {
  return {
    name: DEMO_PROJECT.name,
    slug: DEMO_PROJECT.slug,
    description: DEMO_PROJECT.description,
    agency: PROJECT.owner,
    timeZone: PROJECT.timeZone,
    verticalDatum: PROJECT.verticalDatum,
    crs: DEMO_PROJECT.crs,
    lengthUnit: DEMO_PROJECT.lengthUnit,
    workLimit: WORK_LIMIT,
    grid: {
      cellSize: GRID.cellSizeFt,
      rotationDegrees: GRID.rotationDegrees,
      originX: GRID.originEastingFt,
      originY: GRID.originNorthingFt,
      rasterResolution: GRID.rasterResolutionFt,
      maxEdge: GRID.maxTriangleEdgeFt,
    },
    tolerances: { firmSand: GRID.toleranceFt, firmShare: GRID.firmShare, minCoverage: GRID.minCoverage, surveyOrder: GRID.surveyOrder },
    zones: ZONES.map((zone) => ({ name: zone.name, geometry: zone.polygon })),
    minTeamSize: DEMO_PROJECT.minTeamSize,
    emergency: DEMO_EMERGENCY,
    manager: managerEmail,
  };
}

export const DEMO_USERS: Array<{ email: string; name: string; role: Role | null; isSiteAdmin: boolean }> = PEOPLE.map((person) => ({
  email: person.email,
  name: person.name,
  role: person.role,
  isSiteAdmin: person.siteAdmin,
}));
