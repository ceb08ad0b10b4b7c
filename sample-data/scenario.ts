/**
 * The Firmsand demo scenario: an invented spring-run restoration. Every name, person, place and
 * number here is fictional; the vent's coordinates are a plausible rural point inside the area of
 * EPSG:2237 (NAD83 / Florida West, US survey feet) and not the site of any real spring.
 *
 * Plain typed data only, so the database seeder, the generator and tests can all import it.
 * Lengths are US survey feet ("us-ft"); elevations are NAVD88 feet.
 * The work limit and zones come from outline.ts via print-geometry.ts (checked in generate.test.ts).
 */

export type LonLat = [number, number];

export type ProjectRole =
  | "manager"
  | "surveyor"
  | "dive-supervisor"
  | "dewatering"
  | "resource-monitor"
  | "outreach"
  | "viewer";

export type SurveyKind = "baseline" | "progress" | "closeout";

export const PROJECT = {
  name: "Wickerbill Spring run restoration",
  slug: "wickerbill-spring",
  owner: "Fennick County Water Authority",
  description:
    "Diver-guided suction removal of organic muck down to firm sand in the vent basin and the " +
    "spring run of the fictional Wickerbill Spring. An invented demo project.",
  crs: "EPSG:2237",
  lengthUnit: "us-ft",
  verticalDatum: "NAVD88",
  timeZone: "America/New_York",
} as const;

/** The spring vent (basin centre), lon/lat; fictional. */
export const VENT_LON_LAT: LonLat = [-82.175, 28.955];

export const ZONE_NAMES = ["Vent basin", "Upper run", "Lower run"] as const;
export type ZoneName = (typeof ZONE_NAMES)[number];

/** Computation settings of the project (lengths in us-ft). */
export const GRID = {
  /** South-west corner of the work limit's bounding box in EPSG:2237, floored to 10 ft. */
  originEastingFt: 600070,
  originNorthingFt: 1679770,
  cellSizeFt: 20,
  rotationDegrees: 0,
  rasterResolutionFt: 1,
  maxTriangleEdgeFt: 40,
  toleranceFt: 0.25,
  firmShare: 0.95,
  minCoverage: 0.8,
  /** IHO S-44 order the demo's surveys are judged against: 1a, for a survey of a shallow spring run where features matter. */
  surveyOrder: "1a",
} as const;

/** Work limit: GeoJSON Polygon (lon/lat, exterior ring counter-clockwise per RFC 7946). */
export const WORK_LIMIT: { type: "Polygon"; coordinates: LonLat[][] } = {
  type: "Polygon",
  coordinates: [[
      [-82.174643, 28.9548432],
      [-82.1743819, 28.9547995],
      [-82.1741893, 28.9547735],
      [-82.1739881, 28.9546954],
      [-82.1737587, 28.9545617],
      [-82.1735153, 28.9544983],
      [-82.1732891, 28.9545178],
      [-82.1730876, 28.9545239],
      [-82.1729315, 28.9544831],
      [-82.1727401, 28.9545018],
      [-82.1728627, 28.9546579],
      [-82.1730768, 28.9546865],
      [-82.1733034, 28.9547394],
      [-82.1734932, 28.9546979],
      [-82.1736753, 28.9547245],
      [-82.1738933, 28.9548241],
      [-82.1741148, 28.9549492],
      [-82.1743946, 28.9549703],
      [-82.1746004, 28.9549837],
      [-82.1745718, 28.9550738],
      [-82.1746494, 28.9552009],
      [-82.1747723, 28.9552869],
      [-82.1749127, 28.9553347],
      [-82.1750648, 28.9553564],
      [-82.1752312, 28.9553372],
      [-82.1753171, 28.9552095],
      [-82.1753749, 28.9550878],
      [-82.1754107, 28.9549551],
      [-82.1753844, 28.954812],
      [-82.1752753, 28.9547001],
      [-82.1751174, 28.9546604],
      [-82.1749678, 28.9546821],
      [-82.1748399, 28.9547247],
      [-82.174714, 28.954782],
      [-82.174643, 28.9548432],
    ]],
};

