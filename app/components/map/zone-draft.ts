/**
 * The outline of a zone being drawn on the map, click by click: pure helpers the zone editor
 * uses (browser-safe, no MapLibre). Vertices are lon/lat, in the order clicked.
 */
export type LonLat = [number, number];

/** Fewest corners a zone can have. */
export const MIN_ZONE_VERTICES = 3;

/**
 * Whether a click at `point` (screen pixels) adds a vertex: a click within `minPixels` of the last
 * vertex does not, so the two clicks of a double-click that finishes the outline add one vertex.
 */
export function addsVertex(last: { x: number; y: number } | null, point: { x: number; y: number }, minPixels = 4): boolean {
  return last === null || Math.hypot(point.x - last.x, point.y - last.y) >= minPixels;
}

/** The drawn outline as a GeoJSON Polygon (lon/lat, RFC 7946): one ring, closed. */
export function draftPolygon(vertices: readonly LonLat[]): { type: "Polygon"; coordinates: LonLat[][] } {
  return { type: "Polygon", coordinates: [[...vertices.map((vertex) => [vertex[0], vertex[1]] as LonLat), [vertices[0][0], vertices[0][1]]]] };
}

/** What the map shows of the draft: the vertices, the outline so far (closed back to the first once there are three) and its fill. */
export function draftFeatures(vertices: readonly LonLat[]) {
  const features: Array<{ type: "Feature"; properties: Record<string, unknown>; geometry: unknown }> = vertices.map((vertex, index) => ({
    type: "Feature",
    properties: { vertex: index + 1 },
    geometry: { type: "Point", coordinates: vertex },
  }));
  if (vertices.length >= 2) {
    const closed = vertices.length >= MIN_ZONE_VERTICES ? [...vertices, vertices[0]] : [...vertices];
    features.push({ type: "Feature", properties: { outline: true }, geometry: { type: "LineString", coordinates: closed } });
  }
  if (vertices.length >= MIN_ZONE_VERTICES) features.push({ type: "Feature", properties: { fill: true }, geometry: draftPolygon(vertices) });
  return { type: "FeatureCollection" as const, features };
}
