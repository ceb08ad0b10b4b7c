/**
 * A file of zones (read into GeoJSON by the work-limit reader, whatever its form) split into one
 * zone per feature, or per polygon where the file holds bare geometry (a DXF's closed polylines,
 * a CSV's outlines): each with where it came from, for messages that name it, and its name when
 * the feature carries one (a `name` or `zone` property, in any case), else null so the page asks.
 * Nothing is checked here beyond the shape of the collection: each outline goes through the one
 * zone check of the project setup service.
 */

export interface ZoneFileCandidate {
  /** "feature 3" or "polygon 2": how the file's reader would find it, counted from 1. */
  source: string;
  name: string | null;
  geometry: unknown;
}

/** Property names read as a zone's name, in order of preference (compared without case). */
export const ZONE_NAME_PROPERTIES = ["name", "zone", "zone_name", "zonename", "title"] as const;

/** Most zones one file may bring (the project's zones are limited to 100 in all). */
export const ZONE_FILE_MAX = 100;

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null && !Array.isArray(value);

function nameOf(properties: unknown): string | null {
  if (!isRecord(properties)) return null;
  const keys = Object.keys(properties);
  for (const wanted of ZONE_NAME_PROPERTIES) {
    const key = keys.find((candidate) => candidate.toLowerCase() === wanted);
    const value = key === undefined ? undefined : properties[key];
    if ((typeof value === "string" && value.trim() !== "") || typeof value === "number") return String(value).trim().slice(0, 120);
  }
  return null;
}

const isPolygonal = (geometry: unknown) => isRecord(geometry) && (geometry.type === "Polygon" || geometry.type === "MultiPolygon");

/** The zones of a file; `problems` for what is not one (a feature of points or lines, nothing at all). */
export function zoneCandidatesOf(geoJson: unknown): { candidates: ZoneFileCandidate[]; problems: string[] } {
  const candidates: ZoneFileCandidate[] = [];
  const problems: string[] = [];
  if (!isRecord(geoJson)) return { candidates, problems: ["The file is not a GeoJSON object."] };
  if (geoJson.type === "FeatureCollection" && Array.isArray(geoJson.features)) {
    geoJson.features.forEach((feature, index) => {
      const source = `feature ${index + 1}`;
      const geometry = isRecord(feature) ? feature.geometry : undefined;
      if (!isPolygonal(geometry)) {
        problems.push(`Feature ${index + 1}${isRecord(feature) && nameOf(feature.properties) ? ` ("${nameOf(feature.properties)}")` : ""} is ${isRecord(geometry) ? `a ${String(geometry.type)}` : "without geometry"}, not a polygon: a zone is a closed outline.`);
        return;
      }
      candidates.push({ source, name: nameOf(isRecord(feature) ? feature.properties : undefined), geometry });
    });
  } else if (geoJson.type === "Feature") {
    if (isPolygonal(geoJson.geometry)) candidates.push({ source: "feature 1", name: nameOf(geoJson.properties), geometry: geoJson.geometry });
    else problems.push("The file's one feature is not a polygon: a zone is a closed outline.");
  } else if (geoJson.type === "MultiPolygon" && Array.isArray(geoJson.coordinates)) {
    geoJson.coordinates.forEach((polygon, index) => candidates.push({ source: `polygon ${index + 1}`, name: null, geometry: { type: "Polygon", coordinates: polygon } }));
  } else if (geoJson.type === "Polygon") {
    candidates.push({ source: "polygon 1", name: null, geometry: geoJson });
  } else {
    problems.push(`The file holds a GeoJSON ${typeof geoJson.type === "string" ? geoJson.type : "object of no type"}; zones are polygons.`);
  }
  if (candidates.length === 0 && problems.length === 0) problems.push("The file holds no polygon.");
  if (candidates.length > ZONE_FILE_MAX) problems.push(`The file holds ${candidates.length} polygons; at most ${ZONE_FILE_MAX} zones are read from one file.`);
  return { candidates, problems };
}
