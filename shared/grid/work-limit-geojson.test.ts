import { describe, expect, it } from "vitest";
import { createCrs } from "../crs";
import { defaultGridOrigin } from "./cell-grid";
import { parseWorkLimitGeoJson } from "./work-limit-geojson";
import type { Position } from "./work-limit";

// NAD83 / Florida West (ftUS), EPSG:2237 (published parameters, EPSG registry, as epsg-index gives them).
const crs = createCrs("+proj=tmerc +lat_0=24.3333333333333 +lon_0=-82 +k=0.999941177 +x_0=200000.0001016 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=us-ft +no_defs +type=crs");

// An invented 300 × 200 ft pond with a 20 × 20 ft island, in state plane feet.
const pond: Position[] = [[600_000, 1_680_000], [600_300, 1_680_000], [600_300, 1_680_200], [600_000, 1_680_200], [600_000, 1_680_000]];
const island: Position[] = [[600_100, 1_680_100], [600_100, 1_680_120], [600_120, 1_680_120], [600_120, 1_680_100], [600_100, 1_680_100]];

function problemsOf(geoJson: unknown): string[] {
  const parsed = parseWorkLimitGeoJson(geoJson, crs);
  return parsed.ok ? [] : parsed.problems.map((problem) => problem.message);
}

describe("parseWorkLimitGeoJson", () => {
  it("reads a Polygon in the project CRS, holes subtracted, and says so", () => {
    const parsed = parseWorkLimitGeoJson({ type: "Polygon", coordinates: [pond, island] }, crs);
    expect(parsed.ok && parsed.coordinates).toBe("project-crs");
    // computed: 300 × 200 − 20 × 20 ft²
    expect(parsed.ok && parsed.area).toBeCloseTo(60_000 - 400, 3);
  });

  it("reads the same outline in lon/lat (a FeatureCollection) to the same area within 1e-9", () => {
    const lonLat = [pond, island].map((ring) => ring.map(([x, y]) => crs.toLonLat(x, y)));
    const parsed = parseWorkLimitGeoJson({ type: "FeatureCollection", features: [{ type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: lonLat } }] }, crs);
    expect(parsed.ok && parsed.coordinates).toBe("lon-lat");
    // invariant: the projection's round trip is exact to far below a square foot
    expect(parsed.ok && Math.abs(parsed.area / 59_600 - 1)).toBeLessThan(1e-9);
  });

  it("refuses a self-crossing ring, naming the polygon, the ring and a vertex at the crossing", () => {
    // a bow tie: the edges 1–2 and 3–4 cross at (600 150, 1 680 100)
    const bowTie: Position[] = [[600_000, 1_680_000], [600_300, 1_680_200], [600_300, 1_680_000], [600_000, 1_680_200], [600_000, 1_680_000]];
    const [message] = problemsOf({ type: "Polygon", coordinates: [bowTie] });
    expect(message).toMatch(/^polygon 1, ring 1 \(the outline\) crosses itself near vertex \d$/);
  });

  it("refuses an unclosed ring, one with too few corners, and empty input", () => {
    expect(problemsOf({ type: "Polygon", coordinates: [pond.slice(0, 4)] })).toEqual(["polygon 1, ring 1 (the outline) is not closed: its last vertex (4) must repeat its first"]);
    expect(problemsOf({ type: "Polygon", coordinates: [[pond[0], pond[1], pond[0]]] })[0]).toMatch(/has 2 corners; a ring needs at least 3/);
    expect(problemsOf({ type: "FeatureCollection", features: [] })).toEqual(["is empty: it holds no polygon"]);
    expect(problemsOf({ type: "Polygon", coordinates: [[pond[0], pond[1], pond[1], pond[0]]] })).toEqual(["is empty: its polygons enclose no area"]);
    expect(problemsOf({ type: "LineString", coordinates: pond })[0]).toMatch(/LineString; only polygons/);
    expect(problemsOf({ type: "Polygon", coordinates: [[...pond.slice(0, 2), ["x", 1], ...pond.slice(2)]] })[0]).toMatch(/vertex 3 is not a pair of numbers/);
  });
});

describe("defaultGridOrigin", () => {
  it("is the south-west corner floored to the cell size, unrotated", () => {
    const shifted = pond.map(([x, y]) => [x + 7, y + 13] as Position);
    // computed: floor(600 007 / 20) × 20 = 600 000; floor(1 680 013 / 20) × 20 = 1 680 000
    expect(defaultGridOrigin([[shifted]], 20)).toEqual([600_000, 1_680_000]);
  });

  it("leaves every vertex at or above and right of the origin in the rotated frame", () => {
    const [x0, y0] = defaultGridOrigin([[pond]], 15, 30);
    const radians = (30 * Math.PI) / 180;
    for (const [x, y] of pond) {
      const u = (x - x0) * Math.cos(radians) + (y - y0) * Math.sin(radians);
      const v = -(x - x0) * Math.sin(radians) + (y - y0) * Math.cos(radians);
      // invariant: the origin lies within one cell below and left of the outline
      expect(u).toBeGreaterThanOrEqual(-1e-6);
      expect(v).toBeGreaterThanOrEqual(-1e-6);
    }
  });
});
