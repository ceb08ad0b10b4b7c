import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { z } from "zod";
import { searchCrs, type CrsEntry, type CrsMatch } from "../../../shared/crs-search/search";
import type { LengthUnit } from "../../../shared/units";
import { lengthUnitOfCrs } from "./epsg.server";

/**
 * The CRSs a project can use, searchable by code or name: the bundled EPSG list's projected
 * systems in US survey feet, feet or metres. Read once from `epsg-index/all.json` (8 MB) when
 * first asked, kept as a compact list (about 5,100 entries) and the big file let go.
 */

const allEntrySchema = z.object({ code: z.string(), kind: z.string(), name: z.string(), unit: z.string().nullable().optional(), area: z.string().nullable().optional() });

let entries: CrsEntry[] | null = null;
const require = createRequire(import.meta.url);

function projectCrsList(): CrsEntry[] {
  if (entries) return entries;
  const file = join(dirname(require.resolve("epsg-index/package.json")), "all.json");
  const all = JSON.parse(readFileSync(file, "utf8")) as Record<string, unknown>;
  const list: CrsEntry[] = [];
  for (const raw of Object.values(all)) {
    const parsed = allEntrySchema.safeParse(raw);
    if (!parsed.success || parsed.data.kind !== "CRS-PROJCRS" || !parsed.data.unit || lengthUnitOfCrs(parsed.data.unit) === null) continue;
    list.push({ code: Number(parsed.data.code), name: parsed.data.name, unit: parsed.data.unit, area: parsed.data.area ?? "" });
  }
  entries = list;
  return list;
}

export interface CrsSearchResult extends CrsMatch {
  /** The project length unit the CRS works in (the project's must be it). */
  lengthUnit: LengthUnit;
}

/** Up to `limit` projected CRSs for `query` (a code, "EPSG:nnnn" or words of the name), best first. */
export function searchProjectCrs(query: string, limit = 20): CrsSearchResult[] {
  return searchCrs(projectCrsList(), query, limit).map((match) => ({ ...match, lengthUnit: lengthUnitOfCrs(match.unit)! }));
}
