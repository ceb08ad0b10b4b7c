import { describe, expect, it } from "vitest";
import type { Position } from "geojson";
import { contourBands, depthThresholds, projectedBands, remainingThicknessThresholds, type BandRaster } from "./bands";
import { createCrs } from "./crs";

function rasterOf(
  cols: number,
  rows: number,
  originX: number,
  originY: number,
  spacing: number,
  valueAt: (x: number, y: number) => number,
): BandRaster {
  const values = new Float64Array(cols * rows);
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < cols; col++) {
      values[row * cols + col] = valueAt(originX + (col + 0.5) * spacing, originY + (row + 0.5) * spacing);
    }
  }
  return { values, cols, rows, originX, originY, spacing };
}

function signedArea(ring: Position[]): number {
  let twice = 0;
  for (let i = 0; i + 1 < ring.length; i++) twice += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return twice / 2;
}

function extent(polygons: Position[][][]): [number, number, number, number] {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const polygon of polygons) for (const ring of polygon) for (const [x, y] of ring) {
    minX = Math.min(minX, x); maxX = Math.max(maxX, x); minY = Math.min(minY, y); maxY = Math.max(maxY, y);
  }
  return [minX, minY, maxX, maxY];
}

describe("bands of a plane reproduce strips exactly", () => {
  // value = easting: band [a, b) is the strip a ≤ x < b across the raster's full height
  const spacing = 2;
  const raster = rasterOf(51, 31, 1000, 5000, spacing, (x) => x);
  const bands = projectedBands(raster, [1010, 1020, 1047.5, 1080]);

  it("places the boundaries at the threshold eastings (no half-cell shift)", () => {
    // nodes sit at pixel centres: easting 1001, 1003, …, 1101; the raster spans 1000 to 1102
    // computed: linear interpolation reproduces a plane, so the edges fall exactly on x = threshold
    const [minX, , maxX] = extent(bands[0].polygons);
    expect(minX).toBeCloseTo(1010, 9);
    expect(maxX).toBeCloseTo(1020, 9);
    expect(extent(bands[1].polygons)[2]).toBeCloseTo(1047.5, 9);
  });

  it("gives strip areas (b − a) × height", () => {
    // computed: the raster's height is rows × spacing (each node stands for its own square)
    const height = 31 * spacing;
    expect(bands[0].area).toBeCloseTo(10 * height, 6);
    expect(bands[1].area).toBeCloseTo(27.5 * height, 6);
    expect(bands[2].area).toBeCloseTo(32.5 * height, 6);
    expect(bands[0].polygons.length).toBe(1);
  });

  it("is unchanged when coordinates are offset by 1e6 and scaled", () => {
    // computed invariant: the band geometry is affine in origin and spacing
    const moved = rasterOf(51, 31, 1000 + 1e6, 5000 + 1e6, spacing, (x) => x - 1e6);
    const movedBands = projectedBands(moved, [1010, 1020]);
    expect(movedBands[0].area).toBeCloseTo(bands[0].area, 4);
    const scaled = rasterOf(51, 31, 1000 * 1000, 5000 * 1000, spacing * 1000, (x) => x / 1000);
    expect(projectedBands(scaled, [1010, 1020])[0].area / 1e6).toBeCloseTo(bands[0].area, 6);
  });
});

