import { describe, expect, it } from "vitest";
import type { Polygon } from "geojson";
import { checkShoreline, SHORELINE_MAX_BYTES, SHORELINE_MAX_VERTICES } from "./shoreline-geojson";

// A small invented work limit near 28.9° N, 82.6° W (a fictional spring run).
const LIMIT: Polygon = { type: "Polygon", coordinates: [[[-82.6, 28.9], [-82.59, 28.9], [-82.59, 28.91], [-82.6, 28.91], [-82.6, 28.9]]] };
const SHORE: Polygon = { type: "Polygon", coordinates: [[[-82.605, 28.895], [-82.585, 28.895], [-82.585, 28.915], [-82.605, 28.915], [-82.605, 28.895]]] };

describe("checkShoreline", () => {
  it("accepts a Polygon, a Feature and a FeatureCollection, keeping only the outlines", () => {
    for (const input of [SHORE, { type: "Feature", properties: { owner: "x" }, geometry: SHORE }, { type: "FeatureCollection", features: [{ type: "Feature", properties: null, geometry: SHORE }] }]) {
      const result = checkShoreline(JSON.stringify(input), LIMIT);
      expect(result.ok, JSON.stringify(result)).toBe(true);
      if (!result.ok) continue;
      expect(result.collection.features).toHaveLength(1);
      expect(result.collection.features[0].properties).toEqual({});
      expect(result.collection.features[0].geometry).toEqual(SHORE);
      expect(result.vertices).toBe(5);
      expect(result.polygons).toBe(1);
    }
  });

  it("accepts a MultiPolygon with a hole (an island) and counts its polygons", () => {
    const island = [[-82.596, 28.904], [-82.596, 28.906], [-82.594, 28.906], [-82.594, 28.904], [-82.596, 28.904]];
    const multi = { type: "MultiPolygon", coordinates: [[SHORE.coordinates[0], island], [[[-82.58, 28.9], [-82.579, 28.9], [-82.579, 28.901], [-82.58, 28.9]]]] };
    const result = checkShoreline(JSON.stringify(multi), LIMIT);
    expect(result).toMatchObject({ ok: true, polygons: 2, vertices: 14 });
  });

  it("refuses an open ring, naming it", () => {
    const open = { type: "Polygon", coordinates: [SHORE.coordinates[0].slice(0, 4).concat([[-82.604, 28.895]])] };
    const result = checkShoreline(JSON.stringify(open), LIMIT);
    expect(result).toEqual({ ok: false, error: expect.stringContaining("polygon 1, outer ring: the ring is not closed") });
  });

  it("refuses a ring of fewer than four positions", () => {
    const result = checkShoreline(JSON.stringify({ type: "Polygon", coordinates: [[[-82.6, 28.9], [-82.59, 28.9], [-82.6, 28.9]]] }), LIMIT);
    expect(result.ok ? "" : result.error).toContain("at least 4 positions");
  });

  it("refuses a ring that crosses itself (a bow tie), with where", () => {
    const bowTie = { type: "Polygon", coordinates: [[[-82.6, 28.9], [-82.59, 28.91], [-82.59, 28.9], [-82.6, 28.91], [-82.6, 28.9]]] };
    const result = checkShoreline(JSON.stringify(bowTie), LIMIT);
    // The diagonals of the square cross at its centre (computed: the midpoint of both diagonals).
    expect(result.ok ? "" : result.error).toMatch(/crosses itself near lon -82\.595000, lat 28\.905000/);
  });

  it("refuses projected coordinates and swapped lat/lon", () => {
    const projected = { type: "Polygon", coordinates: [[[600000, 1600000], [600100, 1600000], [600100, 1600100], [600000, 1600000]]] };
    expect(checkShoreline(JSON.stringify(projected), LIMIT).ok ? "" : (checkShoreline(JSON.stringify(projected), LIMIT) as { error: string }).error).toContain("WGS 84");
    const swapped = { type: "Polygon", coordinates: [SHORE.coordinates[0].map(([lon, lat]) => [lat, lon])] };
    const result = checkShoreline(JSON.stringify(swapped), LIMIT);
    expect(result.ok ? "" : result.error).toContain("more than 10 km from the work limit");
  });

  it("refuses a shoreline far from the work limit but takes one a few km away", () => {
    const shift = (dLon: number) => ({ type: "Polygon", coordinates: [SHORE.coordinates[0].map(([lon, lat]) => [lon + dLon, lat])] });
    // 0.2° of longitude at 28.9° N is about 19.5 km (111 km × cos 28.9°, spherical Earth, common practice).
    expect(checkShoreline(JSON.stringify(shift(0.2)), LIMIT).ok).toBe(false);
    // 0.05° is about 4.9 km: the same water body's far shore may lie that far.
    expect(checkShoreline(JSON.stringify(shift(0.05)), LIMIT).ok).toBe(true);
    // Without a work limit only the shape rules apply.
    expect(checkShoreline(JSON.stringify(shift(0.2)), null).ok).toBe(true);
  });

  it("refuses other geometry types, non-JSON, empty files and empty collections", () => {
    expect(checkShoreline(JSON.stringify({ type: "LineString", coordinates: [[0, 0], [1, 1]] }), null).ok).toBe(false);
    expect(checkShoreline("{not json", null)).toEqual({ ok: false, error: expect.stringContaining("not JSON") });
    expect(checkShoreline("  ", null)).toEqual({ ok: false, error: "The file is empty." });
    expect(checkShoreline(JSON.stringify({ type: "FeatureCollection", features: [] }), null).ok).toBe(false);
    const point = checkShoreline(JSON.stringify({ type: "FeatureCollection", features: [{ type: "Feature", geometry: { type: "Point", coordinates: [0, 0] } }] }), null);
    expect(point.ok ? "" : point.error).toContain("features.0.geometry");
  });

  it("refuses files over the size and vertex limits", () => {
    const big = JSON.stringify(SHORE) + " ".repeat(SHORELINE_MAX_BYTES);
    expect(checkShoreline(big, LIMIT)).toEqual({ ok: false, error: expect.stringContaining("larger than 2 MB") });
    // A circle-like ring with more vertices than allowed (each on a circle, so it does not cross itself).
    const count = SHORELINE_MAX_VERTICES + 10;
    const ring = Array.from({ length: count }, (_, index) => {
      const angle = (2 * Math.PI * index) / count;
      return [-82.595 + 0.01 * Math.cos(angle), 28.905 + 0.01 * Math.sin(angle)];
    });
    ring.push(ring[0]);
    const result = checkShoreline(JSON.stringify({ type: "Polygon", coordinates: [ring] }), LIMIT);
    expect(result.ok ? "" : result.error).toContain("at most 10,000 are accepted");
  });
});
