/**
 * Lon/lat polygons drawn as SVG paths, for small server-rendered maps that need no map library.
 * An equirectangular view scaled by the cosine of the middle latitude keeps shapes true at the
 * size of a restoration site (a few hundred metres), which is all these maps show.
 */
export type LonLatRing = ReadonlyArray<readonly [number, number]>;

export interface OutlineFrame {
  width: number;
  height: number;
  /** Lon/lat → SVG user units (y down). */
  project: (lon: number, lat: number) => [number, number];
  /** Ground metres per SVG user unit (null for an empty frame): what a scale bar needs. */
  metresPerUnit: number | null;
}

/** Metres in one degree of latitude on a sphere of the mean Earth radius (IUGG R1 = 6,371,008.8 m): 2πR/360. */
export const METRES_PER_DEGREE = (2 * Math.PI * 6_371_008.8) / 360;

/** A frame that fits every ring into `width` (and the height that keeps the aspect) with `margin` around. */
export function fitOutlineFrame(rings: readonly LonLatRing[], width: number, margin: number): OutlineFrame {
  let minLon = Infinity;
  let maxLon = -Infinity;
  let minLat = Infinity;
  let maxLat = -Infinity;
  for (const ring of rings) {
    for (const [lon, lat] of ring) {
      if (lon < minLon) minLon = lon;
      if (lon > maxLon) maxLon = lon;
      if (lat < minLat) minLat = lat;
      if (lat > maxLat) maxLat = lat;
    }
  }
  if (!Number.isFinite(minLon)) return { width, height: width / 2, project: () => [width / 2, width / 4], metresPerUnit: null };
  const xScale = Math.cos((((minLat + maxLat) / 2) * Math.PI) / 180);
  const spanX = Math.max((maxLon - minLon) * xScale, 1e-12);
  const spanY = Math.max(maxLat - minLat, 1e-12);
  const scale = (width - 2 * margin) / spanX;
  const height = Math.round(spanY * scale + 2 * margin);
  return {
    width,
    height,
    project: (lon, lat) => [margin + (lon - minLon) * xScale * scale, margin + (maxLat - lat) * scale],
    metresPerUnit: METRES_PER_DEGREE / scale,
  };
}

const METRES_PER_FOOT = 0.3048;

/**
 * A scale bar for a frame: the longest "round" length (1, 2 or 5 × a power of ten, in feet or
 * metres) that fits in `maxUnits` SVG units, and its length in those units. Null for an empty frame.
 */
export function scaleBar(frame: OutlineFrame, maxUnits: number, unit: "ft" | "m"): { length: number; label: string; units: number } | null {
  if (frame.metresPerUnit === null || !(maxUnits > 0)) return null;
  const metresPerLabelUnit = unit === "ft" ? METRES_PER_FOOT : 1;
  const most = (maxUnits * frame.metresPerUnit) / metresPerLabelUnit;
  const power = 10 ** Math.floor(Math.log10(most));
  const length = [5, 2, 1].map((step) => step * power).find((candidate) => candidate <= most) ?? power;
  const label = unit === "m" && length >= 1000 ? `${length / 1000} km` : unit === "ft" && length >= 5280 && length % 5280 === 0 ? `${length / 5280} mi` : `${length.toLocaleString("en-US")} ${unit}`;
  return { length, label, units: (length * metresPerLabelUnit) / frame.metresPerUnit };
}

/**
 * One path for a polygon's rings (holes included; draw with fill-rule evenodd). Whole user units:
 * a pixel at the 1000-unit width the maps use, and no decimals that could pass for coordinates.
 */
export function ringsPath(frame: OutlineFrame, rings: readonly LonLatRing[]): string {
  return rings
    .map((ring) => ring.map(([lon, lat], index) => {
      const [x, y] = frame.project(lon, lat);
      return `${index === 0 ? "M" : "L"}${Math.round(x)} ${Math.round(y)}`;
    }).join("") + "Z")
    .join("");
}

/**
 * Polygons thinned to about `maxVertices` in all by keeping every k-th vertex of each ring (its
 * first and closing vertex always kept; a ring too small to thin is kept whole). For a context
 * outline drawn a few hundred pixels wide: a shoreline of 10,000 vertices need not travel whole.
 */
export function thinPolygons<T extends readonly [number, number]>(polygons: ReadonlyArray<ReadonlyArray<ReadonlyArray<T>>>, maxVertices: number): T[][][] {
  const total = polygons.reduce((sum, polygon) => sum + polygon.reduce((ringSum, ring) => ringSum + ring.length, 0), 0);
  const stride = Math.max(1, Math.ceil(total / Math.max(1, maxVertices)));
  return polygons.map((polygon) => polygon.map((ring) => {
    if (stride === 1 || ring.length < 4 * stride) return [...ring];
    const kept = ring.filter((_, index) => index % stride === 0 && index < ring.length - 1);
    kept.push(ring[ring.length - 1]);
    return kept;
  }));
}
