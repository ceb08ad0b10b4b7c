/**
 * The public share page's check: walks a public response (a parsed JSON value, or raw HTML text)
 * for anything that must never leave the project: forbidden keys, people's names and e-mail
 * addresses, survey file names, words of the sensitive records, and any coordinate that is not a
 * vertex of the work limit or of a zone (so no cell, find, sounding or dive position can hide in
 * it). Returns every problem found; an empty list passes.
 */

export interface PublicWalkRules {
  /** Lon/lat vertices the page may show: the work limit's and the zones'. */
  allowedVertices: Array<[number, number]>;
  /** Exact strings that must not appear (people's names, e-mail addresses, survey file names…). */
  forbiddenStrings: string[];
  /** Projected extent (project CRS) in which no number may appear: soundings and cells live there. */
  projectedExtent: { minX: number; maxX: number; minY: number; maxY: number };
}

/** Keys whose presence alone is a leak (a null value, such as the signed-out root's `user`, passes). */
const FORBIDDEN_KEY = /e-?mail|^user|person|people|member|^finds?$|artifact|custody|photo|exif|^holds?$|catalogue|dive|team|hose|assignment|permit|turbid|ntu|water.?quality|file.?name|sha256|token|sounding|^cells?$|^row$|^col$|easting|northing|password/i;

/** Words of the sensitive records that have no business on the public page. */
const FORBIDDEN_WORDS = [/\bdive\b/i, /\bdivers?\b/i, /\bfinds?\b/i, /\bpermit/i, /\bturbidity\b/i, /\bNTU\b/, /\bcustody\b/i, /\bstop-work\b/i, /\bcatalogue\b/i, /\b[A-Z]{2,5}-\d{4}-\d{4}\b/, /\.csv\b/i, /\bsoundings?\b/i, /[A-Za-z0-9._%+-]+@[A-Za-z0-9.-]+\.[A-Za-z]{2,}/];

const DECIMAL = /-?\d+\.\d+|\b\d{6,8}\b/g;

function vertexParts(rules: PublicWalkRules) {
  const lons = new Set<number>();
  const lats = new Set<number>();
  let minLon = Infinity, maxLon = -Infinity, minLat = Infinity, maxLat = -Infinity;
  for (const [lon, lat] of rules.allowedVertices) {
    lons.add(lon);
    lats.add(lat);
    minLon = Math.min(minLon, lon); maxLon = Math.max(maxLon, lon);
    minLat = Math.min(minLat, lat); maxLat = Math.max(maxLat, lat);
  }
  return { lons, lats, minLon, maxLon, minLat, maxLat };
}

/** Problems with the numbers in `text`: a lon or lat near the site that is no vertex, or a projected coordinate. */
function numberProblems(text: string, rules: PublicWalkRules, where: string): string[] {
  const problems: string[] = [];
  const { lons, lats, minLon, maxLon, minLat, maxLat } = vertexParts(rules);
  const { projectedExtent: extent } = rules;
  for (const match of text.matchAll(DECIMAL)) {
    const value = Number(match[0]);
    // Anything within a degree of the site in longitude or latitude is a position: it must be a vertex.
    if (value >= minLon - 1 && value <= maxLon + 1 && !lons.has(value)) problems.push(`${where}: longitude-like ${match[0]} is not a work-limit or zone vertex`);
    if (value >= minLat - 1 && value <= maxLat + 1 && !lats.has(value)) problems.push(`${where}: latitude-like ${match[0]} is not a work-limit or zone vertex`);
    const inX = value >= extent.minX && value <= extent.maxX;
    const inY = value >= extent.minY && value <= extent.maxY;
    if (inX || inY) problems.push(`${where}: ${match[0]} looks like a projected coordinate`);
  }
  return problems;
}

export function walkPublicText(text: string, rules: PublicWalkRules, where = "text"): string[] {
  const problems: string[] = [];
  for (const forbidden of rules.forbiddenStrings) if (forbidden && text.includes(forbidden)) problems.push(`${where}: contains "${forbidden}"`);
  for (const word of FORBIDDEN_WORDS) {
    const found = text.match(word);
    if (found) problems.push(`${where}: contains the word "${found[0]}"`);
  }
  return [...problems, ...numberProblems(text, rules, where)];
}

export function walkPublicValue(value: unknown, rules: PublicWalkRules, path = "$"): string[] {
  if (value === null || value === undefined || typeof value === "boolean") return [];
  if (typeof value === "number") return numberProblems(String(value), rules, path);
  if (typeof value === "string") return walkPublicText(value, rules, path);
  if (Array.isArray(value)) return value.flatMap((item, index) => walkPublicValue(item, rules, `${path}[${index}]`));
  if (typeof value === "object") {
    return Object.entries(value as Record<string, unknown>).flatMap(([key, item]) => {
      const keyProblems = FORBIDDEN_KEY.test(key) && item !== null ? [`${path}.${key}: forbidden key`] : [];
      return [...keyProblems, ...walkPublicValue(item, rules, `${path}.${key}`)];
    });
  }
  return [`${path}: unexpected ${typeof value}`];
}

/** Every [lon, lat] of a GeoJSON Polygon or MultiPolygon. */
export function polygonVertices(geoJson: string): Array<[number, number]> {
  const geometry = JSON.parse(geoJson) as { type: string; coordinates: unknown };
  const polygons = (geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates) as number[][][][];
  return polygons.flat(2).map(([lon, lat]) => [lon, lat]);
}