describe("bands of a cone match annulus areas", () => {
  // value = distance from the centre: band [a, b) is the annulus π(b² − a²)
  const spacing = 0.5;
  const cols = 401;
  const centre = 100;
  const raster = rasterOf(cols, cols, 0, 0, spacing, (x, y) => Math.hypot(x - centre, y - centre));
  const bands = projectedBands(raster, [0, 20, 40, 70]);

  it("within 0.1 % of the closed form at a 0.5 spacing", () => {
    // computed: annulus area π(b² − a²). Discretisation: the chords between contour vertices cut
    // the circles and the cone is interpolated linearly between nodes; both errors are of order
    // (spacing / radius)², well under 0.1 % here (0.5 / 20 → 6e-4 at worst).
    expect(Math.abs(bands[0].area / (Math.PI * 20 ** 2) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(bands[1].area / (Math.PI * (40 ** 2 - 20 ** 2)) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(bands[2].area / (Math.PI * (70 ** 2 - 40 ** 2)) - 1)).toBeLessThan(1e-3);
  });

  it("tiles the raster: all bands together cover its full extent", () => {
    // computed invariant: bands share boundaries, so their areas sum to (cols × spacing)²
    const all = projectedBands(raster, [-Infinity, 20, 40, 70, Infinity]);
    const total = all.reduce((sum, band) => sum + band.area, 0);
    expect(total).toBeCloseTo((cols * spacing) ** 2, 6);
  });

  it("makes the inner annulus one polygon with one hole", () => {
    expect(bands[1].polygons.length).toBe(1);
    expect(bands[1].polygons[0].length).toBe(2);
  });
});

describe("winding order and lon/lat output (RFC 7946)", () => {
  // a cone around a point in a fictional basin, in NAD83 / UTM zone 17N metres
  const crs = createCrs("+proj=utm +zone=17 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs");
  const [centreX, centreY] = crs.fromLonLat(-82.1, 28.9);
  const raster = rasterOf(121, 121, centreX - 30, centreY - 30, 0.5, (x, y) => Math.hypot(x - centreX, y - centreY));
  const collection = contourBands(raster, [-Infinity, 5, 10, 20, Infinity], { crs });

  it("has exteriors counter-clockwise and holes clockwise in lon/lat", () => {
    expect(collection.features.length).toBe(4);
    for (const feature of collection.features) {
      for (const polygon of feature.geometry.coordinates) {
        expect(signedArea(polygon[0])).toBeGreaterThan(0);
        for (const hole of polygon.slice(1)) expect(signedArea(hole)).toBeLessThan(0);
      }
    }
    const annulus = collection.features[1];
    expect(annulus.properties).toEqual({ lower: 5, upper: 10 });
    expect(annulus.geometry.coordinates[0].length).toBe(2);
    expect(collection.features[0].properties).toEqual({ lower: null, upper: 5 });
    expect(collection.features[3].properties).toEqual({ lower: 20, upper: null });
  });

  it("puts the band around the right place on Earth", () => {
    // computed: the inner disc's ring lies about 5 m (≈ 4.5e-5° of latitude) from the centre
    const [lon, lat] = [-82.1, 28.9];
    const ring = collection.features[0].geometry.coordinates[0][0];
    for (const [ringLon, ringLat] of ring) {
      const northM = (ringLat - lat) * 110_860;
      const eastM = (ringLon - lon) * 111_320 * Math.cos((lat * Math.PI) / 180);
      expect(Math.abs(Math.hypot(northM, eastM) - 5)).toBeLessThan(0.1);
    }
  });
});

describe("no data and slivers", () => {
  it("draws no band over no-data nodes", () => {
    // computed: a 10 × 6 block of NaN nodes leaves a hole of (60 − 0.5) node squares (the contour
    // cuts each of its four corners by an eighth of a square); the raster's outer edge is kept whole
    const raster = rasterOf(40, 30, 0, 0, 1, () => 1);
    for (let row = 10; row < 16; row++) for (let col = 5; col < 15; col++) raster.values[row * 40 + col] = Number.NaN;
    const [all] = projectedBands(raster, [-Infinity, Infinity]);
    expect(all.area).toBeCloseTo(40 * 30 - (60 - 4 / 8), 9);
    expect(all.polygons[0].length).toBe(2);
  });

  it("drops slivers below the minimum area", () => {
    // computed: one node at 5 among nodes at 0 crosses 1 at 0.8 of a spacing from it on each of
    // its four edges: a diamond of 2 × 0.8² = 1.28 node squares
    const raster = rasterOf(20, 20, 0, 0, 1, () => 0);
    raster.values[10 * 20 + 10] = 5;
    expect(projectedBands(raster, [1, 10])[0].area).toBeCloseTo(1.28, 9);
    expect(projectedBands(raster, [1, 10], 1.3)[0].polygons.length).toBe(0);
  });
});

describe("default thresholds", () => {
  it("start the remaining-thickness bands at the firm-sand tolerance", () => {
    // published: 0.25 ft probe accuracy, USACE EM 1110-2-1003 table 3-1 (the default tolerance)
    expect(remainingThicknessThresholds("us-ft").slice(0, 2)).toEqual([-Infinity, 0.25]);
    expect(remainingThicknessThresholds("m")[1]).toBe(0.08);
    const depth = depthThresholds("ft");
    for (let i = 1; i < depth.length; i++) expect(depth[i]).toBeGreaterThan(depth[i - 1]);
  });
});
