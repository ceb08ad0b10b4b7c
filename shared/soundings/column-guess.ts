import type { LengthUnit } from "../units";
import type { SoundingField } from "./parse-csv";

/**
 * Guesses which header holds which sounding field from the names crews' field software and
 * spreadsheets write: `East_ft`, `North_ft`, `Sounding_ft`, `Easting (m)`, `X`/`Y`/`Z`, `Elev`,
 * `Lat`/`Long`… A unit written in the header (`_ft`, `(m)`, `[ftUS]`) is read off before the name
 * is matched, and `headerUnit` tells it, so the check can say when it disagrees with the unit
 * declared for the file. Longitude/latitude headers map to easting/northing and say so (`lonLat`),
 * so the upload page can offer EPSG:4326 as the file's CRS. The project's last accepted mapping
 * comes first wherever the file still has its headers. Pure: header names in, mapping out.
 */
/** Field → header in the file; `null` says the technician marked the field as not in the file (nothing is guessed for it). */
export type ColumnMappingChoice = Partial<Record<SoundingField, string | null>>;

/** Names as normalised (lower case, underscores, unit dropped), most usual first. */
const SYNONYMS: Record<SoundingField, readonly string[]> = {
  easting: ["easting", "eastings", "east", "e", "x", "x_coord", "x_coordinate", "xcoord", "grid_x", "grid_east", "grid_easting", "sp_easting", "spc_easting", "easting_x"],
  northing: ["northing", "northings", "north", "n", "y", "y_coord", "y_coordinate", "ycoord", "grid_y", "grid_north", "grid_northing", "sp_northing", "spc_northing", "northing_y"],
  depth: ["depth", "water_depth", "waterdepth", "sounding", "soundings", "sounding_depth", "depth_sounding", "sounded_depth", "depth_to_bottom", "bottom_depth", "depth_below_surface", "wdepth", "dpth", "z_depth"],
  probe: ["probe", "probe_depth", "probedepth", "refusal", "refusal_depth", "depth_to_refusal", "probe_refusal", "rod", "rod_depth", "probe_rod", "firm_depth", "depth_to_firm", "sand_depth", "hard_bottom"],
  elevation: ["elevation", "elev", "elv", "el", "bottom_elevation", "bottom_elev", "bottom_el", "bed_elevation", "bed_elev", "z", "z_elev", "z_elevation"],
  time: ["time", "timestamp", "time_stamp", "datetime", "date_time", "date_and_time", "utc", "time_utc", "time_local", "local_time", "survey_time", "gps_time", "date"],
  id: ["id", "point_id", "pointid", "point", "pt", "pt_id", "pnt", "point_no", "point_number", "pt_no", "ptnum", "pid", "name", "station", "no"],
};
const LONGITUDE = ["lon", "long", "longitude", "lng", "x_lon", "lon_x", "longitude_x"];
const LATITUDE = ["lat", "latitude", "y_lat", "lat_y", "latitude_y"];

/** Units written at the end of a header, normalised ("depth_ft", "easting_m", "depth_us_ft"). */
const UNIT_SUFFIXES: Array<[RegExp, LengthUnit | "degrees"]> = [
  [/_(us_ft|usft|ftus|ft_us|us_feet|us_survey_feet|us_survey_ft|sft|survey_feet|survey_ft)$/, "us-ft"],
  [/_(ft|feet|foot|intl_ft|ift)$/, "ft"],
  [/_(m|metres|meters|metre|meter|mtr|mtrs)$/, "m"],
  [/_(dd|deg|degs|degrees|dec_deg|decdeg|decimal_degrees)$/, "degrees"],
];
/** A vertical datum written at the end of a header ("Elev_NAVD88_ft"): read past, like a unit. */
const DATUM_SUFFIX = /_(navd_?88|ngvd_?29|mllw|mlw|nad_?83|wgs_?84|local)$/;

function words(header: string): string {
  return header
    .trim()
    .replace(/([a-z])([A-Z])/g, "$1_$2")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "");
}

/** The unit a header carries at its end ("East_ft" → ft, "Easting (m)" → m, "Depth [ftUS]" → US survey feet), or null. */
export function headerUnit(header: string): LengthUnit | "degrees" | null {
  let name = words(header);
  for (let pass = 0; pass < 2; pass++) {
    for (const [pattern, unit] of UNIT_SUFFIXES) if (pattern.test(name) && name.replace(pattern, "") !== "") return unit;
    name = name.replace(DATUM_SUFFIX, "");
  }
  return null;
}

/** Lower case, spaces and punctuation as underscores, a unit and a datum at the end dropped ("Depth (ft)" → "depth", "East_ft" → "east"). */
export function normaliseHeader(header: string): string {
  let name = words(header);
  for (let pass = 0; pass < 2; pass++) {
    for (const [pattern] of UNIT_SUFFIXES) {
      const stripped = name.replace(pattern, "");
      if (stripped !== "" && stripped !== name) {
        name = stripped;
        break;
      }
    }
    const withoutDatum = name.replace(DATUM_SUFFIX, "");
    if (withoutDatum !== "") name = withoutDatum;
  }
  return name;
}

export interface ColumnGuess {
  mapping: ColumnMappingChoice;
  /** True when easting/northing were guessed from longitude/latitude headers. */
  lonLat: boolean;
  /** Fields taken from the project's last accepted mapping. */
  remembered: SoundingField[];
}

export function guessColumns(headers: readonly string[], remembered?: ColumnMappingChoice | null): ColumnGuess {
  const normalised = headers.map(normaliseHeader);
  const mapping: ColumnMappingChoice = {};
  const fromRemembered: SoundingField[] = [];
  const taken = new Set<number>();
  const take = (field: SoundingField, names: readonly string[]) => {
    if (mapping[field] !== undefined) return;
    // The more usual name wins: "time" before "date" when a file has both.
    for (const name of names) {
      const index = normalised.findIndex((header, position) => !taken.has(position) && header === name);
      if (index >= 0) {
        mapping[field] = headers[index];
        taken.add(index);
        return;
      }
    }
  };
  // The project's last accepted mapping comes first where its header is still in the file.
  if (remembered) {
    for (const [field, header] of Object.entries(remembered) as Array<[SoundingField, string | null]>) {
      if (typeof header !== "string") continue;
      const index = headers.findIndex((candidate, position) => !taken.has(position) && candidate.trim().toLowerCase() === header.trim().toLowerCase());
      if (index >= 0) {
        mapping[field] = headers[index];
        fromRemembered.push(field);
        taken.add(index);
      }
    }
  }
  // Longitude/latitude named as such win over X/Y, which some exports write beside them.
  let lonLat = false;
  if (mapping.easting === undefined && mapping.northing === undefined) {
    const lonIndex = normalised.findIndex((header) => LONGITUDE.includes(header));
    const latIndex = normalised.findIndex((header) => LATITUDE.includes(header));
    const eastIndex = normalised.findIndex((header) => SYNONYMS.easting.includes(header));
    if (lonIndex >= 0 && latIndex >= 0 && eastIndex < 0) {
      take("easting", LONGITUDE);
      take("northing", LATITUDE);
      lonLat = Boolean(mapping.easting && mapping.northing);
    }
  }
  for (const field of Object.keys(SYNONYMS) as SoundingField[]) take(field, SYNONYMS[field]);
  if (mapping.easting === undefined && mapping.northing === undefined) {
    take("easting", LONGITUDE);
    take("northing", LATITUDE);
    lonLat = Boolean(mapping.easting && mapping.northing);
  }
  return { mapping, lonLat, remembered: fromRemembered };
}
