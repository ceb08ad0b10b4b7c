/**
 * The permitted work limit in projected coordinates (project length unit): a multipolygon, each
 * polygon an outer ring followed by its holes, each ring a list of [easting, northing] positions
 * (closed or not). Islands and exclusion areas are holes; separate basins are separate polygons.
 * Inside means inside by the even-odd rule over all rings, which is the usual meaning for valid
 * RFC 7946 geometry.
 */
export type Position = [number, number];
export type Ring = Position[];
export type ProjectedPolygon = Ring[];
export type ProjectedMultiPolygon = ProjectedPolygon[];

export interface Bounds {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

export function workLimitBounds(limit: ProjectedMultiPolygon): Bounds {
  const bounds = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  for (const polygon of limit) {
    for (const ring of polygon) {
      for (const [easting, northing] of ring) {
        if (easting < bounds.minX) bounds.minX = easting;
        if (easting > bounds.maxX) bounds.maxX = easting;
        if (northing < bounds.minY) bounds.minY = northing;
        if (northing > bounds.maxY) bounds.maxY = northing;
      }
    }
  }
  return bounds;
}

/** Even-odd point in polygon over every ring of every polygon. */
export function isInsideWorkLimit(limit: ProjectedMultiPolygon, easting: number, northing: number): boolean {
  let inside = false;
  for (const polygon of limit) {
    for (const ring of polygon) {
      const count = ring.length;
      for (let current = 0, previous = count - 1; current < count; previous = current++) {
        const [x1, y1] = ring[current];
        const [x2, y2] = ring[previous];
        if (y1 > northing !== y2 > northing && easting < ((x2 - x1) * (northing - y1)) / (y2 - y1) + x1) inside = !inside;
      }
    }
  }
  return inside;
}

/**
 * Plan area in square project units (shoelace; outer rings minus holes, whatever their winding;
 * rings closed or not). In a conformal projection near its origin (state plane, UTM) this is the
 * ground area to the square of the scale factor: within 0.02 % over a state plane zone's usual extent.
 */
export function workLimitArea(limit: ProjectedMultiPolygon): number {
  let total = 0;
  for (const polygon of limit) {
    polygon.forEach((ring, ringIndex) => {
      // Relative to the ring's first vertex: state plane coordinates run to millions of feet,
      // and their products would swamp a small ring's area.
      const [originX, originY] = ring[0] ?? [0, 0];
      let twiceArea = 0;
      for (let current = 0, previous = ring.length - 1; current < ring.length; previous = current++) {
        twiceArea += (ring[previous][0] - originX) * (ring[current][1] - originY) - (ring[current][0] - originX) * (ring[previous][1] - originY);
      }
      total += ringIndex === 0 ? Math.abs(twiceArea) / 2 : -Math.abs(twiceArea) / 2;
    });
  }
  return total;
}
