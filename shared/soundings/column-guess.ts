import type { SoundingField } from "./parse-csv";

/**
 * Guesses which header holds which sounding field from the names crews' field software writes.
 * Longitude/latitude headers map to easting/northing and say so (`lonLat`), so the upload page can
 * offer EPSG:4326 as the file's CRS. Pure: header names in, mapping out.
 */
/** Field → header in the file; `null` says the technician marked the field as not in the file (nothing is guessed for it). */
export type ColumnMappingChoice = Partial<Record<SoundingField, string | null>>;

const SYNONYMS: Record<SoundingField, readonly string[]> = {
  easting: ["easting", "east", "x", "e", "x_ft", "x_m", "easting_ft", "easting_m"],
  northing: ["northing", "north", "y", "n", "y_ft", "y_m", "northing_ft", "northing_m"],
  depth: ["depth", "water_depth", "waterdepth", "depth_ft", "depth_m", "sounding", "z_depth"],
  probe: ["probe", "probe_depth", "refusal", "refusal_depth", "probe_ft", "probe_m", "rod_depth"],
  elevation: ["elevation", "elev", "bottom_elevation", "z", "elevation_ft", "elevation_m"],
  time: ["time", "timestamp", "datetime", "date_time", "utc", "time_local"],
  id: ["id", "point_id", "pointid", "point", "pt", "name", "station"],
};
const LONGITUDE = ["lon", "long", "longitude", "lng"];
const LATITUDE = ["lat", "latitude"];

/** Lower case, spaces and punctuation as underscores, units in brackets dropped ("Depth (ft)" → "depth"). */
export function normaliseHeader(header: string): string {
  return header
    .trim()
    .toLowerCase()
    .replace(/\((ft|m|us-ft|usft|feet|metres|meters)\)|\[(ft|m|us-ft|usft|feet|metres|meters)\]/g, "")
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "");
}

export interface ColumnGuess {
  mapping: ColumnMappingChoice;
  /** True when easting/northing were guessed from longitude/latitude headers. */
  lonLat: boolean;
}

export function guessColumns(headers: readonly string[], remembered?: ColumnMappingChoice | null): ColumnGuess {
  const normalised = headers.map(normaliseHeader);
  const mapping: ColumnMappingChoice = {};
  const taken = new Set<number>();
  const take = (field: SoundingField, names: readonly string[]) => {
    if (mapping[field] !== undefined) return;
    const index = normalised.findIndex((header, position) => !taken.has(position) && names.includes(header));
    if (index >= 0) {
      mapping[field] = headers[index];
      taken.add(index);
    }
  };
  // A remembered mapping wins where its header is still in the file.
  if (remembered) {
    for (const [field, header] of Object.entries(remembered) as Array<[SoundingField, string | null]>) {
      if (typeof header !== "string") continue;
      const index = headers.findIndex((candidate, position) => !taken.has(position) && candidate.trim().toLowerCase() === header.trim().toLowerCase());
      if (index >= 0) {
        mapping[field] = headers[index];
        taken.add(index);
      }
    }
  }
  for (const field of Object.keys(SYNONYMS) as SoundingField[]) take(field, SYNONYMS[field]);
  let lonLat = false;
  if (mapping.easting === undefined && mapping.northing === undefined) {
    take("easting", LONGITUDE);
    take("northing", LATITUDE);
    lonLat = Boolean(mapping.easting && mapping.northing);
  }
  return { mapping, lonLat };
}
