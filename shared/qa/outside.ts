import type { Position } from "geojson";

/**
 * A work limit prepared for fast point-in-polygon tests over many soundings: every ring edge of
 * every polygon (exteriors and holes alike) in flat arrays, bucketed into horizontal slabs. A
 * point is inside when a ray to the east crosses an odd number of edges (even–odd rule), which
 * handles holes and multipolygons without telling rings apart, for valid (non-overlapping) polygons.
 */
export interface PreparedWorkLimit {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
  /** Edge e runs from (x0[e], y0[e]) to (x1[e], y1[e]). */
  x0: Float64Array;
  y0: Float64Array;
  x1: Float64Array;
  y1: Float64Array;
  slabHeight: number;
  slabCount: number;
  /** Edges of slab s are slabEdges[slabStart[s]] … slabEdges[slabStart[s + 1] − 1]. */
  slabStart: Uint32Array;
  slabEdges: Uint32Array;
}

/** Accepts a Polygon's or a MultiPolygon's coordinates in the project's projected CRS. */
export function prepareWorkLimit(coordinates: Position[][] | Position[][][]): PreparedWorkLimit {
  const polygons: Position[][][] =
    coordinates.length > 0 && typeof (coordinates as Position[][])[0][0]?.[0] === "number"
      ? [coordinates as Position[][]]
      : (coordinates as Position[][][]);
  const edges: number[] = [];
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const polygon of polygons) {
    for (const ring of polygon) {
      for (let i = 0; i < ring.length; i++) {
        const a = ring[i];
        const b = ring[(i + 1) % ring.length];
        if (a[0] < minX) minX = a[0];
        if (a[0] > maxX) maxX = a[0];
        if (a[1] < minY) minY = a[1];
        if (a[1] > maxY) maxY = a[1];
        if (a[1] !== b[1]) edges.push(a[0], a[1], b[0], b[1]); // horizontal edges never cross an eastward ray
      }
    }
  }
  const edgeCount = edges.length / 4;
  const x0 = new Float64Array(edgeCount), y0 = new Float64Array(edgeCount);
  const x1 = new Float64Array(edgeCount), y1 = new Float64Array(edgeCount);
  for (let e = 0; e < edgeCount; e++) {
    x0[e] = edges[4 * e]; y0[e] = edges[4 * e + 1]; x1[e] = edges[4 * e + 2]; y1[e] = edges[4 * e + 3];
  }
  const slabCount = Math.max(1, Math.min(4096, Math.ceil(Math.sqrt(edgeCount) * 2)));
  const slabHeight = edgeCount === 0 ? 1 : (maxY - minY) / slabCount || 1;
  const slabOf = (y: number) => Math.min(slabCount - 1, Math.max(0, Math.floor((y - minY) / slabHeight)));
  const counts = new Uint32Array(slabCount + 1);
  for (let e = 0; e < edgeCount; e++) {
    const from = slabOf(Math.min(y0[e], y1[e]));
    const to = slabOf(Math.max(y0[e], y1[e]));
    for (let s = from; s <= to; s++) counts[s + 1]++;
  }
  for (let s = 0; s < slabCount; s++) counts[s + 1] += counts[s];
  const slabStart = counts;
  const fill = slabStart.slice(0, slabCount);
  const slabEdges = new Uint32Array(slabStart[slabCount]);
  for (let e = 0; e < edgeCount; e++) {
    const from = slabOf(Math.min(y0[e], y1[e]));
    const to = slabOf(Math.max(y0[e], y1[e]));
    for (let s = from; s <= to; s++) slabEdges[fill[s]++] = e;
  }
  return { minX, minY, maxX, maxY, x0, y0, x1, y1, slabHeight, slabCount, slabStart, slabEdges };
}

/** `isInsideWorkLimit` (../grid/work-limit) for a prepared limit: the same even–odd rule, fast over many soundings. */
export function isInsidePreparedWorkLimit(limit: PreparedWorkLimit, x: number, y: number): boolean {
  if (!(x >= limit.minX && x <= limit.maxX && y >= limit.minY && y <= limit.maxY)) return false;
  const slab = Math.min(limit.slabCount - 1, Math.max(0, Math.floor((y - limit.minY) / limit.slabHeight)));
  const { x0, y0, x1, y1, slabEdges } = limit;
  let inside = false;
  for (let k = limit.slabStart[slab]; k < limit.slabStart[slab + 1]; k++) {
    const e = slabEdges[k];
    // Half-open in y so a vertex on the ray is counted once.
    if (y0[e] > y !== y1[e] > y) {
      const crossingX = x0[e] + ((y - y0[e]) * (x1[e] - x0[e])) / (y1[e] - y0[e]);
      if (x < crossingX) inside = !inside;
    }
  }
  return inside;
}

/** Indices of the soundings outside the work limit, in input order. */
export function soundingsOutsideWorkLimit(xs: Float64Array, ys: Float64Array, limit: PreparedWorkLimit): Uint32Array<ArrayBuffer> {
  const outside: number[] = [];
  for (let i = 0; i < xs.length; i++) if (!isInsidePreparedWorkLimit(limit, xs[i], ys[i])) outside.push(i);
  return Uint32Array.from(outside);
}
