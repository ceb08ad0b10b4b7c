import { difference, featureCollection, intersect, multiPolygon } from "@turf/turf";
import type { MultiPolygon, Polygon } from "geojson";
import { isInsideWorkLimit, workLimitArea, type Position, type ProjectedMultiPolygon } from "./work-limit";

/**
 * How a zone sits against the work limit and the other zones, in projected coordinates (project
 * length unit). A zone is a part of the work limit: what lies outside it holds no cells and would
 * only mislead, so the setup service refuses a zone reaching outside by more than `tolerance`
 * square units (a sliver far smaller than a cell, so zones that share the limit's own vertices
 * pass whatever the rounding of their lon/lat). Overlapping zones are allowed, as the one rule of
 * membership gives a shared cell to the earlier zone; the page says so.
 *
 * The clipping runs on coordinates shifted to the limit's first vertex: state plane coordinates
 * run to millions of feet, which would cost the clipper digits a small zone needs.
 */

export interface ZoneOutside {
  /** Plan area of the zone outside the work limit, square project units; NaN when the clipper could not measure it. */
  areaOutside: number;
  /** The first vertex (1-based, as a person counts) lying outside by more than the tolerance's side; null when only an edge cuts across. */
  vertex: { polygon: number; ring: number; vertex: number } | null;
}

function shifted(polygons: ProjectedMultiPolygon, [originX, originY]: Position): Position[][][] {
  return polygons.map((polygon) =>
    polygon.map((ring) => {
      const moved = ring.map(([x, y]) => [x - originX, y - originY] as Position);
      const [firstX, firstY] = moved[0];
      const [lastX, lastY] = moved[moved.length - 1];
      if (firstX !== lastX || firstY !== lastY) moved.push([firstX, firstY]);
      return moved;
    }),
  );
}

function areaOf(geometry: Polygon | MultiPolygon | undefined | null): number {
  if (!geometry) return 0;
  return workLimitArea((geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates) as ProjectedMultiPolygon);
}

/** Shortest distance from a point to the limit's rings. */
function distanceToRings(limit: ProjectedMultiPolygon, [x, y]: Position): number {
  let best = Infinity;
  for (const polygon of limit) {
    for (const ring of polygon) {
      for (let current = 0, previous = ring.length - 1; current < ring.length; previous = current++) {
        const [x1, y1] = ring[previous];
        const [x2, y2] = ring[current];
        const dx = x2 - x1, dy = y2 - y1;
        const lengthSquared = dx * dx + dy * dy;
        const along = lengthSquared === 0 ? 0 : Math.max(0, Math.min(1, ((x - x1) * dx + (y - y1) * dy) / lengthSquared));
        best = Math.min(best, Math.hypot(x - (x1 + along * dx), y - (y1 + along * dy)));
      }
    }
  }
  return best;
}

/** Distance from a point to the segment a–b. */
function distanceToSegment([x, y]: Position, [x1, y1]: Position, [x2, y2]: Position): number {
  const dx = x2 - x1, dy = y2 - y1;
  const lengthSquared = dx * dx + dy * dy;
  const along = lengthSquared === 0 ? 0 : Math.max(0, Math.min(1, ((x - x1) * dx + (y - y1) * dy) / lengthSquared));
  return Math.hypot(x - (x1 + along * dx), y - (y1 + along * dy));
}

const cross = (a: Position, b: Position, c: Position) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);

function edgesOf(polygons: ProjectedMultiPolygon): Array<[Position, Position]> {
  const edges: Array<[Position, Position]> = [];
  for (const polygon of polygons) for (const ring of polygon) for (let index = 0; index + 1 < ring.length; index++) edges.push([ring[index], ring[index + 1]]);
  return edges;
}

/**
 * True when `zone` lies inside `limit` to within `slack` (a length), judged from the outlines
 * alone: every zone vertex inside the limit or within `slack` of its rings, no zone edge crossing
 * a limit edge (edges running along each other within `slack` do not count), and no limit vertex
 * inside the zone farther than `slack` from its rings (an island or a notch of the limit within
 * the zone). The polygon clipper misjudges a zone whose edges run along the limit's own within
 * rounding (a zone clipped to the limit, read back from lon/lat): it may then count the whole
 * zone as outside, or fail. This check stands beside it.
 */
