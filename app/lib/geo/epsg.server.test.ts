import { describe, expect, it } from "vitest";
import { createCrs } from "../../../shared/crs";
import { METRES_PER_UNIT } from "../../../shared/units";
import { lengthUnitOfCrs, resolveCrsDefinition } from "./epsg.server";

function parameter(definition: string, name: string): number {
  const match = new RegExp(`\\+${name}=(-?[\\d.]+)`).exec(definition);
  if (!match) throw new Error(`no +${name} in ${definition}`);
  return Number(match[1]);
}

describe("NAD83 / Florida West (ftUS), EPSG:2237, from epsg-index", () => {
  const resolved = resolveCrsDefinition("EPSG:2237");
  it("carries the published parameters", () => {
    // published: EPSG registry, EPSG:2237 (Transverse Mercator)
    expect(resolved.code).toBe(2237);
    expect(resolved.name).toBe("NAD83 / Florida West (ftUS)");
    expect(resolved.definition).toContain("+proj=tmerc");
    expect(parameter(resolved.definition, "lat_0")).toBeCloseTo(24 + 20 / 60, 9); // 24°20′N
    expect(parameter(resolved.definition, "lon_0")).toBe(-82);
    expect(parameter(resolved.definition, "k")).toBe(0.999941177);
    // published: FE 200,000 m (proj4 writes false easting in metres)
    expect(parameter(resolved.definition, "x_0")).toBeCloseTo(200_000, 3);
    expect(parameter(resolved.definition, "y_0")).toBe(0);
    expect(resolved.unit).toBe("US survey foot");
    expect(lengthUnitOfCrs(resolved)).toBe("us-ft");
  });
  it("maps its natural origin to (656,166.667 ftUS, 0)", () => {
    const crs = createCrs(resolved.definition);
    const [easting, northing] = crs.fromLonLat(-82, 24 + 20 / 60);
    // published: FE = 200,000 m = 656,166.667 ftUS (EPSG registry); NAD83 here has a zero shift to WGS 84
    expect(easting).toBeCloseTo(656_166.667, 3);
    // computed: 200,000 m / (1200/3937 m per ftUS)
    expect(easting).toBeCloseTo(200_000 / METRES_PER_UNIT["us-ft"], 2);
    expect(Math.abs(northing)).toBeLessThan(1e-6);
    const [lon, lat] = crs.toLonLat(656_166.667, 0);
    expect(lon).toBeCloseTo(-82, 9);
    expect(lat).toBeCloseTo(24 + 20 / 60, 9);
  });
  it("accepts a bare code the same as EPSG:code", () => {
    expect(resolveCrsDefinition("2237")).toEqual(resolved);
    expect(resolveCrsDefinition(" epsg:2237 ")).toEqual(resolved);
  });
});

describe("OSGB36 / British National Grid, EPSG:27700, from epsg-index", () => {
  const resolved = resolveCrsDefinition("EPSG:27700");
  it("projects the Guidance Note 7-2 point with its datum grid set aside", () => {
    // The index gives a +nadgrids datum grid Firmsand does not ship; the projection itself is
    // tested ellipsoid-only, as the published example is (no datum change).
    expect(resolved.warnings.length).toBe(1);
    expect(resolved.definition).not.toContain("+nadgrids");
    expect(resolved.definition).not.toContain("+towgs84");
    const [easting, northing] = createCrs(resolved.definition).fromLonLat(0.5, 50.5);
    // published: IOGP EPSG Guidance Note 7-2, TM example, ±0.01 m
    expect(Math.abs(easting - 577_274.99)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(northing - 69_740.5)).toBeLessThanOrEqual(0.01);
    expect(lengthUnitOfCrs(resolved)).toBe("m");
  });
  it("keeps a null grid, which means no shift (EPSG:3857)", () => {
    const pseudoMercator = resolveCrsDefinition("EPSG:3857");
    expect(pseudoMercator.definition).toContain("+nadgrids=@null");
    expect(pseudoMercator.warnings).toEqual([]);
  });
});

describe("input forms and errors", () => {
  it("takes a proj4 string as is", () => {
    const resolved = resolveCrsDefinition("+proj=utm +zone=17 +datum=WGS84 +units=m +no_defs");
    expect(resolved.code).toBeNull();
    expect(lengthUnitOfCrs(resolved)).toBe("m");
  });
  it("names an unknown code", () => {
    expect(() => resolveCrsDefinition("EPSG:999999")).toThrow(/EPSG:999999 is not a known/);
    expect(() => resolveCrsDefinition("Florida West")).toThrow(/EPSG code/);
  });
  it("maps units it knows and refuses the others", () => {
    expect(lengthUnitOfCrs("foot")).toBe("ft");
    expect(lengthUnitOfCrs(resolveCrsDefinition("EPSG:4326"))).toBeNull();
    expect(lengthUnitOfCrs("Clarke's foot")).toBeNull();
  });
});
