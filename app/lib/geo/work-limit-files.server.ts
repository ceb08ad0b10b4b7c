import { kml } from "@tmcw/togeojson";
import { DOMParser } from "@xmldom/xmldom";
import DxfParser from "dxf-parser";
import Papa from "papaparse";
import shp from "shpjs";
import { ValidationError } from "~/lib/errors";

/**
 * A work limit (or zone) file as GeoJSON, whatever the form it came in: GeoJSON itself, KML
 * (`@tmcw/togeojson` on an `@xmldom/xmldom` document), a zipped shapefile with its `.prj`
 * (`shpjs`, which reprojects to lon/lat when the `.prj` is there), DXF closed polylines
 * (`dxf-parser`), or a CSV of vertices. The GeoJSON that comes out goes through the one check of
 * shape, crossings and area of use (shared/grid/work-limit-geojson.ts), so every format is refused
 * for the same reasons with the same words; what this reader refuses is a file it cannot read,
 * named with the file, and where it can, the row or entity.
 */

export type { WorkLimitFormat } from "../../../shared/grid/work-limit-geojson";
import type { WorkLimitFormat } from "../../../shared/grid/work-limit-geojson";

type Position = [number, number];
type PolygonCoordinates = Position[][];

export interface WorkLimitFile {
  format: WorkLimitFormat;
  geoJson: unknown;
  /** Said to the user beside the preview (e.g. how many closed polylines a DXF gave). */
  note: string | null;
}

const refuse = (fileName: string, message: string): never => {
  throw new ValidationError({ field: "workLimit", message: `${fileName} ${message}` });
};

function formatOf(fileName: string, bytes: Uint8Array): WorkLimitFormat | null {
  const extension = fileName.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? "";
  if (bytes[0] === 0x50 && bytes[1] === 0x4b) return "zipped shapefile"; // "PK": a zip, whatever its name
  if (extension === "kml") return "KML";
  if (extension === "dxf") return "DXF";
  if (extension === "csv" || extension === "txt") return "CSV";
  if (extension === "geojson" || extension === "json") return "GeoJSON";
  const head = new TextDecoder().decode(bytes.subarray(0, 200)).trimStart();
  if (head.startsWith("{")) return "GeoJSON";
  if (head.startsWith("<")) return "KML";
  return null;
}

/** Reads the file as GeoJSON; a ValidationError naming `workLimit` and the file when it cannot. */
export async function readWorkLimitFile(fileName: string, bytes: Uint8Array): Promise<WorkLimitFile> {
  if (bytes.length === 0) refuse(fileName, "is empty (0 bytes).");
  const format = formatOf(fileName, bytes);
  switch (format) {
    case "GeoJSON":
      return { format, geoJson: readJson(fileName, bytes), note: null };
    case "KML":
      return { format, ...readKml(fileName, bytes) };
    case "zipped shapefile":
      return { format, ...(await readShapefile(fileName, bytes)) };
    case "DXF":
      return { format, ...readDxf(fileName, bytes) };
    case "CSV":
      return { format, ...readCsv(fileName, bytes) };
    default:
      return refuse(fileName, `is not a form Firmsand reads for a work limit: give GeoJSON, KML, a zipped shapefile (.zip with .shp, .shx, .dbf and .prj), DXF or a CSV of vertices.`);
  }
}

function readJson(fileName: string, bytes: Uint8Array): unknown {
  try {
    return JSON.parse(new TextDecoder().decode(bytes));
  } catch {
    return refuse(fileName, "is not a GeoJSON file (it does not read as JSON).");
  }
}

/** Keeps x and y: KML and shapefiles may carry a height the outline does not use. */
function flatten(geoJson: unknown): unknown {
  if (Array.isArray(geoJson)) {
    return typeof geoJson[0] === "number" ? geoJson.slice(0, 2) : geoJson.map(flatten);
  }
  if (typeof geoJson === "object" && geoJson !== null) {
    return Object.fromEntries(Object.entries(geoJson).map(([key, value]) => [key, key === "properties" ? value : flatten(value)]));
  }
  return geoJson;
}

