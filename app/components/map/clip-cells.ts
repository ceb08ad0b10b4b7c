import { bboxClip, featureCollection, intersect } from "@turf/turf";
import type { Feature, MultiPolygon, Polygon, Position } from "geojson";
import { toGridFrame, type CellGrid } from "../../../shared/grid/cell-grid";
import type { Crs } from "../../../shared/crs";

/** The project's work limit as stored: lon/lat (RFC 7946). */
export type LonLatWorkLimit = Polygon | MultiPolygon;

/**
 * Cells along the work limit: every in-grid cell that a work-limit ring (outer or hole) passes
 * through or touches. The rings are walked in the grid's own frame (cell units), each segment cut
 * into pieces no longer than one cell along either axis, and every cell under a piece's bounding
 * box is marked — a superset of the cells the line crosses, at most one cell wider, and linear in
 * the outline's length. A cell not marked lies wholly inside or wholly outside the limit.
 *
 * Returns one flag per grid index (row-major, as the cells payload).
 */
export function edgeCellMask(grid: CellGrid, crs: Crs, workLimit: LonLatWorkLimit): Uint8Array {
  const mask = new Uint8Array(grid.cols * grid.rows);
  const polygons = workLimit.type === "Polygon" ? [workLimit.coordinates] : workLimit.coordinates;
  const mark = (col: number, row: number) => {
    if (col >= 0 && col < grid.cols && row >= 0 && row < grid.rows) mask[row * grid.cols + col] = 1;
  };
  for (const rings of polygons) {
    for (const ring of rings) {
      const cellUnits = ring.map(([lon, lat]) => {
        const [easting, northing] = crs.fromLonLat(lon, lat);
        const [u, v] = toGridFrame(grid, easting, northing);
        return [u / grid.cellSize - grid.firstCol, v / grid.cellSize - grid.firstRow] as const;
      });
      for (let index = 0; index + 1 < cellUnits.length; index++) {
        const [u0, v0] = cellUnits[index];
        const [u1, v1] = cellUnits[index + 1];
        const pieces = Math.max(1, Math.ceil(Math.max(Math.abs(u1 - u0), Math.abs(v1 - v0))));
        for (let piece = 0; piece < pieces; piece++) {
          const t0 = piece / pieces, t1 = (piece + 1) / pieces;
          const ua = u0 + (u1 - u0) * t0, va = v0 + (v1 - v0) * t0;
          const ub = u0 + (u1 - u0) * t1, vb = v0 + (v1 - v0) * t1;
          // A line on a cell edge touches the cells on both sides: widen by a hair so both are marked.
          const colFrom = Math.floor(Math.min(ua, ub) - 1e-9), colTo = Math.floor(Math.max(ua, ub) + 1e-9);
          const rowFrom = Math.floor(Math.min(va, vb) - 1e-9), rowTo = Math.floor(Math.max(va, vb) + 1e-9);
          for (let row = rowFrom; row <= rowTo; row++) for (let col = colFrom; col <= colTo; col++) mark(col, row);
        }
      }
    }
  }
  return mask;
}

function bboxOf(ring: Position[]): [number, number, number, number] {
  let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
  for (const [lon, lat] of ring) {
    if (lon < west) west = lon;
    if (lon > east) east = lon;
    if (lat < south) south = lat;
    if (lat > north) north = lat;
  }
  return [west, south, east, north];
}

const cross = (a: Position, b: Position, c: Position) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);

/** True when segments p1p2 and q1q2 cross at a single interior point (touching does not count). */
function segmentsCross(p1: Position, p2: Position, q1: Position, q2: Position): boolean {
  const d1 = cross(q1, q2, p1), d2 = cross(q1, q2, p2), d3 = cross(p1, p2, q1), d4 = cross(p1, p2, q2);
  return ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0));
}

/** How often a ring's edges cross the edges of a (closed) quadrilateral. */
function crossings(ring: Position[], quad: Position[]): number {
  let count = 0;
  for (let index = 0; index + 1 < ring.length; index++) {
    for (let side = 0; side < 4; side++) if (segmentsCross(ring[index], ring[index + 1], quad[side], quad[side + 1])) count++;
  }
  return count;
}

/**
 * Sutherland–Hodgman: a ring clipped by a convex quadrilateral (closed ring, either orientation).
 * Exact while the part inside is connected, which the caller checks first.
 */
