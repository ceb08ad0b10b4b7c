import { describe, expect, it } from "vitest";
import { createCrs } from "./crs";

// IOGP EPSG Guidance Note 7-2, Transverse Mercator worked example (OSGB 1936 / British National
// Grid). The example works on the Airy 1830 ellipsoid with no datum change, so the definition
// carries the ellipsoid only (no +towgs84, no +nadgrids): lon/lat in and out are OSGB36's own.
const BRITISH_NATIONAL_GRID_AS_PUBLISHED =
  "+proj=tmerc +lat_0=49 +lon_0=-2 +k=0.9996012717 +x_0=400000 +y_0=-100000 +ellps=airy +units=m +no_defs";

describe("Transverse Mercator against EPSG Guidance Note 7-2", () => {
  const crs = createCrs(BRITISH_NATIONAL_GRID_AS_PUBLISHED);
  it("forward: 50°30′N 0°30′E → E 577,274.99 N 69,740.50", () => {
    const [easting, northing] = crs.fromLonLat(0.5, 50.5);
    // published: IOGP GN 7-2, TM example, ±0.01 m (the published figures are rounded to cm)
    expect(Math.abs(easting - 577_274.99)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(northing - 69_740.5)).toBeLessThanOrEqual(0.01);
  });
  it("inverse: E 577,274.99 N 69,740.50 → 50°30′N 0°30′E", () => {
    const [lon, lat] = crs.toLonLat(577_274.99, 69_740.5);
    // published: IOGP GN 7-2; 0.01 m on the ground is about 1.5e-7° of latitude and longitude here
    expect(Math.abs(lat - 50.5)).toBeLessThan(1.5e-7);
    expect(Math.abs(lon - 0.5)).toBeLessThan(1.5e-7 / Math.cos((50.5 * Math.PI) / 180));
  });
  it("is projected, not geographic", () => {
    expect(crs.isGeographic).toBe(false);
    expect(createCrs("+proj=longlat +datum=WGS84 +no_defs").isGeographic).toBe(true);
  });
});

describe("array conversion", () => {
  it("converts interleaved arrays the same as single points, both ways", () => {
    // computed: the array path must agree with the point path; the round trip must return the input
    const crs = createCrs(BRITISH_NATIONAL_GRID_AS_PUBLISHED);
    const lonLat = new Float64Array([0.5, 50.5, -3.2, 55.9, -1.25, 52.1]);
    const projected = crs.fromLonLatArray(lonLat);
    for (let i = 0; i < lonLat.length; i += 2) {
      const [easting, northing] = crs.fromLonLat(lonLat[i], lonLat[i + 1]);
      expect(projected[i]).toBe(easting);
      expect(projected[i + 1]).toBe(northing);
    }
    const back = crs.toLonLatArray(projected);
    for (let i = 0; i < lonLat.length; i++) expect(back[i]).toBeCloseTo(lonLat[i], 9);
  });
  it("rejects odd-length arrays and unreadable definitions", () => {
    const crs = createCrs(BRITISH_NATIONAL_GRID_AS_PUBLISHED);
    expect(() => crs.toLonLatArray(new Float64Array(3))).toThrow(/pairs/);
    expect(() => createCrs("EPSG:2237")).toThrow(/proj4/);
  });
});
