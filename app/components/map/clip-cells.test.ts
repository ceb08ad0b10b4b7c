import { area, booleanWithin, intersect, featureCollection } from "@turf/turf";
import type { MultiPolygon, Polygon, Position } from "geojson";
import { describe, expect, it } from "vitest";
import { cellCentroid, createCellGrid, type CellGrid } from "../../../shared/grid/cell-grid";
import { createCrs } from "../../../shared/crs";
import { isInsideWorkLimit, type ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import { buildCellFeatures, type CellsData } from "./cell-features";
import { edgeCellMask } from "./clip-cells";

// A UTM zone 17N frame (metres) around an invented spring run near 28.9° N, 82.6° W.
const UTM17 = "+proj=utm +zone=17 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs";
const crs = createCrs(UTM17);
const E0 = 343_000, N0 = 3_198_000;

/** A projected ring (metres from E0/N0) as a lon/lat ring. */
const lonLat = (ring: Array<[number, number]>): Position[] => ring.map(([x, y]) => crs.toLonLat(E0 + x, N0 + y));

/** A limit in metres: a 13-gon of radius 200 m (not aligned with the grid) with an optional square island. */
function limitRings(island: boolean): Array<Array<[number, number]>> {
  const outer: Array<[number, number]> = [];
  for (let index = 0; index < 13; index++) {
    const angle = (2 * Math.PI * index) / 13 + 0.1;
    outer.push([200 * Math.cos(angle), 200 * Math.sin(angle)]);
  }
  outer.push(outer[0]);
  const hole: Array<[number, number]> = [[-37, -41], [-37, 43], [39, 43], [39, -41], [-37, -41]];
  return island ? [outer, hole] : [outer];
}

function setUp(options: { rotation?: number; island?: boolean; cellSize?: number } = {}) {
  const rings = limitRings(options.island ?? false);
  const projected: ProjectedMultiPolygon = [rings.map((ring) => ring.map(([x, y]) => [E0 + x, N0 + y] as [number, number]))];
  const grid: CellGrid = createCellGrid(projected, { cellSize: options.cellSize ?? 20, originX: E0 + 3, originY: N0 - 7, rotationDegrees: options.rotation ?? 0 });
  const count = grid.cols * grid.rows;
  const status = new Array<number>(count).fill(-1);
  for (let row = 0; row < grid.rows; row++) for (let col = 0; col < grid.cols; col++) {
    const [x, y] = cellCentroid(grid, grid.firstRow + row, grid.firstCol + col);
    if (isInsideWorkLimit(projected, x, y)) status[row * grid.cols + col] = 1;
  }
  const data = {
    projectId: 1, crs: { code: "EPSG:26917", definition: UTM17 }, lengthUnit: "m", labels: { length: "m", volume: "m³" }, grid,
    statuses: [], zones: [], computedAt: null, status, remainingThickness: new Array(count).fill(null), removedVolume: new Array(count).fill(0),
    remainingVolume: new Array(count).fill(0), plannedVolume: new Array(count).fill(0), coverage: new Array(count).fill(0), zone: new Array(count).fill(-1),
  } as unknown as CellsData;
  const workLimit: Polygon = { type: "Polygon", coordinates: rings.map(lonLat) };
  return { grid, data, workLimit };
}

const feature = (geometry: Polygon | MultiPolygon) => ({ type: "Feature" as const, properties: {}, geometry });

describe("clipping the cells along the work limit", () => {
  for (const [name, options] of [["a north-up grid", {}], ["a grid turned 30°", { rotation: 30 }], ["a limit with an island", { island: true }]] as const) {
    it(`${name}: every drawn cell lies inside the limit, edge cells lose only the part outside`, () => {
      const { data, workLimit, grid } = setUp(options);
      const squares = buildCellFeatures(data);
      const clipped = buildCellFeatures(data, workLimit);
      expect(clipped.features.map((cell) => cell.id)).toEqual(squares.features.map((cell) => cell.id));
      const mask = edgeCellMask(grid, crs, workLimit);
      let edge = 0;
      for (const [index, cell] of clipped.features.entries()) {
        const square = squares.features[index];
        const id = cell.id as number;
        // Invariant: what is drawn is the cell's part inside the limit (areas by turf, geodesic on a sphere).
        const inside = intersect(featureCollection<Polygon | MultiPolygon>([feature(square.geometry), feature(workLimit)]));
        expect(inside, `cell ${id} has some area inside`).not.toBeNull();
        expect(Math.abs(area(feature(cell.geometry)) - area(inside!))).toBeLessThan(0.01 * area(feature(square.geometry)));
        if (mask[id]) edge++;
        // A cell not marked as an edge cell is a whole square inside the limit (it needs no clip).
        else {
          expect(cell.geometry).toEqual(square.geometry);
          expect(booleanWithin(feature(square.geometry), feature(workLimit)), `interior cell ${id}`).toBe(true);
        }
      }
      // Only cells along the outline pay for the clip: a few cells per cell-length of outline.
      // Perimeter of the 13-gon: 26 · 200 · sin(π/13) ≈ 1,250 m (computed), ≈ 63 cell lengths; the island adds 320 m.
      expect(edge).toBeGreaterThan(0);
      expect(edge).toBeLessThan(4 * (1_250 + (options.island ? 320 : 0)) / 20);
      expect(edge).toBeLessThan(clipped.features.length / 2);
    });
  }

  it("draws the same total as the limit's area within the cells kept (sum of clipped cells ≤ the limit, ≥ the limit less a ring of half-cells)", () => {
    const { data, workLimit } = setUp();
    const drawn = buildCellFeatures(data, workLimit).features.reduce((sum, cell) => sum + area(feature(cell.geometry)), 0);
    const limitArea = area(feature(workLimit));
    // 13-gon of radius 200 m: ½ · 13 · 200² · sin(2π/13) ≈ 120,800 m² (computed, planar; the UTM scale factor near the meridian changes it by under 0.1 %).
    expect(limitArea).toBeGreaterThan(120_000);
    expect(limitArea).toBeLessThan(122_000);
    expect(drawn).toBeLessThanOrEqual(limitArea * 1.001);
    expect(drawn).toBeGreaterThan(limitArea - 1_250 * 10);
  });

  it("splits a cell that a narrow inlet runs through into its two parts inside (the general intersection)", () => {
    // A 200 m square with a 4 m wide inlet from its north side running 110 m south, through cells of 20 m.
    const ring: Array<[number, number]> = [[-100, -100], [100, -100], [100, 100], [7, 100], [7, -10], [3, -10], [3, 100], [-100, 100], [-100, -100]];
    const projected: ProjectedMultiPolygon = [[ring.map(([x, y]) => [E0 + x, N0 + y] as [number, number])]];
    const grid = createCellGrid(projected, { cellSize: 20, originX: E0 - 100, originY: N0 - 100 });
    const count = grid.cols * grid.rows;
    const status = new Array<number>(count).fill(-1);
    for (let row = 0; row < grid.rows; row++) for (let col = 0; col < grid.cols; col++) {
      const [x, y] = cellCentroid(grid, grid.firstRow + row, grid.firstCol + col);
      if (isInsideWorkLimit(projected, x, y)) status[row * grid.cols + col] = 1;
    }
    const { data } = setUp();
    const inletData = { ...data, grid, status, remainingThickness: new Array(count).fill(null), removedVolume: new Array(count).fill(0), zone: new Array(count).fill(-1) } as CellsData;
    const workLimit: Polygon = { type: "Polygon", coordinates: [lonLat(ring)] };
    const squares = buildCellFeatures(inletData);
    const clipped = buildCellFeatures(inletData, workLimit);
    const split = clipped.features.filter((cell) => cell.geometry.type === "MultiPolygon");
    // The inlet (x 3–7 m) runs through the column of cells x 0–20 m from y −10 m to the north edge: rows y 0–20 … 80–100 (5 cells, computed).
    expect(split).toHaveLength(5);
    for (const [index, cell] of clipped.features.entries()) {
      const inside = intersect(featureCollection<Polygon | MultiPolygon>([feature(squares.features[index].geometry), feature(workLimit)]))!;
      expect(Math.abs(area(feature(cell.geometry)) - area(inside))).toBeLessThan(0.01 * area(feature(squares.features[index].geometry)));
    }
    // Each split cell loses the inlet's 4 m × 20 m (computed: 400 − 80 = 320 m²; turf's spherical area, within 1 %).
    for (const cell of split) expect(area(feature(cell.geometry))).toBeCloseTo(320, -1);
  });

  it("leaves the squares alone without a work limit", () => {
    const { data } = setUp();
    const squares = buildCellFeatures(data);
    expect(squares.features.every((cell) => cell.geometry.type === "Polygon" && cell.geometry.coordinates[0].length === 5)).toBe(true);
  });
});

describe("buildCellFeatures for a few cells (the settings page's preview of a view)", () => {
  it("builds just the cells asked for, each as the whole grid's build makes it, clipped alike (invariant)", () => {
    const { data, workLimit } = setUp({ rotation: 23, island: true });
    const all = buildCellFeatures(data, workLimit);
    const inLimit = all.features.map((feature) => feature.id as number);
    const some = [inLimit[3], inLimit[40], inLimit[inLimit.length - 1], inLimit[17]];
    const built = buildCellFeatures(data, workLimit, some);
    expect(built.features.map((feature) => feature.id)).toEqual(some);
    for (const feature of built.features) expect(feature).toEqual(all.features.find((other) => other.id === feature.id));
    expect(buildCellFeatures(data, workLimit, []).features).toEqual([]);
  });
});
