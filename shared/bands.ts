import { contours } from "d3-contour";
import type { Feature, FeatureCollection, MultiPolygon, Position } from "geojson";
import type { Crs } from "./crs";
import type { Raster } from "./surface/raster";
import type { LengthUnit } from "./units";
import { defaultsFor } from "./units";

/**
 * The surfaces' raster (see ./surface/raster): node (col, row) is the centre of the pixel
 * [originX + col·spacing, originX + (col + 1)·spacing] × [originY + row·spacing, …], row 0 in the
 * south, value `values[row·cols + col]`, NaN for no data. Bands cover whole pixels at the raster's
 * outer edge, like the volumes (midpoint rule), and stop half-way between a node with data and one without.
 */
export type BandRaster = Pick<Raster, "values" | "cols" | "rows" | "originX" | "originY" | "spacing">;

export interface BandProperties {
  /** Inclusive lower bound; null for −∞. */
  lower: number | null;
  /** Exclusive upper bound; null for +∞. */
  upper: number | null;
}

export interface BandOptions {
  /** Converts projected coordinates to lon/lat; null keeps projected coordinates (for checks). */
  crs: Crs | null;
  /** Polygons and holes smaller than this (square project units) are dropped as slivers. */
  minArea?: number;
}

/** One band in projected coordinates: polygons of closed rings, exterior first, then holes. */
export interface ProjectedBand {
  lower: number;
  upper: number;
  polygons: Position[][][];
  /** Planar area of the band in square project units (exteriors minus holes). */
  area: number;
}

/**
 * Remaining-thickness bands: below the firm-sand tolerance (done), then steps a crew can act on.
 * The tolerance comes from the units defaults (0.25 ft / 0.08 m); the other steps are practice.
 */
export function remainingThicknessThresholds(unit: LengthUnit): number[] {
  const { tolerance } = defaultsFor(unit);
  const steps = unit === "m" ? [0.15, 0.3, 0.6, 0.9, 1.2, 1.8] : [0.5, 1, 2, 3, 4, 6];
  return [-Infinity, tolerance, ...steps, Infinity];
}

/** Bottom-depth bands (depth positive down), in the project's unit; steps are practice. */
export function depthThresholds(unit: LengthUnit): number[] {
  const steps =
    unit === "m" ? [0, 0.5, 1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10] : [0, 2, 4, 6, 8, 10, 12, 15, 20, 25, 30];
  return [-Infinity, ...steps, Infinity];
}

function signedArea(ring: Position[]): number {
  // Shoelace over a closed ring; positive when counter-clockwise (x east, y north).
  let twiceArea = 0;
  for (let i = 0; i + 1 < ring.length; i++) {
    twiceArea += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  }
  return twiceArea / 2;
}

/**
 * Sutherland–Hodgman clipping of a closed ring to an axis-aligned rectangle. Used only to trim
 * the one-pixel pad, where the ring's outside parts mirror the border row, so no part of a band
 * is joined to another through the pad.
 */
function clipToRectangle(ring: Position[], minX: number, minY: number, maxX: number, maxY: number): Position[] {
  let points = ring.slice(0, ring.length - 1); // open ring
  const edges: Array<[(p: Position) => boolean, (a: Position, b: Position) => Position]> = [
    [(p) => p[0] >= minX, (a, b) => [minX, a[1] + ((b[1] - a[1]) * (minX - a[0])) / (b[0] - a[0])]],
    [(p) => p[0] <= maxX, (a, b) => [maxX, a[1] + ((b[1] - a[1]) * (maxX - a[0])) / (b[0] - a[0])]],
    [(p) => p[1] >= minY, (a, b) => [a[0] + ((b[0] - a[0]) * (minY - a[1])) / (b[1] - a[1]), minY]],
    [(p) => p[1] <= maxY, (a, b) => [a[0] + ((b[0] - a[0]) * (maxY - a[1])) / (b[1] - a[1]), maxY]],
  ];
  for (const [inside, intersect] of edges) {
    if (points.length === 0) break;
    const output: Position[] = [];
    for (let i = 0; i < points.length; i++) {
      const current = points[i];
      const previous = points[(i + points.length - 1) % points.length];
      const currentInside = inside(current);
      if (currentInside !== inside(previous)) output.push(intersect(previous, current));
      if (currentInside) output.push(current);
    }
    points = output;
  }
  if (points.length > 0) points.push(points[0]);
  return points;
}

