import { kinks } from "@turf/turf";
import type { Feature, FeatureCollection, MultiPolygon, Polygon, Position } from "geojson";
import { z } from "zod";

/**
 * Checks of the optional shoreline a manager uploads for the map's water layer: GeoJSON polygons
 * in lon/lat (WGS 84, RFC 7946), closed rings, no self-crossings, near the project's work limit.
 * Pure (no database), so it is unit-tested directly; the model stores what it returns.
 */

/** Largest file accepted (bytes). The map draws it on every visit, so it stays a base layer. */
export const SHORELINE_MAX_BYTES = 2 * 1024 * 1024;
/** Most vertices accepted over all rings (the self-crossing check grows with their square). */
export const SHORELINE_MAX_VERTICES = 10_000;
/** How far (km) the shoreline may lie from the work limit's bounding box and still be this water body. */
export const SHORELINE_MAX_DISTANCE_KM = 10;

const position = z
  .array(z.number({ error: "a coordinate must be a number" }).finite())
  .min(2, "a position needs a longitude and a latitude")
  .max(3, "a position has longitude, latitude and at most an elevation")
  .refine(([lon, lat]) => lon >= -180 && lon <= 180 && lat >= -90 && lat <= 90, "longitude must lie within ±180 and latitude within ±90 (lon/lat in WGS 84; projected coordinates are not accepted)");
const ring = z.array(position);
const polygon = z.object({ type: z.literal("Polygon"), coordinates: z.array(ring).min(1, "a polygon needs an outer ring") });
const multiPolygon = z.object({ type: z.literal("MultiPolygon"), coordinates: z.array(z.array(ring).min(1, "a polygon needs an outer ring")).min(1, "a multipolygon needs a polygon") });
const geometry = z.discriminatedUnion("type", [polygon, multiPolygon], { error: "the geometry must be a Polygon or a MultiPolygon" });
const feature = z.object({ type: z.literal("Feature"), geometry, properties: z.unknown().optional() });
const collectionSchema = z.object({ type: z.literal("FeatureCollection"), features: z.array(feature).min(1, "the collection holds no features") });
/** The schema for the document's own `type`, so an error names the part that is wrong. */
const schemaFor = (type: unknown) =>
  type === "FeatureCollection" ? collectionSchema : type === "Feature" ? feature : type === "Polygon" || type === "MultiPolygon" ? geometry : null;

export type ShorelineCollection = FeatureCollection<Polygon | MultiPolygon, Record<string, never>>;
export type LonLatLimit = Polygon | MultiPolygon;

export type ShorelineCheck = { ok: true; collection: ShorelineCollection; vertices: number; polygons: number } | { ok: false; error: string };

function fail(error: string): ShorelineCheck {
  return { ok: false, error };
}

function samePosition(a: Position, b: Position): boolean {
  return a[0] === b[0] && a[1] === b[1];
}

function bbox(coordinates: Position[][][]): [number, number, number, number] {
  let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
  for (const polygonRings of coordinates) for (const ringPositions of polygonRings) for (const [lon, lat] of ringPositions) {
    if (lon < west) west = lon;
    if (lon > east) east = lon;
    if (lat < south) south = lat;
    if (lat > north) north = lat;
  }
  return [west, south, east, north];
}

/** The polygons of a Polygon or MultiPolygon as one list. */
function polygonsOf(geometryValue: LonLatLimit): Position[][][] {
  return geometryValue.type === "Polygon" ? [geometryValue.coordinates] : geometryValue.coordinates;
}

/**
 * Parses and checks an uploaded shoreline. `workLimit` is the project's work limit in lon/lat
 * (null when none is set: then only the shape rules apply). Returns a plain FeatureCollection
 * without the file's properties (nothing but the outline is kept).
 */
