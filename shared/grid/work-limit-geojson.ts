import { kinks, polygon as turfPolygon } from "@turf/turf";
import type { Crs } from "../crs";
import { workLimitArea, type Position, type ProjectedMultiPolygon } from "./work-limit";

/**
 * Reads a work limit (or a zone) given as GeoJSON — a Polygon, MultiPolygon, Feature or
 * FeatureCollection of those — in the project's CRS or in lon/lat, and checks it before anything
 * is stored: not empty, every ring closed with at least three corners, no ring crossing itself,
 * holes allowed. Each problem names the polygon, the ring and the vertex (counted from 1, as a
 * person reading the file counts) so the file can be fixed.
 *
 * Which system the coordinates are in is detected: every position within ±180° / ±90° reads as
 * lon/lat (RFC 7946); anything else as the project's CRS. Projected coordinates small enough to
 * pass as degrees (a local grid within 180 units of its origin) would be misread, which no state
 * plane or UTM zone allows.
 */
/** Largest work-limit file the pages read (bytes): 10,000 vertices of GeoJSON fit well within it. */
export const WORK_LIMIT_MAX_BYTES = 2 * 1024 * 1024;
/** Most vertices accepted over all rings (the crossing check grows with their square). */
export const WORK_LIMIT_MAX_VERTICES = 10_000;

/** The forms a work limit or zone file may come in (read by app/lib/geo/work-limit-files.server.ts). */
export const WORK_LIMIT_FORMATS = ["GeoJSON", "KML", "zipped shapefile", "DXF", "CSV"] as const;
export type WorkLimitFormat = (typeof WORK_LIMIT_FORMATS)[number];
/** What a file input offers (extensions and types), for the pages' `accept`. */
export const WORK_LIMIT_ACCEPT = ".geojson,.json,.kml,.zip,.dxf,.csv,application/geo+json,application/json,application/vnd.google-earth.kml+xml,application/zip,text/csv";

export type CoordinateSystemFound = "lon-lat" | "project-crs";

export interface WorkLimitProblem {
  /** 1-based polygon, ring and vertex, when the problem is at one. */
  polygon?: number;
  ring?: number;
  vertex?: number;
  message: string;
}

export type ParsedWorkLimit =
  | {
      ok: true;
      coordinates: CoordinateSystemFound;
      /** In lon/lat (RFC 7946), as stored: a Polygon when one polygon was given, else a MultiPolygon. */
      lonLat: { type: "Polygon"; coordinates: Position[][] } | { type: "MultiPolygon"; coordinates: Position[][][] };
      /** In the project's CRS, for areas and the grid. */
      projected: ProjectedMultiPolygon;
      /** Plan area in square project units. */
      area: number;
    }
  | { ok: false; problems: WorkLimitProblem[] };

type Json = unknown;

function isRecord(value: Json): value is Record<string, Json> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** The polygons of a GeoJSON object, as raw coordinate arrays; a problem when it holds anything else. */
function polygonsOf(geoJson: Json, problems: WorkLimitProblem[]): Json[] {
  if (!isRecord(geoJson)) {
    problems.push({ message: "is not a GeoJSON object (a Polygon, MultiPolygon, Feature or FeatureCollection)" });
    return [];
  }
  switch (geoJson.type) {
    case "Polygon":
      return [geoJson.coordinates];
    case "MultiPolygon":
      if (!Array.isArray(geoJson.coordinates)) break;
      return geoJson.coordinates;
    case "Feature":
      if (geoJson.geometry === null || geoJson.geometry === undefined) return [];
      return polygonsOf(geoJson.geometry, problems);
    case "FeatureCollection":
      if (!Array.isArray(geoJson.features)) break;
      return geoJson.features.flatMap((feature) => polygonsOf(feature, problems));
    default:
      problems.push({ message: `holds a GeoJSON ${typeof geoJson.type === "string" ? geoJson.type : "object of no type"}; only polygons can bound the work` });
      return [];
  }
  problems.push({ message: `is a ${String(geoJson.type)} without a list of coordinates` });
  return [];
}

function isPosition(value: Json): value is Position {
  return Array.isArray(value) && value.length >= 2 && typeof value[0] === "number" && typeof value[1] === "number" && Number.isFinite(value[0]) && Number.isFinite(value[1]);
}

const looksLikeLonLat = (position: Position) => Math.abs(position[0]) <= 180 && Math.abs(position[1]) <= 90;