/** Only the polygons of a collection: KML and shapefiles often hold pins and lines beside the outline. */
function polygonsOnly(fileName: string, collection: { features: Array<{ geometry: { type: string } | null }> }, what: string): { geoJson: unknown; note: string | null } {
  const polygons = collection.features.filter((feature) => feature.geometry && (feature.geometry.type === "Polygon" || feature.geometry.type === "MultiPolygon"));
  if (polygons.length === 0) refuse(fileName, `holds no polygon (${collection.features.length === 0 ? "nothing at all" : `${collection.features.length} ${what} that are points or lines`}): a work limit is a closed outline.`);
  const left = collection.features.length - polygons.length;
  return { geoJson: flatten({ type: "FeatureCollection", features: polygons }), note: left > 0 ? `${left} point or line ${left === 1 ? "feature" : "features"} beside the polygons left out.` : null };
}

function readKml(fileName: string, bytes: Uint8Array) {
  const problems: string[] = [];
  const document = new DOMParser({ onError: (level, message) => void (level !== "warning" && problems.push(message.split("\n")[0])) })
    .parseFromString(new TextDecoder().decode(bytes), "text/xml");
  if (problems.length > 0 || !document.documentElement || document.getElementsByTagName("kml").length === 0) {
    refuse(fileName, `is not a KML file${problems.length > 0 ? ` (${problems[0]})` : " (no <kml> element)"}.`);
  }
  return polygonsOnly(fileName, kml(document as unknown as Document) as never, "placemarks");
}