function clipRingByConvexQuad(ring: Position[], quad: Position[]): Position[] {
  const orientation = Math.sign(cross(quad[0], quad[1], quad[2])) || 1;
  let output = ring.slice(0, -1);
  for (let side = 0; side < 4 && output.length > 0; side++) {
    const a = quad[side], b = quad[side + 1];
    const inside = (point: Position) => cross(a, b, point) * orientation >= 0;
    const input = output;
    output = [];
    for (let index = 0; index < input.length; index++) {
      const current = input[index], previous = input[(index + input.length - 1) % input.length];
      const currentIn = inside(current), previousIn = inside(previous);
      if (currentIn !== previousIn) {
        // Where previous→current meets the side's line.
        const dPrevious = cross(a, b, previous), dCurrent = cross(a, b, current);
        const t = dPrevious / (dPrevious - dCurrent);
        output.push([previous[0] + (current[0] - previous[0]) * t, previous[1] + (current[1] - previous[1]) * t]);
      }
      if (currentIn) output.push(current);
    }
  }
  if (output.length < 3) return [];
  output.push(output[0]);
  return output;
}

function pointInConvexQuad(point: Position, quad: Position[]): boolean {
  const orientation = Math.sign(cross(quad[0], quad[1], quad[2])) || 1;
  for (let side = 0; side < 4; side++) if (cross(quad[side], quad[side + 1], point) * orientation <= 0) return false;
  return true;
}

/**
 * Clips the drawn outline of each cell along the work limit to the part inside it, so the map
 * draws what the cell's figures count. Only edge cells (edgeCellMask) pay for it: the limit is
 * first cut to the cell's bounding box (linear in the limit's vertices). Where the outline enters
 * and leaves the cell once (nearly every edge cell), the piece is the limit clipped by the cell
 * (Sutherland–Hodgman, exact for one connected piece); anything else (an island, a second part,
 * an inlet that cuts the cell in two) goes through turf's polygon intersection. Features are
 * changed in place (their ids are grid indices); a cell whose clip comes out empty keeps its
 * square. Returns how many cells were clipped.
 */
export function clipEdgeCells<P>(features: Array<Feature<Polygon | MultiPolygon, P>>, grid: CellGrid, crs: Crs, workLimit: LonLatWorkLimit): number {
  const mask = edgeCellMask(grid, crs, workLimit);
  const limit: Feature<LonLatWorkLimit> = { type: "Feature", properties: {}, geometry: workLimit };
  let clipped = 0;
  for (const feature of features) {
    if (typeof feature.id !== "number" || mask[feature.id] !== 1 || feature.geometry.type !== "Polygon") continue;
    const square = feature.geometry;
    const [west, south, east, north] = bboxOf(square.coordinates[0]);
    // A hair beyond the cell, so a limit edge along the cell's side is kept whole.
    const padLon = (east - west) * 0.01, padLat = (north - south) * 0.01;
    const cut = bboxClip(limit, [west - padLon, south - padLat, east + padLon, north + padLat]).geometry as Polygon | MultiPolygon;
    // Parts of the limit away from the cell come back as empty rings: drop them.
    const parts = (cut.type === "Polygon" ? [cut.coordinates] : cut.coordinates)
      .filter((rings) => rings.length > 0 && rings[0].length >= 4)
      .map((rings) => rings.filter((ring) => ring.length >= 4));
    if (parts.length === 0) continue;
    const quad = square.coordinates[0];
    if (parts.length === 1 && parts[0].length === 1) {
      const ring = parts[0][0];
      const count = crossings(ring, quad);
      if (count === 0 && !ring.some((point) => pointInConvexQuad(point, quad))) continue; // wholly inside: the square stands
      if (count === 2) {
        const piece = clipRingByConvexQuad(ring, quad);
        if (piece.length >= 4) {
          feature.geometry = { type: "Polygon", coordinates: [piece] };
          clipped++;
        }
        continue;
      }
    }
    const near: MultiPolygon = { type: "MultiPolygon", coordinates: parts };
    const inside = intersect(featureCollection<Polygon | MultiPolygon>([{ type: "Feature", properties: {}, geometry: square }, { type: "Feature", properties: {}, geometry: near }]));
    if (!inside) continue;
    feature.geometry = inside.geometry;
    clipped++;
  }
  return clipped;
}

/** West-south and east-north corners of the work limit (lon/lat), framed before the cells arrive. */
export function workLimitExtent(workLimit: LonLatWorkLimit | null): [[number, number], [number, number]] | null {
  if (!workLimit) return null;
  let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
  const polygons = workLimit.type === "Polygon" ? [workLimit.coordinates] : workLimit.coordinates;
  for (const polygon of polygons) for (const [lon, lat] of polygon[0] ?? []) {
    west = Math.min(west, lon); east = Math.max(east, lon); south = Math.min(south, lat); north = Math.max(north, lat);
  }
  return Number.isFinite(west) ? [[west, south], [east, north]] : null;
}