export function parseWorkLimitGeoJson(geoJson: Json, crs: Crs): ParsedWorkLimit {
  const problems: WorkLimitProblem[] = [];
  const rawPolygons = polygonsOf(geoJson, problems);
  if (problems.length > 0) return { ok: false, problems };
  if (rawPolygons.length === 0) return { ok: false, problems: [{ message: "is empty: it holds no polygon" }] };

  // Shape first: every ring a list of at least four numeric positions, closed.
  const polygons: Position[][][] = [];
  rawPolygons.forEach((rawPolygon, polygonIndex) => {
    const polygon = polygonIndex + 1;
    if (!Array.isArray(rawPolygon) || rawPolygon.length === 0) {
      problems.push({ polygon, message: `polygon ${polygon} has no rings` });
      return;
    }
    const rings: Position[][] = [];
    rawPolygon.forEach((rawRing: Json, ringIndex) => {
      const ring = ringIndex + 1;
      const where = `polygon ${polygon}, ring ${ring}${ring === 1 ? " (the outline)" : " (a hole)"}`;
      if (!Array.isArray(rawRing)) {
        problems.push({ polygon, ring, message: `${where} is not a list of positions` });
        return;
      }
      const bad = rawRing.findIndex((position) => !isPosition(position));
      if (bad >= 0) {
        problems.push({ polygon, ring, vertex: bad + 1, message: `${where}, vertex ${bad + 1} is not a pair of numbers` });
        return;
      }
      const positions = (rawRing as Position[]).map((position) => [position[0], position[1]] as Position);
      const first = positions[0];
      const last = positions[positions.length - 1];
      if (positions.length > 0 && (first[0] !== last[0] || first[1] !== last[1])) {
        problems.push({ polygon, ring, vertex: positions.length, message: `${where} is not closed: its last vertex (${positions.length}) must repeat its first` });
        return;
      }
      if (positions.length < 4) {
        problems.push({ polygon, ring, message: `${where} has ${Math.max(0, positions.length - 1)} corners; a ring needs at least 3` });
        return;
      }
      rings.push(positions);
    });
    polygons.push(rings);
  });
  if (problems.length > 0) return { ok: false, problems };
  const vertices = polygons.reduce((total, rings) => total + rings.reduce((sum, ring) => sum + ring.length, 0), 0);
  if (vertices > WORK_LIMIT_MAX_VERTICES) {
    return { ok: false, problems: [{ message: `has ${vertices} vertices; at most ${WORK_LIMIT_MAX_VERTICES} are accepted (simplify the outline)` }] };
  }

  const coordinates: CoordinateSystemFound = crs.isGeographic || polygons.every((rings) => rings.every((ring) => ring.every(looksLikeLonLat))) ? "lon-lat" : "project-crs";
  const projected: ProjectedMultiPolygon = polygons.map((rings) =>
    rings.map((ring) => ring.map(([x, y]) => (coordinates === "lon-lat" ? crs.fromLonLat(x, y) : ([x, y] as Position)))),
  );
  const lonLatPolygons: Position[][][] = coordinates === "lon-lat" ? polygons : projected.map((rings) => rings.map((ring) => ring.map(([x, y]) => crs.toLonLat(x, y))));
  if (lonLatPolygons.some((rings) => rings.some((ring) => ring.some((position) => !isPosition(position) || !looksLikeLonLat(position))))) {
    return { ok: false, problems: [{ message: "has coordinates that are neither lon/lat nor within the project's coordinate system" }] };
  }

  // Crossings, in project coordinates (planar): turf's kinks finds where a ring's edges cross;
  // the problem names the vertex nearest to the crossing.
  projected.forEach((rings, polygonIndex) => {
    rings.forEach((ring, ringIndex) => {
      const crossings = kinks(turfPolygon([ring])).features;
      if (crossings.length === 0) return;
      const [x, y] = crossings[0].geometry.coordinates;
      let nearest = 0;
      ring.forEach(([vx, vy], index) => {
        if (Math.hypot(vx - x, vy - y) < Math.hypot(ring[nearest][0] - x, ring[nearest][1] - y)) nearest = index;
      });
      const where = `polygon ${polygonIndex + 1}, ring ${ringIndex + 1}${ringIndex === 0 ? " (the outline)" : " (a hole)"}`;
      problems.push({ polygon: polygonIndex + 1, ring: ringIndex + 1, vertex: nearest + 1, message: `${where} crosses itself near vertex ${nearest + 1}` });
    });
  });
  if (problems.length > 0) return { ok: false, problems };

  const area = workLimitArea(projected);
  if (!(area > 0)) return { ok: false, problems: [{ message: "is empty: its polygons enclose no area" }] };
  const lonLat = lonLatPolygons.length === 1 ? { type: "Polygon" as const, coordinates: lonLatPolygons[0] } : { type: "MultiPolygon" as const, coordinates: lonLatPolygons };
  return { ok: true, coordinates, lonLat, projected, area };
}