async function readShapefile(fileName: string, bytes: Uint8Array) {
  let result: unknown;
  try {
    result = await shp(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch (error) {
    return refuse(fileName, `is not a zipped shapefile Firmsand can read (${error instanceof Error ? error.message : String(error)}): zip the .shp with its .shx, .dbf and .prj.`);
  }
  const layers = (Array.isArray(result) ? result : [result]) as Array<{ features: Array<{ geometry: { type: string } | null }>; fileName?: string }>;
  const polygonLayers = layers.filter((layer) => layer.features.some((feature) => feature.geometry && /Polygon$/.test(feature.geometry.type)));
  if (polygonLayers.length > 1) refuse(fileName, `holds ${polygonLayers.length} polygon layers (${polygonLayers.map((layer) => layer.fileName ?? "?").join(", ")}): zip only the work limit's.`);
  return polygonsOnly(fileName, polygonLayers[0] ?? layers[0], "shapes");
}

/** The ring's signed area (shoelace); its sign says which way it turns. */
function ringArea(ring: Position[]): number {
  let sum = 0;
  for (let index = 0; index < ring.length - 1; index++) sum += ring[index][0] * ring[index + 1][1] - ring[index + 1][0] * ring[index][1];
  return sum / 2;
}

function insideRing(point: Position, ring: Position[]): boolean {
  let inside = false;
  for (let index = 0, previous = ring.length - 1; index < ring.length; previous = index++) {
    const [xi, yi] = ring[index];
    const [xj, yj] = ring[previous];
    if (yi > point[1] !== yj > point[1] && point[0] < ((xj - xi) * (point[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/**
 * Closed rings into polygons: a ring lying inside another is that one's hole (the drawing says no
 * more than that), the rest are outlines, largest first.
 */
function polygonsFromRings(rings: Position[][]): PolygonCoordinates[] {
  const bySize = [...rings].sort((a, b) => Math.abs(ringArea(b)) - Math.abs(ringArea(a)));
  const polygons: PolygonCoordinates[] = [];
  for (const ring of bySize) {
    const holder = polygons.find((polygon) => insideRing(ring[0], polygon[0]) && !polygon.slice(1).some((hole) => insideRing(ring[0], hole)));
    if (holder) holder.push(ring);
    else polygons.push([ring]);
  }
  return polygons;
}

const closed = (ring: Position[]): Position[] => {
  const first = ring[0];
  const last = ring[ring.length - 1];
  return first[0] === last[0] && first[1] === last[1] ? ring : [...ring, first];
};

function readDxf(fileName: string, bytes: Uint8Array) {
  let parsed: ReturnType<DxfParser["parseSync"]>;
  try {
    parsed = new DxfParser().parseSync(new TextDecoder().decode(bytes));
  } catch (error) {
    return refuse(fileName, `is not a DXF file Firmsand can read (${error instanceof Error ? error.message : String(error)}).`);
  }
  const entities = (parsed?.entities ?? []) as Array<{ type: string; shape?: boolean; vertices?: Array<{ x: number; y: number }> }>;
  const polylines = entities.filter((entity) => entity.type === "LWPOLYLINE" || entity.type === "POLYLINE");
  const rings = polylines.filter((entity) => entity.shape && (entity.vertices?.length ?? 0) >= 3).map((entity) => closed(entity.vertices!.map((vertex) => [vertex.x, vertex.y] as Position)));
  if (rings.length === 0) {
    refuse(fileName, `has no closed polyline (${polylines.length === 0 ? "no LWPOLYLINE or POLYLINE at all" : `${polylines.length} polylines, none with its closed flag and three corners`}): draw the work limit as a closed polyline.`);
  }
  const open = polylines.length - rings.length;
  const polygons = polygonsFromRings(rings);
  const holes = rings.length - polygons.length;
  return {
    geoJson: { type: "MultiPolygon", coordinates: polygons },
    note: `${rings.length} closed ${rings.length === 1 ? "polyline" : "polylines"} read as ${polygons.length} ${polygons.length === 1 ? "outline" : "outlines"}${holes > 0 ? ` with ${holes} ${holes === 1 ? "hole" : "holes"} (a polyline inside another)` : ""}${open > 0 ? `; ${open} open ${open === 1 ? "polyline" : "polylines"} left out` : ""}. DXF coordinates are read in the project's coordinate system unless they are degrees.`,
  };
}

const X_HEADERS = ["x", "easting", "east", "e", "lon", "long", "longitude"];
const Y_HEADERS = ["y", "northing", "north", "n", "lat", "latitude"];
const POLYGON_HEADERS = ["polygon", "part", "outline"];
const RING_HEADERS = ["ring", "hole"];

/**
 * A CSV of vertices in order, one per row, under a header naming x (easting, lon) and y
 * (northing, lat); a `polygon` column starts a new outline when it changes and a `ring` column a
 * new ring (the first of a polygon its outline, the rest holes). Each ring is closed for the user
 * when its last vertex does not repeat its first.
 */
function readCsv(fileName: string, bytes: Uint8Array) {
  const parsed = Papa.parse<Record<string, string>>(new TextDecoder().decode(bytes).replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transformHeader: (header) => header.trim().toLowerCase() });
  const fields = parsed.meta.fields ?? [];
  const find = (names: string[]) => fields.find((field) => names.includes(field.replace(/[\s_()]+(ft|m|usft|ftus|deg)?\)?$/, "")));
  const xField = find(X_HEADERS);
  const yField = find(Y_HEADERS);
  if (!xField || !yField) {
    refuse(fileName, `needs a header row naming the x and y columns (x or easting or lon; y or northing or lat); its header is "${fields.join(", ") || "empty"}".`);
  }
  const polygonField = find(POLYGON_HEADERS);
  const ringField = find(RING_HEADERS);
  const polygons: Array<{ key: string; rings: Array<{ key: string; positions: Position[] }> }> = [];
  parsed.data.forEach((row, index) => {
    const line = index + 2; // the header is line 1
    const x = Number(row[xField!]?.trim());
    const y = Number(row[yField!]?.trim());
    if (row[xField!]?.trim() === "" || !Number.isFinite(x)) refuse(fileName, `row ${line}: ${xField} "${row[xField!] ?? ""}" is not a number.`);
    if (row[yField!]?.trim() === "" || !Number.isFinite(y)) refuse(fileName, `row ${line}: ${yField} "${row[yField!] ?? ""}" is not a number.`);
    const polygonKey = polygonField ? (row[polygonField] ?? "").trim() : "1";
    const ringKey = ringField ? (row[ringField] ?? "").trim() : "1";
    let polygon = polygons[polygons.length - 1];
    if (!polygon || polygon.key !== polygonKey) polygons.push((polygon = { key: polygonKey, rings: [] }));
    let ring = polygon.rings[polygon.rings.length - 1];
    if (!ring || ring.key !== ringKey) polygon.rings.push((ring = { key: ringKey, positions: [] }));
    ring.positions.push([x, y]);
  });
  if (polygons.length === 0) refuse(fileName, "has a header and no vertices.");
  return {
    geoJson: { type: "MultiPolygon", coordinates: polygons.map((polygon) => polygon.rings.map((ring) => closed(ring.positions))) },
    note: `${parsed.data.length} vertices read from the columns ${xField} and ${yField}${polygonField ? ` (outlines by ${polygonField})` : ""}${ringField ? ` (rings by ${ringField})` : ""}; each ring closed back to its first vertex.`,
  };
}
