import { describe, expect, it } from "vitest";
import type { Position, ProjectedMultiPolygon } from "./work-limit";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { createCrs } from "../crs";
import { createCellGrid } from "./cell-grid";
import { cellsOutline } from "./cell-union";
import { clipToLimit, liesInsideByOutline, zoneOutsideLimit, zoneOverlapArea } from "./zone-fit";
import { isInsideWorkLimit, workLimitArea } from "./work-limit";

// Rectangles and an L-shaped limit whose areas are closed forms (computed by hand below); each
// case is run again shifted by state-plane-sized offsets, where the answer must not change.
const rectangle = (x0: number, y0: number, x1: number, y1: number): ProjectedMultiPolygon => [[[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]];
const move = (polygons: ProjectedMultiPolygon, dx: number, dy: number): ProjectedMultiPolygon => polygons.map((polygon) => polygon.map((ring) => ring.map(([x, y]) => [x + dx, y + dy] as Position)));
const square100 = rectangle(0, 0, 100, 100);
// An L: the 100 × 100 square less its top-right 50 × 50 quarter (area 7,500).
const lShape: ProjectedMultiPolygon = [[[[0, 0], [100, 0], [100, 50], [50, 50], [50, 100], [0, 100], [0, 0]]]];
const TOLERANCE = 0.01 * 20 * 20; // a hundredth of a 20-unit cell

describe.each([
  ["near the origin", 0, 0],
  ["at state plane coordinates", 612_345.5, 1_234_567.25],
])("zoneOutsideLimit %s", (_where, dx, dy) => {
  const limit = (polygons: ProjectedMultiPolygon) => move(polygons, dx, dy);
  const zone = (polygons: ProjectedMultiPolygon) => move(polygons, dx, dy);

  it("accepts a zone inside the limit and one sharing its edges (computed)", () => {
    expect(zoneOutsideLimit(zone(rectangle(10, 10, 20, 20)), limit(square100), TOLERANCE)).toBeNull();
    expect(zoneOutsideLimit(zone(rectangle(0, 0, 100, 40)), limit(square100), TOLERANCE)).toBeNull();
  });

  it("measures what lies outside and names the first vertex off the limit (computed: 10 × 20 = 200 outside)", () => {
    const found = zoneOutsideLimit(zone(rectangle(90, 10, 110, 30)), limit(square100), TOLERANCE);
    expect(found?.areaOutside).toBeCloseTo(200, 6);
    expect(found?.vertex).toEqual({ polygon: 1, ring: 1, vertex: 2 });
  });

  it("finds an edge cutting across a concave limit when every vertex is inside (computed: 10 × 10 in the missing quarter)", () => {
    const strip: ProjectedMultiPolygon = [[[[45, 45], [60, 45], [45, 60], [45, 45]]]];
    // The triangle (45,45)-(60,45)-(45,60): every vertex inside the L; the part above y = 50 and
    // right of x = 50 is the triangle (50,50)-(55,50)-(50,55), area 12.5.
    const found = zoneOutsideLimit(zone(strip), limit(lShape), 1);
    expect(found?.areaOutside).toBeCloseTo(12.5, 6);
    expect(found?.vertex).toBeNull();
  });

  it("lets a sliver under the tolerance pass (negative control of the tolerance)", () => {
    // 100 × 0.03 = 3 square units outside, under 4.
    expect(zoneOutsideLimit(zone(rectangle(0, 0, 100, 100.03)), limit(square100), TOLERANCE)).toBeNull();
    expect(zoneOutsideLimit(zone(rectangle(0, 0, 100, 100.05)), limit(square100), TOLERANCE)?.areaOutside).toBeCloseTo(5, 6);
  });
});

describe("zoneOverlapArea", () => {
  it("is the shared rectangle's area, and 0 for zones sharing only an edge (computed)", () => {
    expect(zoneOverlapArea(rectangle(0, 0, 50, 100), rectangle(45, 0, 100, 100))).toBeCloseTo(500, 6);
    expect(zoneOverlapArea(rectangle(0, 0, 50, 100), rectangle(50, 0, 100, 100))).toBeCloseTo(0, 9);
    expect(zoneOverlapArea(move(rectangle(0, 0, 50, 100), 612_345.5, 1_234_567.25), move(rectangle(45, 0, 100, 100), 612_345.5, 1_234_567.25))).toBeCloseTo(500, 4);
  });
});

describe("clipToLimit", () => {
  it("keeps the part of a zone inside the limit, at state plane coordinates too (computed: closed-form rectangle areas)", () => {
    for (const [dx, dy] of [[0, 0], [612_345.5, 1_234_567.25]]) {
      // A 60 × 100 block over the L: 60 × 50 below the notch and 10 × 50 beside it (x 40–50) above.
      const inside = clipToLimit(move(rectangle(40, 0, 100, 100), dx, dy), move(lShape, dx, dy));
      expect(workLimitArea(inside)).toBeCloseTo(60 * 50 + 10 * 50, 3);
      expect(zoneOutsideLimit(inside, move(lShape, dx, dy), TOLERANCE)).toBeNull();
    }
    expect(clipToLimit(rectangle(200, 200, 300, 300), square100)).toEqual([]);
  });
});

describe("a zone clipped to the work limit and read back from lon/lat (its edges run along the limit's within rounding)", () => {
  // The invented lake of tests/fixtures/project-setup in EPSG:2237 (Florida West, US survey feet).
  const EPSG_2237 = "+proj=tmerc +lat_0=24.3333333333333 +lon_0=-82 +k=0.999941177 +x_0=200000.0001016 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=us-ft +no_defs +type=crs";
  const crs = createCrs(EPSG_2237);
  const lake = JSON.parse(readFileSync(join(import.meta.dirname, "..", "..", "tests", "fixtures", "project-setup", "yellowmarsh-lake.geojson"), "utf8")).features[0].geometry.coordinates as Position[][];
  const limit: ProjectedMultiPolygon = [lake.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position))];
  const grid = createCellGrid(limit, { cellSize: 20, originX: 556_060, originY: 1_554_040 });
  const roundTrip = (zone: ProjectedMultiPolygon): ProjectedMultiPolygon => zone.map((rings) => rings.map((ring) => ring.map(([x, y]) => crs.fromLonLat(...crs.toLonLat(x, y)) as Position)));

  it("every strip of three cells along the shore, clipped, is inside (the clipper alone misjudged about one in thirty)", () => {
    let strips = 0;
    for (let row = grid.firstRow; row < grid.firstRow + grid.rows; row++) {
      for (let col = grid.firstCol; col < grid.firstCol + grid.cols; col++) {
        const union = cellsOutline(grid, [0, 1, 2].map((step) => ({ row, col: col + step })));
        // Strips wholly inside or wholly outside are not clipped along the shore: left out.
        const corners = union[0][0].filter(([x, y]) => isInsideWorkLimit(limit, x, y)).length;
        if (corners === 0 || corners === union[0][0].length) continue;
        const clipped = clipToLimit(union, limit);
        if (clipped.length === 0) continue;
        strips++;
        expect(zoneOutsideLimit(roundTrip(clipped), limit, TOLERANCE)).toBeNull();
      }
    }
    expect(strips).toBeGreaterThan(100);
  });

  it("a strip moved 30 ft off the shore is still refused, naming a vertex outside", () => {
    const [x0, y0] = limit[0][0][0];
    const off: ProjectedMultiPolygon = [[[[x0 + 5, y0 - 10], [x0 + 30, y0 - 10], [x0 + 30, y0 + 10], [x0 + 5, y0 + 10], [x0 + 5, y0 - 10]]]];
    const outside = zoneOutsideLimit(roundTrip(off), limit, TOLERANCE);
    expect(outside?.vertex).not.toBeNull();
  });

  it("the outline check refuses a zone over an island of the limit", () => {
    const withIsland: ProjectedMultiPolygon = [[square100[0][0], [[40, 40], [60, 40], [60, 60], [40, 60], [40, 40]]]];
    expect(liesInsideByOutline(rectangle(30, 30, 70, 70), withIsland, 0.2)).toBe(false);
    expect(liesInsideByOutline(rectangle(10, 10, 30, 30), withIsland, 0.2)).toBe(true);
    expect(zoneOutsideLimit(rectangle(30, 30, 70, 70), withIsland, TOLERANCE)?.areaOutside).toBeCloseTo(400, 6); // computed: the 20 × 20 island
  });
});
