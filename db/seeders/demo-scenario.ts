// Firmsand's demo scenario: a fictional spring-run restoration of our own invention.
// Tallow Spring, Marrow County, and the Marrow County Water Authority do not exist; the site
// sits on an inland spot in the territory of EPSG:2237 (NAD83 / Florida West, US survey feet)
// where no named spring lies. Shared by the demo seed (db/seeders) and the sample survey
// generator (sample-data/), so both describe the same place.

export const DEMO_PROJECT = {
  name: "Tallow Spring run restoration",
  slug: "tallow-spring-run",
  description:
    "Marrow County Water Authority: diver-guided suction removal of organic muck from the Tallow Spring vent basin and run, down to firm sand.",
  crs: "EPSG:2237",
  lengthUnit: "us-ft" as const,
  cellSizeFt: 20,
  rasterResolutionFt: 1,
  maxEdgeFt: 30,
  rotationDeg: 0,
  toleranceFt: 0.25,
  /** Share of a cell's area within tolerance for "at firm sand". */
  firmShare: 0.9,
  /** Share of a cell's area that must be surveyed before it gets a status. */
  minCoverage: 0.8,
  minTeamSize: 3,
};

/** The spring vent, the centre of the scenario (WGS 84 lon/lat). */
export const VENT_LON_LAT: [number, number] = [-82.0375, 27.562];

/**
 * The run is described by cross-sections every 20 m from the vent southwards: the centre line's
 * offset east of the vent and the wetted width. The work limit follows their ends; zones are
 * runs of consecutive cross-sections. Local metres keep the shape easy to read.
 */
const STATIONS: Array<{ southM: number; centreEastM: number; widthM: number }> = [
  { southM: 0, centreEastM: 0, widthM: 52 },
  { southM: 20, centreEastM: 1, widthM: 91 },
  { southM: 40, centreEastM: 3, widthM: 78 },
  { southM: 60, centreEastM: 7, widthM: 52 },
  { southM: 80, centreEastM: 12, widthM: 47 },
  { southM: 100, centreEastM: 17, widthM: 44 },
  { southM: 120, centreEastM: 21, widthM: 42 },
  { southM: 140, centreEastM: 24, widthM: 39 },
];

// Local tangent-plane conversion around the vent: metres per degree of latitude and longitude
// on the WGS 84 ellipsoid at the vent's latitude (series from the meridian and parallel radii).
const LAT_RAD = (VENT_LON_LAT[1] * Math.PI) / 180;
const METRES_PER_DEGREE_LAT = 111132.92 - 559.82 * Math.cos(2 * LAT_RAD) + 1.175 * Math.cos(4 * LAT_RAD);
const METRES_PER_DEGREE_LON = 111412.84 * Math.cos(LAT_RAD) - 93.5 * Math.cos(3 * LAT_RAD);

function toLonLat(eastM: number, northM: number): [number, number] {
  const lon = VENT_LON_LAT[0] + eastM / METRES_PER_DEGREE_LON;
  const lat = VENT_LON_LAT[1] + northM / METRES_PER_DEGREE_LAT;
  return [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7];
}

/** A closed GeoJSON ring (counter-clockwise, RFC 7946) over stations first..last. */
function ringBetween(first: number, last: number): Array<[number, number]> {
  const stations = STATIONS.slice(first, last + 1);
  const west = stations.map((s) => toLonLat(s.centreEastM - s.widthM / 2, -s.southM));
  const east = stations.map((s) => toLonLat(s.centreEastM + s.widthM / 2, -s.southM));
  // West bank going south, then east bank coming north: counter-clockwise seen from above.
  const ring = [...west, ...east.reverse()];
  ring.push(ring[0]);
  return ring;
}

export interface PolygonGeoJson {
  type: "Polygon";
  coordinates: Array<Array<[number, number]>>;
}

export const WORK_LIMIT: PolygonGeoJson = { type: "Polygon", coordinates: [ringBetween(0, STATIONS.length - 1)] };

export const ZONES: Array<{ name: string; sortOrder: number; polygon: PolygonGeoJson }> = [
  { name: "Vent basin", sortOrder: 1, polygon: { type: "Polygon", coordinates: [ringBetween(0, 2)] } },
  { name: "Upper run", sortOrder: 2, polygon: { type: "Polygon", coordinates: [ringBetween(2, 5)] } },
  { name: "Lower run", sortOrder: 3, polygon: { type: "Polygon", coordinates: [ringBetween(5, 7)] } },
];

/**
 * Grid origin in EPSG:2237 (US survey feet): the south-west corner of the cell grid, a round
 * figure just outside the work limit's projected extent (checked by a test).
 */
export const GRID_ORIGIN = { eastingFt: 643_800, northingFt: 1_172_900 };

export const DEMO_PASSWORD = "firmsand-demo";

export const DEMO_USERS: Array<{ email: string; name: string; role: import("../models/roles").Role | null; isSiteAdmin?: boolean }> = [
  { email: "manager@example.org", name: "Odessa Quillfeather", role: "manager" },
  { email: "surveyor@example.org", name: "Bram Tulliver", role: "surveyor" },
  { email: "divesup@example.org", name: "Marisol Deepwater", role: "dive-supervisor" },
  { email: "dewatering@example.org", name: "Caspar Fennimore", role: "dewatering" },
  { email: "monitor@example.org", name: "Ines Holloway", role: "resource-monitor" },
  { email: "outreach@example.org", name: "Theo Marchbank", role: "outreach" },
  { email: "viewer@example.org", name: "Wren Castellane", role: "viewer" },
  { email: "admin@example.org", name: "Pell Ashgrove", role: null, isSiteAdmin: true },
];