export function liesInsideByOutline(zone: ProjectedMultiPolygon, limit: ProjectedMultiPolygon, slack: number): boolean {
  for (const polygon of zone) for (const ring of polygon) for (const vertex of ring) {
    if (!isInsideWorkLimit(limit, vertex[0], vertex[1]) && distanceToRings(limit, vertex) > slack) return false;
  }
  const limitEdges = edgesOf(limit);
  for (const [p, q] of edgesOf(zone)) {
    for (const [a, b] of limitEdges) {
      const d1 = cross(a, b, p), d2 = cross(a, b, q), d3 = cross(p, q, a), d4 = cross(p, q, b);
      const proper = ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0));
      if (!proper) continue;
      // Along each other within the slack: the zone's edge follows the limit's.
      if ((distanceToSegment(p, a, b) <= slack && distanceToSegment(q, a, b) <= slack) || (distanceToSegment(a, p, q) <= slack && distanceToSegment(b, p, q) <= slack)) continue;
      // Crossing within the slack of an end: a vertex on the limit's edge.
      if ([p, q].some((end) => distanceToSegment(end, a, b) <= slack) || [a, b].some((end) => distanceToSegment(end, p, q) <= slack)) continue;
      return false;
    }
  }
  for (const polygon of limit) for (const ring of polygon) for (const vertex of ring) {
    if (isInsideWorkLimit(zone, vertex[0], vertex[1]) && distanceToRings(zone, vertex) > slack) return false;
  }
  return true;
}

/** Where `zone` reaches outside `limit` by more than `tolerance` square units; null when it lies inside. */
export function zoneOutsideLimit(zone: ProjectedMultiPolygon, limit: ProjectedMultiPolygon, tolerance: number): ZoneOutside | null {
  const origin = limit[0]?.[0]?.[0] ?? [0, 0];
  // A vertex off the limit by more than the side of the tolerance's square is named; one on the
  // boundary (a shared vertex) is not.
  const slack = Math.sqrt(tolerance);
  let areaOutside: number;
  try {
    const outside = difference(featureCollection([multiPolygon(shifted(zone, origin)), multiPolygon(shifted(limit, origin))]));
    areaOutside = areaOf(outside?.geometry);
  } catch {
    areaOutside = Number.NaN; // the clipper failed: the outlines decide
  }
  if (areaOutside <= tolerance) return null;
  // Rounding of shared edges, far below the tolerance: a sliver along the whole outline stays under it.
  if (liesInsideByOutline(zone, limit, slack * 1e-3)) return null;
  for (let p = 0; p < zone.length; p++) {
    for (let r = 0; r < zone[p].length; r++) {
      const ring = zone[p][r];
      for (let v = 0; v < ring.length; v++) {
        const [x, y] = ring[v];
        if (!isInsideWorkLimit(limit, x, y) && distanceToRings(limit, ring[v]) > slack) return { areaOutside, vertex: { polygon: p + 1, ring: r + 1, vertex: v + 1 } };
      }
    }
  }
  return { areaOutside, vertex: null };
}

/** Plan area two zones share, square project units. */
export function zoneOverlapArea(first: ProjectedMultiPolygon, second: ProjectedMultiPolygon): number {
  const origin = first[0]?.[0]?.[0] ?? [0, 0];
  try {
    const shared = intersect(featureCollection([multiPolygon(shifted(first, origin)), multiPolygon(shifted(second, origin))]));
    return areaOf(shared?.geometry);
  } catch {
    return 0; // the clipper failed on outlines running along each other: no overlap is said
  }
}

/** The part of `zone` inside `limit` (an empty list when none), in the same coordinates. */
export function clipToLimit(zone: ProjectedMultiPolygon, limit: ProjectedMultiPolygon): ProjectedMultiPolygon {
  const origin = limit[0]?.[0]?.[0] ?? [0, 0];
  const inside = intersect(featureCollection([multiPolygon(shifted(zone, origin)), multiPolygon(shifted(limit, origin))]));
  if (!inside) return [];
  const polygons = inside.geometry.type === "Polygon" ? [inside.geometry.coordinates] : inside.geometry.coordinates;
  return polygons.map((rings) => rings.map((ring) => ring.map(([x, y]) => [x + origin[0], y + origin[1]] as Position)));
}
