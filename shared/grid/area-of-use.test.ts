import { describe, expect, it } from "vitest";
import { describeArea, firstVertexOutside } from "./area-of-use";

// EPSG:2237 (NAD83 / Florida West, ftUS): area of use 26.27–29.6°N, 83.34–81.13°W (published: EPSG registry).
const FLORIDA_WEST = { south: 26.27, north: 29.6, west: -83.34, east: -81.13 };
const square = (lon: number, lat: number) => [[[lon, lat], [lon + 0.01, lat], [lon + 0.01, lat + 0.01], [lon, lat + 0.01], [lon, lat]]];

describe("a work limit in its CRS's area of use", () => {
  it("accepts a limit inside the area, or within the margin past its edge", () => {
    expect(firstVertexOutside([square(-82.175, 28.955)], FLORIDA_WEST)).toBeNull();
    expect(firstVertexOutside([square(-81.0, 28.0)], FLORIDA_WEST)).toBeNull();
  });

  it("names the first vertex beyond the margin: polygon, ring and vertex, counted from 1", () => {
    // Central Texas read as Florida West: far west of the area.
    expect(firstVertexOutside([square(-82.175, 28.955), square(-97.7, 30.3)], FLORIDA_WEST)).toEqual({ polygon: 2, ring: 1, vertex: 1, lon: -97.7, lat: 30.3 });
    // The second vertex lies just past the 0.5° margin (east edge −81.13 + 0.5 = −80.63).
    expect(firstVertexOutside([[[[-81.0, 28.0], [-80.6, 28.0], [-80.6, 28.1], [-81.0, 28.0]]]], FLORIDA_WEST)).toMatchObject({ vertex: 2 });
  });

  it("does not check an unknown area or one across the antimeridian (negative control)", () => {
    expect(firstVertexOutside([square(10, 10)], null)).toBeNull();
    expect(firstVertexOutside([square(10, 10)], { south: -50, north: -30, west: 160, east: -170 })).toBeNull();
  });

  it("words the area", () => {
    expect(describeArea(FLORIDA_WEST)).toBe("26.27°N to 29.60°N, 83.34°W to 81.13°W");
  });
});
