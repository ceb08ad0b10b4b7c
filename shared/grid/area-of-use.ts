import type { LonLatBounds } from "../soundings/row-checks";

/**
 * How far (degrees) a work limit may reach past its CRS's published area of use: a site on a
 * zone's edge is often surveyed in the neighbouring zone (practice), but 0.5° (about 55 km of
 * latitude) beyond it means the wrong CRS or coordinates read in the wrong one.
 */
export const AREA_OF_USE_MARGIN_DEGREES = 0.5;

export interface VertexOutside {
  /** 1-based, as the work limit's other problems name them. */
  polygon: number;
  ring: number;
  vertex: number;
  lon: number;
  lat: number;
}

/**
 * The first vertex of `polygons` (lon/lat) lying more than `margin` degrees outside `area`, or
 * null when all are inside, or when the area is unknown or crosses the antimeridian (no check).
 */
export function firstVertexOutside(polygons: ReadonlyArray<ReadonlyArray<ReadonlyArray<readonly number[]>>>, area: LonLatBounds | null, margin = AREA_OF_USE_MARGIN_DEGREES): VertexOutside | null {
  if (!area || !(area.west < area.east) || !(area.south < area.north)) return null;
  for (const [polygonIndex, rings] of polygons.entries()) {
    for (const [ringIndex, ring] of rings.entries()) {
      for (const [vertexIndex, [lon, lat]] of ring.entries()) {
        if (lon < area.west - margin || lon > area.east + margin || lat < area.south - margin || lat > area.north + margin) {
          return { polygon: polygonIndex + 1, ring: ringIndex + 1, vertex: vertexIndex + 1, lon, lat };
        }
      }
    }
  }
  return null;
}

/** The area of use in words, e.g. "26.27°N to 29.60°N, 83.34°W to 81.13°W". */
export function describeArea(area: LonLatBounds): string {
  const lat = (value: number) => `${Math.abs(value).toFixed(2)}°${value >= 0 ? "N" : "S"}`;
  const lon = (value: number) => `${Math.abs(value).toFixed(2)}°${value >= 0 ? "E" : "W"}`;
  return `${lat(area.south)} to ${lat(area.north)}, ${lon(area.west)} to ${lon(area.east)}`;
}