/** Zones that tile the work limit (shared vertices along the cuts across the run). */
export const ZONES: { name: ZoneName; polygon: { type: "Polygon"; coordinates: LonLat[][] } }[] = [
  {
    name: "Vent basin",
    polygon: {
      type: "Polygon",
      coordinates: [[
          [-82.1746004, 28.9549837],
          [-82.1745718, 28.9550738],
          [-82.1746494, 28.9552009],
          [-82.1747723, 28.9552869],
          [-82.1749127, 28.9553347],
          [-82.1750648, 28.9553564],
          [-82.1752312, 28.9553372],
          [-82.1753171, 28.9552095],
          [-82.1753749, 28.9550878],
          [-82.1754107, 28.9549551],
          [-82.1753844, 28.954812],
          [-82.1752753, 28.9547001],
          [-82.1751174, 28.9546604],
          [-82.1749678, 28.9546821],
          [-82.1748399, 28.9547247],
          [-82.174714, 28.954782],
          [-82.174643, 28.9548432],
          [-82.1746004, 28.9549837],
        ]],
    },
  },
  {
    name: "Upper run",
    polygon: {
      type: "Polygon",
      coordinates: [[
          [-82.174643, 28.9548432],
          [-82.1743819, 28.9547995],
          [-82.1741893, 28.9547735],
          [-82.1739881, 28.9546954],
          [-82.1737587, 28.9545617],
          [-82.1736753, 28.9547245],
          [-82.1738933, 28.9548241],
          [-82.1741148, 28.9549492],
          [-82.1743946, 28.9549703],
          [-82.1746004, 28.9549837],
          [-82.174643, 28.9548432],
        ]],
    },
  },
  {
    name: "Lower run",
    polygon: {
      type: "Polygon",
      coordinates: [[
          [-82.1737587, 28.9545617],
          [-82.1735153, 28.9544983],
          [-82.1732891, 28.9545178],
          [-82.1730876, 28.9545239],
          [-82.1729315, 28.9544831],
          [-82.1727401, 28.9545018],
          [-82.1728627, 28.9546579],
          [-82.1730768, 28.9546865],
          [-82.1733034, 28.9547394],
          [-82.1734932, 28.9546979],
          [-82.1736753, 28.9547245],
          [-82.1737587, 28.9545617],
        ]],
    },
  },
];

export interface DemoSurvey {
  /** Stable key used by the generator, the seeder and tests. */
  key: "baseline" | "progress-1" | "progress-2" | "progress-3" | "closeout";
  kind: SurveyKind;
  /** Local survey date, YYYY-MM-DD. */
  surveyedOn: string;
  /** UTC offset of the local times in the file (EDT until 2026-11-01, then EST). */
  utcOffset: "-04:00" | "-05:00";
  /** Local time the crew started sounding, HH:MM. */
  startTime: string;
  /** Water-surface elevation read at the staff gauge that day, NAVD88 ft. */
  waterSurfaceElevationFt: number;
  /** Zones the pass sounded. */
  zones: ZoneName[];
  fileName: string;
  note: string;
}