function orient(ring: Position[], counterClockwise: boolean): Position[] {
  return signedArea(ring) > 0 === counterClockwise ? ring : ring.slice().reverse();
}

/**
 * Bands [t_i, t_{i+1}) for each consecutive pair of thresholds, in projected coordinates.
 *
 * d3-contour returns nested "value ≥ threshold" polygons, not bands. Each band is instead traced
 * as the single contour of an in-band indicator (cheap: no polygon boolean operations), without
 * d3's smoothing; its vertices sit on the edges between two nodes, one in the band and one out,
 * and are then placed by linear interpolation at whichever threshold the outside node lies
 * across (lower or upper). Neighbouring bands therefore share their boundaries exactly.
 * A band narrower than the change between two neighbouring nodes can vanish there: it is a sliver.
 *
 * d3-contour works in grid-index space where value (i, j) is the pixel [i, i+1]×[j, j+1] with its
 * centre at (i + 0.5, j + 0.5) — the same layout as our raster, so x = originX + gx·spacing, or
 * originX + (gx − 1)·spacing in the padded grid.
 */
export function projectedBands(
  raster: BandRaster,
  thresholds: readonly number[],
  minArea = 0,
): ProjectedBand[] {
  const { values, cols, rows, originX, originY, spacing } = raster;
  if (values.length !== cols * rows) {
    throw new Error(`Raster holds ${values.length} values, expected ${cols}×${rows}`);
  }
  for (let i = 1; i < thresholds.length; i++) {
    if (!(thresholds[i] > thresholds[i - 1])) throw new Error("Band thresholds must increase");
  }
  const bands: ProjectedBand[] = [];
  if (cols === 0 || rows === 0) return bands;
  // Pad by one node on every side with the border values repeated: marching squares cuts the
  // corners where a band meets the raster's edge, and the cut then falls in the pad, which is
  // clipped away below. The band then ends exactly at the outer pixel edge.
  const paddedCols = cols + 2;
  const paddedRows = rows + 2;
  const grid = new Float64Array(paddedCols * paddedRows);
  for (let row = 0; row < paddedRows; row++) {
    const sourceRow = Math.min(rows - 1, Math.max(0, row - 1));
    for (let col = 0; col < paddedCols; col++) {
      const sourceCol = Math.min(cols - 1, Math.max(0, col - 1));
      grid[row * paddedCols + col] = values[sourceRow * cols + sourceCol];
    }
  }
  const generator = contours().size([paddedCols, paddedRows]).smooth(false);
  const inBand = new Uint8Array(grid.length);

  for (let b = 0; b + 1 < thresholds.length; b++) {
    const lower = thresholds[b];
    const upper = thresholds[b + 1];
    let any = false;
    for (let k = 0; k < grid.length; k++) {
      const value = grid[k];
      const inside = value >= lower && value < upper; // false for NaN
      inBand[k] = inside ? 1 : 0;
      any ||= inside;
    }
    if (!any) {
      bands.push({ lower, upper, polygons: [], area: 0 });
      continue;
    }

    // Grid-index position of a crossing on the edge between node a and node b (b = a + 1 along
    // the axis), given the edge midpoint m (integer); one of the two nodes is in the band.
    const place = (midpoint: number, valueA: number, valueB: number): number => {
      const aInside = valueA >= lower && valueA < upper;
      const outsideValue = aInside ? valueB : valueA;
      if (Number.isNaN(outsideValue)) return midpoint; // no data: stop at the pixel edge
      const level = outsideValue < lower ? lower : upper;
      const t = (level - valueA) / (valueB - valueA);
      return midpoint - 0.5 + Math.min(1, Math.max(0, t));
    };

    const multi = generator.contour(inBand as unknown as number[], 0.5);
    const polygons: Position[][][] = [];
    let bandArea = 0;
    for (const polygon of multi.coordinates) {
      const rings: Position[][] = [];
      for (let r = 0; r < polygon.length; r++) {
        const gridRing: Position[] = [];
        for (const point of polygon[r]) {
          let gx = point[0];
          let gy = point[1];
          if (Number.isInteger(gx) && gx > 0 && gx < paddedCols) {
            const row = Math.floor(gy);
            gx = place(gx, grid[row * paddedCols + gx - 1], grid[row * paddedCols + gx]);
          } else if (Number.isInteger(gy) && gy > 0 && gy < paddedRows) {
            const col = Math.floor(gx);
            gy = place(gy, grid[(gy - 1) * paddedCols + col], grid[gy * paddedCols + col]);
          }
          gridRing.push([gx, gy]);
        }
        // Padded pixel (1, 1) is the raster's node (0, 0): keep [1, cols + 1] × [1, rows + 1].
        const clipped = clipToRectangle(gridRing, 1, 1, cols + 1, rows + 1);
        const ring: Position[] = [];
        for (const [gx, gy] of clipped) {
          const x = originX + (gx - 1) * spacing;
          const y = originY + (gy - 1) * spacing;
          const last = ring[ring.length - 1];
          if (!last || last[0] !== x || last[1] !== y) ring.push([x, y]);
        }
        if (ring.length > 0) {
          const first = ring[0];
          const last = ring[ring.length - 1];
          if (first[0] !== last[0] || first[1] !== last[1]) ring.push([first[0], first[1]]);
        }
        const area = ring.length < 4 ? 0 : Math.abs(signedArea(ring));
        if (area === 0 || area < minArea) {
          if (r === 0) break; // the exterior is a sliver: drop the whole polygon
          continue; // a sliver hole is filled
        }
        // RFC 7946: exterior rings counter-clockwise, holes clockwise.
        rings.push(orient(ring, r === 0));
        bandArea += r === 0 ? area : -area;
      }
      if (rings.length > 0) polygons.push(rings);
    }
    bands.push({ lower, upper, polygons, area: bandArea });
  }
  return bands;
}

