import { convertLength, type LengthUnit } from "../units";
import type { ParsedSoundings } from "./parse-csv";

/**
 * Row checks beyond the engine's CSV rules: depths out of range and exact duplicate rows. Pure:
 * the accepted soundings' columns in, problems by spreadsheet row out.
 */
export interface RowProblem {
  row: number;
  column: string;
  value: string;
  rule: string;
  message: string;
}

/** Deeper than 100 m is beyond any diver-worked spring or lake bottom: most likely a wrong unit or column. */
export const MAX_DEPTH_M = 100;

/** The parser's columns, depths and elevations already in the project's length unit. */
export interface RowCheckInput extends Pick<ParsedSoundings, "sourceRow" | "easting" | "northing" | "depth" | "probe" | "elevation" | "time" | "id"> {
  depthHeader: string;
  probeHeader: string;
  unit: LengthUnit;
}

// ——— Exact duplicates without a string key per row: a 1,000,000-row file would otherwise hold a
// million keys (≈ 375 MB of heap, measured). Rows are hashed from their fields' bits into an
// open-addressing table of row indices; equal hashes are confirmed field by field.

const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);

function mix(hash: number, word: number): number {
  let value = Math.imul(word, 0xcc9e2d51);
  value = (value << 15) | (value >>> 17);
  value = Math.imul(value, 0x1b873593);
  const next = hash ^ value;
  return (Math.imul((next << 13) | (next >>> 19), 5) + 0xe6546b64) | 0;
}

function mixNumber(hash: number, value: number): number {
  bits[0] = Number.isNaN(value) ? Number.NaN : value + 0; // one NaN; −0 counts as 0
  return mix(mix(hash, words[0]), words[1]);
}

function mixText(hash: number, text: string | undefined): number {
  if (text === undefined) return mix(hash, 0x9e3779b9);
  let next = mix(hash, text.length);
  for (let index = 0; index < text.length; index++) next = mix(next, text.charCodeAt(index));
  return next;
}

function sameNumber(a: number, b: number): boolean {
  return a === b || (Number.isNaN(a) && Number.isNaN(b));
}

export function checkRows(input: RowCheckInput): { problems: RowProblem[]; duplicateRows: number } {
  const problems: RowProblem[] = [];
  const maxDepth = convertLength(MAX_DEPTH_M, "m", input.unit);
  const count = input.sourceRow.length;
  const { easting, northing, depth: depths, probe: probes, elevation, time, id } = input;
  const value = (column: Float64Array | null, index: number) => (column ? column[index] : Number.NaN);
  const sameRow = (a: number, b: number) =>
    sameNumber(easting[a], easting[b]) && sameNumber(northing[a], northing[b]) && sameNumber(depths[a], depths[b]) &&
    sameNumber(value(probes, a), value(probes, b)) && sameNumber(value(elevation, a), value(elevation, b)) &&
    (time?.[a] ?? "") === (time?.[b] ?? "") && (id?.[a] ?? "") === (id?.[b] ?? "");
  let capacity = 16;
  while (capacity < count * 2) capacity *= 2;
  const mask = capacity - 1;
  const slots = new Int32Array(capacity).fill(-1); // row index, −1 when empty
  const hashes = new Int32Array(count);
  let duplicateRows = 0;
  for (let index = 0; index < count; index++) {
    const row = input.sourceRow[index];
    const depth = depths[index];
    if (depth > maxDepth) {
      problems.push({ row, column: input.depthHeader, value: String(depth), rule: "depth range", message: `water depth ${depth} is deeper than ${MAX_DEPTH_M} m (${maxDepth.toFixed(0)} in the file's unit); check the unit or the column mapping` });
    }
    const probe = value(probes, index);
    if (probe > maxDepth) {
      problems.push({ row, column: input.probeHeader, value: String(probe), rule: "depth range", message: `probe depth ${probe} is deeper than ${MAX_DEPTH_M} m; check the unit or the column mapping` });
    }
    // Exact duplicate: every field the same as an earlier row (a repeated export or a pasted block).
    let hash = mixNumber(mixNumber(mixNumber(mixNumber(mixNumber(0, easting[index]), northing[index]), depth), probe), value(elevation, index));
    hash = mixText(mixText(hash, time?.[index]), id?.[index]);
    hashes[index] = hash;
    let slot = hash & mask;
    let first = -1;
    while (slots[slot] >= 0) {
      const other = slots[slot];
      if (hashes[other] === hash && sameRow(other, index)) {
        first = other;
        break;
      }
      slot = (slot + 1) & mask;
    }
    if (first < 0) slots[slot] = index;
    else {
      duplicateRows++;
      problems.push({ row, column: "", value: "", rule: "duplicate row", message: `repeats row ${input.sourceRow[first]} exactly; leave one of them out` });
    }
  }
  return { problems, duplicateRows };
}

// ——— Plausible ranges: a value no survey can hold (1e308, an infinity, a point on another
// continent) is a row error, never stored.