export function checkShoreline(text: string, workLimit: LonLatLimit | null): ShorelineCheck {
  if (new TextEncoder().encode(text).length > SHORELINE_MAX_BYTES) return fail(`The file is larger than ${SHORELINE_MAX_BYTES / 1024 / 1024} MB; simplify the shoreline first.`);
  if (text.trim() === "") return fail("The file is empty.");
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return fail(`The file is not JSON: ${(error as Error).message}.`);
  }
  const schema = schemaFor((json as { type?: unknown } | null)?.type);
  if (!schema) return fail("The file is not a shoreline GeoJSON: expected a Polygon, a MultiPolygon, a Feature of one, or a FeatureCollection of them.");
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const where = issue.path.length > 0 ? ` (at ${issue.path.join(".")})` : "";
    return fail(`The file is not a shoreline GeoJSON${where}: ${issue.message}.`);
  }
  const value = parsed.data as z.infer<typeof collectionSchema> | z.infer<typeof feature> | z.infer<typeof geometry>;
  const geometries: Array<{ geometry: LonLatLimit; name: string }> =
    value.type === "FeatureCollection"
      ? value.features.map((item, index) => ({ geometry: item.geometry as LonLatLimit, name: `feature ${index + 1}` }))
      : value.type === "Feature"
        ? [{ geometry: value.geometry as LonLatLimit, name: "the feature" }]
        : [{ geometry: value as LonLatLimit, name: "the geometry" }];

  let vertices = 0;
  let polygons = 0;
  for (const { geometry: shape, name } of geometries) {
    for (const [polygonIndex, rings] of polygonsOf(shape).entries()) {
      polygons++;
      for (const [ringIndex, positions] of rings.entries()) {
        const ringName = `${name}, polygon ${polygonIndex + 1}, ${ringIndex === 0 ? "outer ring" : `hole ${ringIndex}`}`;
        if (positions.length < 4) return fail(`In ${ringName}: a ring needs at least 4 positions (3 corners and the first repeated at the end); it has ${positions.length}.`);
        if (!samePosition(positions[0], positions[positions.length - 1])) return fail(`In ${ringName}: the ring is not closed (its last position must repeat its first).`);
        vertices += positions.length;
      }
    }
  }
  if (vertices > SHORELINE_MAX_VERTICES) return fail(`The shoreline has ${vertices.toLocaleString("en-US")} vertices; at most ${SHORELINE_MAX_VERTICES.toLocaleString("en-US")} are accepted. Simplify it first.`);
  for (const { geometry: shape, name } of geometries) {
    const crossings = kinks(shape as Polygon | MultiPolygon).features;
    if (crossings.length > 0) {
      const [lon, lat] = crossings[0].geometry.coordinates;
      return fail(`In ${name}: the outline crosses itself near lon ${lon.toFixed(6)}, lat ${lat.toFixed(6)}; rings must not cross themselves or each other.`);
    }
  }
  if (workLimit) {
    const all = geometries.flatMap(({ geometry: shape }) => polygonsOf(shape));
    const [west, south, east, north] = bbox(all);
    const [limitWest, limitSouth, limitEast, limitNorth] = bbox(polygonsOf(workLimit));
    // Degrees of latitude are ~111 km everywhere; degrees of longitude shrink with cos(latitude) (spherical Earth, common practice for a bounding-box check).
    const marginLat = SHORELINE_MAX_DISTANCE_KM / 111;
    const midLat = ((limitSouth + limitNorth) / 2) * (Math.PI / 180);
    const marginLon = SHORELINE_MAX_DISTANCE_KM / (111 * Math.max(0.01, Math.cos(midLat)));
    const overlaps = west <= limitEast + marginLon && east >= limitWest - marginLon && south <= limitNorth + marginLat && north >= limitSouth - marginLat;
    if (!overlaps) {
      return fail(`The shoreline lies more than ${SHORELINE_MAX_DISTANCE_KM} km from the work limit (shoreline lon ${west.toFixed(4)} to ${east.toFixed(4)}, lat ${south.toFixed(4)} to ${north.toFixed(4)}). Is it in lon/lat order (WGS 84), and of this water body?`);
    }
  }
  const features: Array<Feature<Polygon | MultiPolygon, Record<string, never>>> = geometries.map(({ geometry: shape }) => ({ type: "Feature", properties: {}, geometry: shape }));
  return { ok: true, collection: { type: "FeatureCollection", features }, vertices, polygons };
}
