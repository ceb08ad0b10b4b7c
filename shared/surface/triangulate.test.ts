import { describe, expect, it } from "vitest";
import Delaunator from "delaunator";
import { hullRing, spatialOrderFrom, tinArea, triangulate, vertexCount } from "./triangulate";
import { rasterizeTin } from "./raster";

function seeded(seed: number) {
  let state = seed >>> 0;
  return () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function shoelace(ring: Array<[number, number]>): number {
  let twice = 0;
  for (let index = 0; index + 1 < ring.length; index++) twice += ring[index][0] * ring[index + 1][1] - ring[index + 1][0] * ring[index][1];
  return twice / 2;
}

function randomSurvey(count: number, random: () => number, size = 100) {
  const easting = new Float64Array(count);
  const northing = new Float64Array(count);
  const elevation = new Float64Array(count);
  for (let index = 0; index < count; index++) {
    easting[index] = random() * size;
    northing[index] = random() * size;
    elevation[index] = -3 - random();
  }
  return { easting, northing, elevation };
}

describe("triangulate", () => {
  it("triangle areas sum to the convex hull's area", () => {
    const survey = randomSurvey(2000, seeded(7));
    const tin = triangulate(survey.easting, survey.northing, survey.elevation, { maxEdge: Infinity });
    // invariant: a triangulation of a point set tiles its convex hull exactly.
    expect(Math.abs(tinArea(tin) - shoelace(hullRing(tin))) / shoelace(hullRing(tin))).toBeLessThan(1e-12);
    expect(tin.triangles.length / 3).toBeGreaterThan(3900); // computed: 2n − 2 − hull vertices for n = 2000
  });

  it("gives the same triangles in Z order (large surveys) as in the order the soundings came", () => {
    // invariant: Delaunay triangles depend on the positions only, so putting the soundings in Z
    // order (done from `spatialOrderFrom` on) cannot change them. Reference: Delaunator itself on
    // the soundings as they came, triangles compared as sets of corner positions.
    const cornersOf = (x: (vertex: number) => number, y: (vertex: number) => number, triangles: ArrayLike<number>) => {
      const keys: string[] = [];
      for (let corner = 0; corner < triangles.length; corner += 3) {
        const points = [triangles[corner], triangles[corner + 1], triangles[corner + 2]].map((vertex) => `${x(vertex)},${y(vertex)}`);
        keys.push(points.sort().join(" "));
      }
      return keys.sort();
    };
    for (const count of [2_000, spatialOrderFrom + 500]) {
      const survey = randomSurvey(count, seeded(count), 1000);
      const tin = triangulate(survey.easting, survey.northing, survey.elevation, { maxEdge: Infinity });
      const ours = cornersOf((vertex) => tin.xy[2 * vertex] + tin.offsetX, (vertex) => tin.xy[2 * vertex + 1] + tin.offsetY, tin.triangles);
      const coords = new Float64Array(2 * count);
      for (let index = 0; index < count; index++) {
        coords[2 * index] = survey.easting[index];
        coords[2 * index + 1] = survey.northing[index];
      }
      const reference = new Delaunator(coords);
      const theirs = cornersOf((vertex) => survey.easting[vertex], (vertex) => survey.northing[vertex], reference.triangles);
      expect(ours.length).toBe(theirs.length);
      expect(ours).toEqual(theirs);
    }
  });

  it("merges exact duplicates into one vertex with the mean elevation", () => {
    const easting = Float64Array.of(0, 10, 0, 10, 0, 10);
    const northing = Float64Array.of(0, 0, 10, 10, 0, 0);
    const elevation = Float64Array.of(1, 2, 3, 4, 5, 8);
    const tin = triangulate(easting, northing, elevation, { maxEdge: Infinity });
    expect(vertexCount(tin)).toBe(4);
    expect(tin.duplicatesMerged).toBe(2);
    const at = (x: number, y: number) => {
      for (let vertex = 0; vertex < vertexCount(tin); vertex++) if (tin.xy[2 * vertex] + tin.offsetX === x && tin.xy[2 * vertex + 1] + tin.offsetY === y) return tin.z[vertex];
      return Number.NaN;
    };
    expect(at(0, 0)).toBe(3); // computed: (1 + 5) / 2
    expect(at(10, 0)).toBe(5); // computed: (2 + 8) / 2
    expect(tinArea(tin)).toBeCloseTo(100, 9); // computed: the 10 × 10 square
  });

  it("gives no triangles for collinear soundings, and skips non-finite values", () => {
    const line = triangulate(Float64Array.of(0, 1, 2, 3), Float64Array.of(0, 1, 2, 3), Float64Array.of(1, 1, 1, 1), { maxEdge: Infinity });
    expect(line.triangles.length).toBe(0); // invariant: points on a line enclose no area
    const withNaN = triangulate(Float64Array.of(0, 1, 0, 5), Float64Array.of(0, 0, 1, 5), Float64Array.of(1, 1, 1, Number.NaN), { maxEdge: Infinity });
    expect(withNaN.invalidSkipped).toBe(1);
    expect(withNaN.triangles.length).toBe(3);
  });

  it("drops triangles with an edge longer than the maximum, so gaps stay gaps", () => {
    // Two 1 × 1 squares 20 apart: with maxEdge 2 only the squares' own triangles survive.
    const easting = Float64Array.of(0, 1, 1, 0, 20, 21, 21, 20);
    const northing = Float64Array.of(0, 0, 1, 1, 0, 0, 1, 1);
    const tin = triangulate(easting, northing, new Float64Array(8), { maxEdge: 2 });
    expect(tinArea(tin)).toBeCloseTo(2, 12); // computed: two unit squares
    expect(tin.longTrianglesDropped).toBeGreaterThan(0);
  });

  it("gives the same surface when the survey is moved by 1e6 or scaled", () => {
    const survey = randomSurvey(500, seeded(99), 50);
    const grid = { originX: 0, originY: 0, spacing: 0.5, cols: 100, rows: 100 };
    const base = rasterizeTin(triangulate(survey.easting, survey.northing, survey.elevation, { maxEdge: Infinity }), grid);
    const shift = 1e6;
    const moved = rasterizeTin(
      triangulate(survey.easting.map((x) => x + shift), survey.northing.map((y) => y + shift), survey.elevation, { maxEdge: Infinity }),
      { ...grid, originX: shift, originY: shift },
    );
    const scale = 1e-3;
    const scaled = rasterizeTin(
      triangulate(survey.easting.map((x) => x * scale), survey.northing.map((y) => y * scale), survey.elevation, { maxEdge: Infinity }),
      { ...grid, spacing: grid.spacing * scale },
    );
    let compared = 0;
    for (let node = 0; node < base.values.length; node++) {
      const value = base.values[node];
      if (Number.isNaN(value)) continue;
      compared++;
      // invariant: translation and uniform scaling of the plan do not change interpolated elevations.
      expect(Math.abs(moved.values[node] - value)).toBeLessThan(1e-9);
      expect(Math.abs(scaled.values[node] - value)).toBeLessThan(1e-9);
    }
    expect(compared).toBeGreaterThan(8000);
  });
});
