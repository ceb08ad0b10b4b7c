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
}

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
  if (!Number.isFinite(minLon)) return { width, height: width / 2, project: () => [width / 2, width / 4] };
  const xScale = Math.cos((((minLat + maxLat) / 2) * Math.PI) / 180);
  const spanX = Math.max((maxLon - minLon) * xScale, 1e-12);
  const spanY = Math.max(maxLat - minLat, 1e-12);
  const scale = (width - 2 * margin) / spanX;
  const height = Math.round(spanY * scale + 2 * margin);
  return {
    width,
    height,
    project: (lon, lat) => [margin + (lon - minLon) * xScale * scale, margin + (maxLat - lat) * scale],
  };
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
