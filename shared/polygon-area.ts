import type { Position } from "geojson";

/**
 * Planar area of a Polygon's or MultiPolygon's coordinates in a projected CRS, in square project
 * units: exteriors minus holes by the shoelace formula, whatever their winding. In a conformal
 * projection near its origin (state plane, UTM) this is the ground area to the square of the
 * scale factor — within 0.02 % for a state plane zone's usual extent.
 */
export function planarPolygonArea(coordinates: Position[][] | Position[][][]): number {
  const polygons: Position[][][] =
    coordinates.length > 0 && typeof (coordinates as Position[][])[0][0]?.[0] === "number"
      ? [coordinates as Position[][]]
      : (coordinates as Position[][][]);
  let area = 0;
  for (const polygon of polygons) {
    polygon.forEach((ring, r) => {
      const ringArea = Math.abs(planarRingSignedArea(ring));
      area += r === 0 ? ringArea : -ringArea;
    });
  }
  return area;
}

/** Signed shoelace area of a ring (closed or not): positive counter-clockwise. */
export function planarRingSignedArea(ring: Position[]): number {
  let twiceArea = 0;
  // Relative to the first vertex, so large state plane coordinates lose no precision.
  const [originX, originY] = ring[0] ?? [0, 0];
  for (let i = 0; i < ring.length; i++) {
    const a = ring[i];
    const b = ring[(i + 1) % ring.length];
    twiceArea += (a[0] - originX) * (b[1] - originY) - (b[0] - originX) * (a[1] - originY);
  }
  return twiceArea / 2;
}