export const SURVEYS: DemoSurvey[] = [
  {
    key: "baseline",
    kind: "baseline",
    surveyedOn: "2026-09-08",
    utcOffset: "-04:00",
    startTime: "06:50",
    waterSurfaceElevationFt: 32.4,
    zones: ["Vent basin", "Upper run", "Lower run"],
    fileName: "baseline-2026-09-08.csv",
    note: "Rod-and-probe baseline over the whole work limit: depth to muck top and probe to refusal.",
  },
  {
    key: "progress-1",
    kind: "progress",
    surveyedOn: "2026-09-29",
    utcOffset: "-04:00",
    startTime: "07:30",
    waterSurfaceElevationFt: 32.1,
    zones: ["Vent basin"],
    fileName: "progress-1-2026-09-29.csv",
    note: "Vent basin after the first dredge pass: most cells at firm sand, some partly done.",
  },
  {
    key: "progress-2",
    kind: "progress",
    surveyedOn: "2026-10-27",
    utcOffset: "-04:00",
    startTime: "07:30",
    waterSurfaceElevationFt: 31.85,
    zones: ["Upper run"],
    fileName: "progress-2-2026-10-27.csv",
    note: "Upper run after dredging; three soundings were taken just outside the work limit.",
  },
  {
    key: "progress-3",
    kind: "progress",
    surveyedOn: "2026-11-17",
    utcOffset: "-05:00",
    startTime: "07:45",
    waterSurfaceElevationFt: 31.7,
    zones: ["Lower run"],
    fileName: "progress-3-2026-11-17.csv",
    note: "Lower run part way: upstream cells done, some in work, the downstream end untouched.",
  },
  {
    key: "closeout",
    kind: "closeout",
    surveyedOn: "2026-11-24",
    utcOffset: "-05:00",
    startTime: "08:00",
    waterSurfaceElevationFt: 31.75,
    zones: ["Vent basin"],
    fileName: "closeout-2026-11-24.csv",
    note: "Closeout of the vent basin, confirming firm sand in every cell.",
  },
];

export interface DemoPerson {
  name: string;
  email: string;
  /** Role on the demo project; null for the site admin, who has no project role. */
  role: ProjectRole | null;
  siteAdmin: boolean;
  organisation: string;
}

export const PEOPLE: DemoPerson[] = [
  { name: "Imogen Tallis", email: "manager@example.org", role: "manager", siteAdmin: false, organisation: "Fennick County Water Authority" },
  { name: "Ravi Castellanos", email: "surveyor@example.org", role: "surveyor", siteAdmin: false, organisation: "Fennick County Water Authority" },
  { name: "Wendell Achterberg", email: "divesup@example.org", role: "dive-supervisor", siteAdmin: false, organisation: "Saltmarsh Dive Works (fictional)" },
  { name: "Marisol Quaye", email: "dewatering@example.org", role: "dewatering", siteAdmin: false, organisation: "Saltmarsh Dive Works (fictional)" },
  { name: "Tobias Fennimore", email: "monitor@example.org", role: "resource-monitor", siteAdmin: false, organisation: "Fennick County Water Authority" },
  { name: "Priya Lindqvist", email: "outreach@example.org", role: "outreach", siteAdmin: false, organisation: "Fennick County Water Authority" },
  { name: "Hollis Brandt", email: "viewer@example.org", role: "viewer", siteAdmin: false, organisation: "Friends of Wickerbill Spring (fictional)" },
  { name: "Sunniva Okoro", email: "admin@example.org", role: null, siteAdmin: true, organisation: "Fennick County Water Authority" },
];

export interface DemoDiveTeam {
  name: string;
  /** Where the team works from. */
  station: string;
  hoses: { name: string; diameterIn: number; lengthFt: number }[];
  /** The suction pumps the team runs, sized by their suction opening. */
  pumps: { name: string; diameterIn: number }[];
  /** Zone the team starts in. */
  homeZone: ZoneName;
}

export const DIVE_TEAMS: DemoDiveTeam[] = [
  {
    name: "Team Limpkin",
    station: "Barge 1 (vent basin)",
    hoses: [
      { name: "Hose A", diameterIn: 6, lengthFt: 300 },
      { name: "Hose B", diameterIn: 6, lengthFt: 300 },
    ],
    pumps: [{ name: "Pump P1", diameterIn: 8 }],
    homeZone: "Vent basin",
  },
  {
    name: "Team Gar",
    station: "Barge 2 (spring run)",
    hoses: [{ name: "Hose C", diameterIn: 6, lengthFt: 400 }],
    pumps: [{ name: "Pump P2", diameterIn: 6 }],
    homeZone: "Upper run",
  },
];