/**
 * Filled contour bands as a GeoJSON FeatureCollection, one MultiPolygon feature per non-empty band,
 * in lon/lat (RFC 7946) when a Crs is given.
 */
export function contourBands(
  raster: BandRaster,
  thresholds: readonly number[],
  options: BandOptions,
): FeatureCollection<MultiPolygon, BandProperties> {
  const bands = projectedBands(raster, thresholds, options.minArea ?? 0);
  const features: Feature<MultiPolygon, BandProperties>[] = [];
  for (const band of bands) {
    if (band.polygons.length === 0) continue;
    const coordinates = options.crs ? band.polygons.map((polygon) => polygon.map((ring) => toLonLatRing(ring, options.crs!))) : band.polygons;
    features.push({
      type: "Feature",
      geometry: { type: "MultiPolygon", coordinates },
      properties: {
        lower: Number.isFinite(band.lower) ? band.lower : null,
        upper: Number.isFinite(band.upper) ? band.upper : null,
      },
    });
  }
  return { type: "FeatureCollection", features };
}

function toLonLatRing(ring: Position[], crs: Crs): Position[] {
  const flat = new Float64Array(ring.length * 2);
  for (let i = 0; i < ring.length; i++) {
    flat[2 * i] = ring[i][0];
    flat[2 * i + 1] = ring[i][1];
  }
  const lonLat = crs.toLonLatArray(flat);
  const out: Position[] = new Array(ring.length);
  for (let i = 0; i < ring.length; i++) out[i] = [lonLat[2 * i], lonLat[2 * i + 1]];
  return out;
}
