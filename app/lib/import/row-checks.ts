import { convertLength, type LengthUnit } from "../../../shared/units";

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

export interface RowCheckInput {
  sourceRow: Uint32Array;
  easting: Float64Array;
  northing: Float64Array;
  depth: Float64Array;
  probe: Float64Array | null;
  elevation: Float64Array | null;
  time: string[] | null;
  id: string[] | null;
  depthHeader: string;
  probeHeader: string;
  unit: LengthUnit;
}

export function checkRows(input: RowCheckInput): { problems: RowProblem[]; duplicateRows: number } {
  const problems: RowProblem[] = [];
  const maxDepth = convertLength(MAX_DEPTH_M, "m", input.unit);
  const seen = new Map<string, number>();
  let duplicateRows = 0;
  for (let index = 0; index < input.sourceRow.length; index++) {
    const row = input.sourceRow[index];
    const depth = input.depth[index];
    if (depth > maxDepth) {
      problems.push({ row, column: input.depthHeader, value: String(depth), rule: "depth range", message: `water depth ${depth} is deeper than ${MAX_DEPTH_M} m (${maxDepth.toFixed(0)} in the file's unit); check the unit or the column mapping` });
    }
    const probe = input.probe?.[index] ?? Number.NaN;
    if (probe > maxDepth) {
      problems.push({ row, column: input.probeHeader, value: String(probe), rule: "depth range", message: `probe depth ${probe} is deeper than ${MAX_DEPTH_M} m; check the unit or the column mapping` });
    }
    // Exact duplicate: every field the same as an earlier row (a repeated export or a pasted block).
    const key = `${input.easting[index]}|${input.northing[index]}|${depth}|${probe}|${input.elevation?.[index] ?? ""}|${input.time?.[index] ?? ""}|${input.id?.[index] ?? ""}`;
    const first = seen.get(key);
    if (first === undefined) seen.set(key, row);
    else {
      duplicateRows++;
      problems.push({ row, column: "", value: "", rule: "duplicate row", message: `repeats row ${first} exactly; leave one of them out` });
    }
  }
  return { problems, duplicateRows };
}

/** A plain rule name for an engine CSV error message. */
export function ruleOf(message: string): string {
  if (/is empty/.test(message)) return "required";
  if (/is not a number/.test(message)) return "number";
  if (/shallower than the water depth/.test(message)) return "probe below bottom";
  if (/is negative/.test(message)) return "not negative";
  if (/header row|no column named|file is empty/.test(message)) return "columns";
  return "value";
}
