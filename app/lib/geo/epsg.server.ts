import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { z } from "zod";
import type { LengthUnit } from "../../../shared/units";
import type { LonLatBounds } from "../../../shared/soundings/row-checks";

/**
 * Resolves a project's CRS from an EPSG code or a proj4 string. Definitions come from the
 * maintained `epsg-index` package, one small file per code (`epsg-index/s/<code>.json`), so the
 * server never loads the 40 MB all-codes file.
 */
export interface ResolvedCrs {
  code: number | null;
  definition: string;
  name: string;
  /** The CRS's unit as the EPSG registry names it ("US survey foot", "metre", ...), if known. */
  unit: string | null;
  /** Things the user should know, e.g. a datum grid that is not available here. */
  warnings: string[];
  /** Where the CRS may be used, as the EPSG registry says (degrees); null when unknown. */
  areaOfUse: LonLatBounds | null;
}

const epsgEntrySchema = z.object({
  code: z.string(),
  name: z.string(),
  proj4: z.string().min(1),
  unit: z.string().nullable().optional(),
  /** The area of use: north, west, south, east (degrees). */
  bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]).nullable().optional(),
});

const require = createRequire(import.meta.url);
let definitionsDirectory: string | null = null;

function epsgDirectory(): string {
  if (definitionsDirectory === null) {
    definitionsDirectory = join(dirname(require.resolve("epsg-index/package.json")), "s");
  }
  return definitionsDirectory;
}

const cache = new Map<number, ResolvedCrs>();

export function resolveCrsDefinition(codeOrProj4: string): ResolvedCrs {
  const input = codeOrProj4.trim();
  if (input.startsWith("+")) {
    const unitMatch = /\+units=(\S+)/.exec(input);
    return {
      code: null,
      definition: input,
      name: "Custom proj4 definition",
      unit: unitMatch ? unitMatch[1] : /\+to_meter=/.test(input) ? null : input.includes("+proj=longlat") ? "degree" : "metre",
      warnings: [],
      areaOfUse: null,
    };
  }
  const codeMatch = /^(?:EPSG\s*:\s*)?(\d{1,6})$/i.exec(input);
  if (!codeMatch) {
    throw new Error(
      `"${input}" is not a coordinate reference system: give an EPSG code such as EPSG:2237 or 2237, or a proj4 string starting with "+proj="`,
    );
  }
  const code = Number(codeMatch[1]);
  const cached = cache.get(code);
  if (cached) return cached;

  const file = join(epsgDirectory(), `${code}.json`);
  if (!existsSync(file)) {
    throw new Error(`EPSG:${code} is not a known coordinate reference system code`);
  }
  const parsed = epsgEntrySchema.safeParse(JSON.parse(readFileSync(file, "utf8")));
  if (!parsed.success) {
    throw new Error(`EPSG:${code} has no proj4 definition that Firmsand can use`);
  }
  const entry = parsed.data;
  const warnings: string[] = [];
  let definition = entry.proj4;
  // Datum shift grids (+nadgrids) are files Firmsand does not ship, and proj4 returns NaN without
  // them even when marked optional. Dropping the grid keeps the projection exact (project
  // coordinates and volumes are unaffected); only the lon/lat shown on the map lacks the shift.
  definition = definition.replace(/\s*\+nadgrids=(\S+)/, (all, grids: string) => {
    const names = grids.split(",").filter((grid) => grid !== "null" && grid !== "@null");
    if (names.length === 0) return all;
    warnings.push(
      `EPSG:${code} relies on the datum grid ${names.join(", ")}, which Firmsand does not have: map positions may be off by up to a few hundred metres; project coordinates and volumes are unaffected`,
    );
    return "";
  });
  const resolved: ResolvedCrs = {
    code,
    definition,
    name: entry.name,
    unit: entry.unit ? entry.unit : null,
    warnings,
    areaOfUse: entry.bbox ? { north: entry.bbox[0], west: entry.bbox[1], south: entry.bbox[2], east: entry.bbox[3] } : null,
  };
  cache.set(code, resolved);
  return resolved;
}

/**
 * Maps a CRS unit to a Firmsand length unit where there is one. Accepts the EPSG unit name
 * ("US survey foot", "foot", "metre") or a proj4 `+units=` value ("us-ft", "ft", "m").
 * Returns null for degrees and other units a project cannot work in.
 */
export function lengthUnitOfCrs(crsOrUnit: ResolvedCrs | string | null): LengthUnit | null {
  const unit = typeof crsOrUnit === "string" || crsOrUnit === null ? crsOrUnit : crsOrUnit.unit;
  if (unit === null) return null;
  switch (unit.trim().toLowerCase()) {
    case "us survey foot":
    case "us-ft":
    case "foot_us":
      return "us-ft";
    case "foot":
    case "international foot":
    case "ft":
      return "ft";
    case "metre":
    case "meter":
    case "m":
      return "m";
    default:
      return null;
  }
}