/** Beyond ±10,000 km (or ft) from the CRS's origin no projected survey coordinate, depth or elevation lies. */
export const MAX_ABS_VALUE = 1e7;

/** A CRS's area of use in degrees (EPSG registry). */
export interface LonLatBounds {
  west: number;
  south: number;
  east: number;
  north: number;
}

/** A rectangle in the project's CRS. */
export interface ProjectedBounds {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/**
 * The project CRS's area of use as a rectangle in its own coordinates, widened on every side by
 * its own width and height: a sounding beyond it is not near the place the CRS is made for.
 * Sampled along the area's edges, since a projection bends them. Null when the area is unknown,
 * crosses the antimeridian, or does not project.
 */
export function plausibleProjectBounds(area: LonLatBounds | null | undefined, fromLonLat: (lon: number, lat: number) => [number, number]): ProjectedBounds | null {
  if (!area || !(area.west < area.east) || !(area.south < area.north)) return null;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  const steps = 16;
  for (let step = 0; step <= steps; step++) {
    const lon = area.west + ((area.east - area.west) * step) / steps;
    const lat = area.south + ((area.north - area.south) * step) / steps;
    for (const [x, y] of [fromLonLat(lon, area.south), fromLonLat(lon, area.north), fromLonLat(area.west, lat), fromLonLat(area.east, lat)]) {
      if (!Number.isFinite(x) || !Number.isFinite(y)) return null;
      minX = Math.min(minX, x); maxX = Math.max(maxX, x); minY = Math.min(minY, y); maxY = Math.max(maxY, y);
    }
  }
  const width = maxX - minX;
  const height = maxY - minY;
  return { minX: minX - width, minY: minY - height, maxX: maxX + width, maxY: maxY + height };
}

export interface RangeCheckInput {
  sourceRow: Uint32Array;
  /** The file's coordinates, in the CRS the file was declared in. */
  fileEasting: Float64Array;
  fileNorthing: Float64Array;
  /** The same in the project's CRS. */
  projectEasting: Float64Array;
  projectNorthing: Float64Array;
  depth: Float64Array;
  probe: Float64Array | null;
  elevation: Float64Array | null;
  eastingHeader: string;
  northingHeader: string;
  depthHeader: string;
  probeHeader: string;
  elevationHeader: string;
  /** From plausibleProjectBounds; null skips the area-of-use check. */
  projectBounds: ProjectedBounds | null;
  projectCrs: string;
}

/** Out of range: infinite, or beyond ±MAX_ABS_VALUE (NaN is an empty cell, the parser's to report). */
function outOfRange(value: number): boolean {
  return Math.abs(value) > MAX_ABS_VALUE;
}

/** Row errors for coordinates and depths outside any plausible range. */
export function checkPlausibleRanges(input: RangeCheckInput): RowProblem[] {
  const problems: RowProblem[] = [];
  const bounds = input.projectBounds;
  const columns: Array<[Float64Array | null, string, string]> = [
    [input.fileEasting, input.eastingHeader, "coordinate range"],
    [input.fileNorthing, input.northingHeader, "coordinate range"],
    [input.depth, input.depthHeader, "depth range"],
    [input.probe, input.probeHeader, "depth range"],
    [input.elevation, input.elevationHeader, "depth range"],
  ];
  for (let index = 0; index < input.sourceRow.length; index++) {
    const row = input.sourceRow[index];
    let fileCoordinateBad = false;
    for (const [column, header, rule] of columns) {
      if (!column || !outOfRange(column[index])) continue;
      if (rule === "coordinate range") fileCoordinateBad = true;
      problems.push({ row, column: header, value: String(column[index]), rule, message: `${column[index]} is beyond any plausible ${rule === "coordinate range" ? "coordinate" : "depth or elevation"} (±${MAX_ABS_VALUE.toExponential(0)}); check the column mapping and the file` });
    }
    if (fileCoordinateBad || !bounds) continue;
    const x = input.projectEasting[index];
    const y = input.projectNorthing[index];
    if (Number.isNaN(input.fileEasting[index]) || Number.isNaN(input.fileNorthing[index])) continue;
    if (!(x >= bounds.minX && x <= bounds.maxX && y >= bounds.minY && y <= bounds.maxY)) {
      problems.push({
        row, column: input.eastingHeader, value: `${input.fileEasting[index]}, ${input.fileNorthing[index]}`, rule: "coordinate range",
        message: `lies far outside the area where ${input.projectCrs} is used; check the coordinates and the coordinate system chosen for the file`,
      });
    }
  }
  return problems;
}

/** A plain rule name for an engine CSV error message. */
export function ruleOf(message: string): string {
  if (/is empty/.test(message)) return "required";
  if (/is not a number/.test(message)) return "number";
  if (/shallower than the water depth/.test(message)) return "probe below bottom";
  if (/is negative/.test(message)) return "not negative";
  if (/values? where the header has/.test(message)) return "column count";
  if (/header row|no column named|file is empty/.test(message)) return "columns";
  return "value";
}
