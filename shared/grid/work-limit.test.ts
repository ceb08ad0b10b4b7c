import { area } from "@turf/turf";
import { Geodesic } from "geographiclib-geodesic";
import type { Position as LonLat } from "geojson";
import { describe, expect, it } from "vitest";
import { createCrs } from "../crs";
import { METRES_PER_UNIT, SQUARE_METRES_PER_ACRE } from "../units";
import { workLimitArea, type Position, type Ring } from "./work-limit";

// NAD83 / Florida West (ftUS), EPSG:2237, as epsg-index gives it (published parameters, EPSG registry).
const FLORIDA_WEST_FTUS =
  "+proj=tmerc +lat_0=24.3333333333333 +lon_0=-82 +k=0.999941177 +x_0=200000.0001016 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=us-ft +no_defs +type=crs";

/** Ellipsoidal area (m²) by GeographicLib on WGS 84; the ring is lon/lat, closed. */
function geodesicAreaM2(ring: LonLat[]): number {
  const polygon = Geodesic.WGS84.Polygon(false);
  for (const [lon, lat] of ring.slice(0, -1)) polygon.AddPoint(lat, lon);
  // area is present for polygons (absent only for polylines)
  return Math.abs(polygon.Compute(false, true).area ?? Number.NaN);
}

/** A fictional spring basin: an irregular 9-sided outline around a centre, in lon/lat. */
function basinOutline(centreLon: number, centreLat: number, radiusM: number): LonLat[] {
  const shape = [1, 0.82, 0.95, 1.1, 0.7, 0.9, 1.05, 0.85, 0.98];
  const ring: LonLat[] = shape.map((factor, k): LonLat => {
    const angle = (2 * Math.PI * k) / shape.length;
    const northM = radiusM * factor * Math.sin(angle);
    const eastM = radiusM * factor * Math.cos(angle);
    return [centreLon + eastM / (111_320 * Math.cos((centreLat * Math.PI) / 180)), centreLat + northM / 110_860];
  });
  ring.push(ring[0]);
  return ring;
}

describe("workLimitArea: planar area in the project CRS against the ellipsoid", () => {
  const crs = createCrs(FLORIDA_WEST_FTUS);
  const squareMetresPerSquareFootUs = METRES_PER_UNIT["us-ft"] ** 2;
  for (const [label, radiusM] of [["spring basin (≈ 2 acres)", 58], ["large bay (≈ 600 acres)", 1000]] as const) {
    it(`${label}: within 0.05 % of geographiclib-geodesic`, () => {
      const ring = basinOutline(-82.45, 28.93, radiusM);
      const projected: Ring = ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position);
      const planarM2 = workLimitArea([[projected]]) * squareMetresPerSquareFootUs;
      const referenceM2 = geodesicAreaM2(ring);
      // reference library: geographiclib-geodesic (Karney's ellipsoidal polygon area); practice:
      // near the zone's central meridian the transverse Mercator scale error is ~1e-4
      expect(Math.abs(planarM2 / referenceM2 - 1)).toBeLessThan(5e-4);
      // reference library: turf's spherical area agrees within 0.5 % as well
      expect(Math.abs(area({ type: "Polygon", coordinates: [ring] }) / referenceM2 - 1)).toBeLessThan(0.005);
      expect(planarM2 / SQUARE_METRES_PER_ACRE).toBeGreaterThan(radiusM === 58 ? 1.8 : 550);
    });
  }

  it("subtracts holes and sums polygons, whatever the winding, far from the origin", () => {
    // computed: 100 × 100 square minus a 20 × 20 island, plus a 10 × 10 cove at state plane coordinates
    const square: Ring = [[0, 0], [100, 0], [100, 100], [0, 100], [0, 0]];
    const island: Ring = [[40, 40], [40, 60], [60, 60], [60, 40], [40, 40]];
    const cove: Ring = [[500_000, 1_300_000], [500_010, 1_300_000], [500_010, 1_300_010], [500_000, 1_300_010], [500_000, 1_300_000]];
    expect(workLimitArea([[square, island], [cove]])).toBe(10_000 - 400 + 100);
    expect(workLimitArea([[square.slice().reverse()]])).toBe(10_000);
  });
});
