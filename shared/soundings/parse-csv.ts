import Papa from "papaparse";
import { z } from "zod";
import { Float64Builder } from "../typed/float64-builder";

/**
 * Sounding CSV → flat typed columns.
 *
 * A survey technician exports soundings from the field software as CSV with a header row. Columns
 * are found by header name (case-insensitive), or by an explicit mapping when the export uses other
 * names. Every data row is validated with zod; a bad row is left out of the columns and reported
 * with its spreadsheet row number (header = row 1, first data row = row 2) and the column at fault,
 * so the technician can find it in the file.
 *
 * Pure: text or bytes in, arrays out. `createSoundingCsvParser` takes the file chunk by chunk so a
 * streamed upload never has to sit in memory as one string; `parseSoundingsCsv` and
 * `parseSoundingsCsvBytes` are the one-piece shortcuts. Bytes (UTF-8) are the fast way: a row of
 * plain numbers that passes every check is read straight from the bytes, with no string per cell;
 * any other row (an error to report, a quote, an exponent, spaces) goes through the same zod row
 * schema as text does, so both ways give the same columns, rows and messages.
 */

export const soundingFields = ["easting", "northing", "depth", "probe", "elevation", "time", "id"] as const;
export type SoundingField = (typeof soundingFields)[number];

/** Header names recognised for each field, lower case. */
export const soundingHeaderNames: Record<SoundingField, readonly string[]> = {
  easting: ["easting", "x"],
  northing: ["northing", "y"],
  depth: ["depth", "water_depth"],
  probe: ["probe", "probe_depth"],
  elevation: ["elevation"],
  time: ["time"],
  id: ["id", "point_id"],
};

const fieldWords: Record<SoundingField, string> = {
  easting: "easting",
  northing: "northing",
  depth: "water depth",
  probe: "probe depth",
  elevation: "elevation",
  time: "time",
  id: "point id",
};

export interface SoundingRowError {
  /** Spreadsheet row: the header is row 1, the first data row is row 2. */
  row: number;
  /** The column's header as written in the file (or the field name when the column is missing). */
  column: string;
  value: string;
  message: string;
}

export interface ParsedSoundings {
  easting: Float64Array;
  northing: Float64Array;
  /** Water depth below the water surface, positive down; NaN where the file gives only elevation. */
  depth: Float64Array;
  /** Probe depth to refusal below the water surface; NaN where the cell is empty. Null without the column. */
  probe: Float64Array | null;
  /** Bottom elevation given directly by the file; NaN where empty. Null without the column. */
  elevation: Float64Array | null;
  time: string[] | null;
  id: string[] | null;
  /** Spreadsheet row of each accepted sounding, to point QA flags back into the file. */
  sourceRow: Uint32Array;
  errors: SoundingRowError[];
  /** Data rows read (accepted and rejected; blank lines are not counted). */
  rowCount: number;
  delimiter: string;
}

export interface SoundingCsvOptions {
  /**
   * Header to use for a field, overriding the built-in names (matched case-insensitively). `null`
   * says the field is not in the file: no column is used for it, even one with a built-in name.
   */
  columns?: Partial<Record<SoundingField, string | null>>;
  /** Force a delimiter instead of detecting it from the header row. */
  delimiter?: "," | ";" | "\t" | "|";
  /** Stop collecting errors after this many (rows are still counted). Default 1000. */
  maxErrors?: number;
}

export const soundingCsvOptionsSchema = z.object({
  columns: z.partialRecord(z.enum(soundingFields), z.string().min(1).nullable()).optional(),
  delimiter: z.enum([",", ";", "\t", "|"]).optional(),
  maxErrors: z.number().int().positive().optional(),
});

const plainNumber = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function numberCell(required: boolean, decimalComma: boolean) {
  return z.string().transform((raw, context) => {
    const text = raw.trim();
    if (text === "") {
      if (required) context.addIssue({ code: "custom", message: "is empty; a number is required here" });
      return Number.NaN;
    }
    const normalised = decimalComma ? text.replace(",", ".") : text;
    if (!plainNumber.test(normalised)) {
      context.addIssue({ code: "custom", message: "is not a number" });
      return Number.NaN;
    }
    return Number(normalised);
  });
}

function rowSchema(present: Record<SoundingField, boolean>, decimalComma: boolean) {
  const depthRequired = !present.elevation;
  return z
    .object({
      easting: numberCell(true, decimalComma),
      northing: numberCell(true, decimalComma),
      depth: numberCell(depthRequired, decimalComma),
      probe: numberCell(false, decimalComma),
      elevation: numberCell(present.elevation && !present.depth, decimalComma),
    })
    .superRefine((row, context) => {
      if (row.depth < 0) {
        context.addIssue({ code: "custom", path: ["depth"], message: "is negative; water depth is measured downward from the water surface" });
      }
      if (row.probe < 0) {
        context.addIssue({ code: "custom", path: ["probe"], message: "is negative; probe depth is measured downward from the water surface" });
      }
      if (row.probe < row.depth) {
        context.addIssue({
          code: "custom",
          path: ["probe"],
          message: `is shallower than the water depth (${row.depth}); the probe cannot stop above the bottom`,
        });
      }
      if (present.depth && present.elevation && Number.isNaN(row.depth) && Number.isNaN(row.elevation)) {
        context.addIssue({ code: "custom", path: ["depth"], message: "is empty and so is elevation; one of them is required" });
      }
    });
}

type Delimiter = "," | ";" | "\t" | "|";

function detectDelimiter(headerLine: string): Delimiter {
  const separator = /^\ufeff?sep=([,;|\t])\r?$/i.exec(headerLine);
  if (separator) return separator[1] as Delimiter;
  const counts = { ",": 0, ";": 0, "\t": 0, "|": 0 };
  let inQuotes = false;
  for (const character of headerLine) {
    if (character === '"') inQuotes = !inQuotes;
    else if (!inQuotes && (character === "," || character === ";" || character === "\t" || character === "|")) counts[character]++;
  }
  if (counts["\t"] >= counts[","] && counts["\t"] >= counts[";"] && counts["\t"] > 0) return "\t";
  if (counts["|"] > counts[","] && counts["|"] > counts[";"]) return "|";
  return counts[";"] > counts[","] ? ";" : ",";
}

const DELIMITER_WORDS: Record<Delimiter, string> = { ",": "commas (,)", ";": "semicolons (;)", "\t": "tabs", "|": "vertical bars (|)" };

export interface SoundingCsvParser {
  /** Feed the next piece of the file; pieces may split rows anywhere. */
  push(chunk: string): void;
  /**
   * Feed the next piece of the file as UTF-8 bytes; pieces may split rows (and characters)
   * anywhere. Do not mix with `push` in one parse.
   */
  pushBytes(chunk: Uint8Array): void;
  /** A hint before the first piece: about this many data rows are coming (room is made for them at once). */
  expectRows(rows: number): void;
  /** No more input: parse what is left and return the columns. */
  end(): ParsedSoundings;
}

export function createSoundingCsvParser(options: SoundingCsvOptions = {}): SoundingCsvParser {
  const settings = soundingCsvOptionsSchema.parse(options);
  const maxErrors = settings.maxErrors ?? 1000;
  const easting = new Float64Builder();
  const northing = new Float64Builder();
  const depth = new Float64Builder();
  const probe = new Float64Builder();
  const elevation = new Float64Builder();
  const sourceRows: number[] = [];
  const times: string[] = [];
  const ids: string[] = [];
  const errors: SoundingRowError[] = [];

  let pending = "";
  let scanFrom = 0;
  let inQuotes = false;
  let started = false;
  let delimiter: Delimiter = settings.delimiter ?? ",";
  let recordNumber = 0; // records seen so far, header included: the spreadsheet row of the last one
  let rowCount = 0;
  let headers: string[] | null = null;
  let columnIndex: Record<SoundingField, number> | null = null;
  let schema: ReturnType<typeof rowSchema> | null = null;
  let fileError = false;

  function addError(error: SoundingRowError) {
    if (errors.length < maxErrors) errors.push(error);
  }

  function readHeader(cells: string[]) {
    headers = cells.map((cell) => cell.trim());
    const lower = headers.map((header) => header.toLowerCase());
    const index = {} as Record<SoundingField, number>;
    // Fields the caller marked as not in the file (null): no column, not even a same-named one.
    const absent = (field: SoundingField) => settings.columns?.[field] === null;
    for (const field of soundingFields) {
      const wanted = settings.columns?.[field];
      if (wanted === null) {
        index[field] = -1;
        continue;
      }
      const names = wanted ? [wanted.toLowerCase()] : soundingHeaderNames[field];
      index[field] = lower.findIndex((header) => names.includes(header));
      if (wanted && index[field] < 0) {
        fileError = true;
        addError({ row: 1, column: wanted, value: "", message: `the header row has no column named "${wanted}" (mapped to ${fieldWords[field]})` });
      }
    }
    const missing = (field: SoundingField) =>
      addError({
        row: 1,
        column: field,
        value: "",
        message: absent(field)
          ? `the ${fieldWords[field]} is required, but it was marked as not in the file; map it to one of the file's columns`
          : `the header row has no ${fieldWords[field]} column; name it ${soundingHeaderNames[field].map((name) => `"${name}"`).join(" or ")} or map it`,
      });
    for (const field of ["easting", "northing"] as const) {
      if (index[field] < 0 && !settings.columns?.[field]) {
        fileError = true;
        missing(field);
      }
    }
    if (index.depth < 0 && index.elevation < 0 && !settings.columns?.depth) {
      fileError = true;
      missing("depth");
    }
    columnIndex = index;
    const present = Object.fromEntries(soundingFields.map((field) => [field, index[field] >= 0])) as Record<SoundingField, boolean>;
    schema = rowSchema(present, delimiter !== ",");
  }

  function readRecord(cells: string[]) {
    recordNumber++;
    if (cells.every((cell) => cell.trim() === "")) return; // blank line: keeps its row number, not a sounding
    if (headers === null) {
      // A first line such as "sep=;" (spreadsheet programs write it) names the delimiter: not the header.
      if (/^sep=[,;|\t]?$/i.test(cells.join(delimiter).trim())) return;
      readHeader(cells);
      return;
    }
    rowCount++;
    if (fileError || columnIndex === null || schema === null) return;
    const index = columnIndex;
    // A row cut short (fewer values than the header has columns) is one problem, not "easting is empty".
    const needed = Math.max(index.easting, index.northing, index.depth >= 0 ? index.depth : index.elevation);
    if (cells.length <= needed && cells.length < headers.length) {
      const line = cells.join(delimiter);
      const other = (Object.keys(DELIMITER_WORDS) as Delimiter[]).find((candidate) => candidate !== delimiter && line.includes(candidate));
      addError({
        row: recordNumber, column: "", value: line.slice(0, 80),
        message: `has ${cells.length} value${cells.length === 1 ? "" : "s"} where the header has ${headers.length} columns${other ? `: its values seem to be separated by ${DELIMITER_WORDS[other]}, not ${DELIMITER_WORDS[delimiter]} like the header's` : ""}`,
      });
      return;
    }
    const cell = (field: SoundingField) => (index[field] >= 0 ? (cells[index[field]] ?? "") : "");
    const raw = {
      easting: cell("easting"),
      northing: cell("northing"),
      depth: cell("depth"),
      probe: cell("probe"),
      elevation: cell("elevation"),
    };
    const result = schema.safeParse(raw);
    if (!result.success) {
      for (const issue of result.error.issues) {
        const field = (issue.path[0] ?? "depth") as SoundingField;
        const header = index[field] >= 0 ? headers[index[field]] : field;
        addError({ row: recordNumber, column: header, value: raw[field as keyof typeof raw] ?? "", message: `${fieldWords[field]} ${issue.message}` });
      }
      return;
    }
    const row = result.data;
    easting.push(row.easting);
    northing.push(row.northing);
    depth.push(row.depth);
    probe.push(row.probe);
    elevation.push(row.elevation);
    sourceRows.push(recordNumber);
    if (index.time >= 0) times.push(cell("time").trim());
    if (index.id >= 0) ids.push(cell("id").trim());
  }

  function parseComplete(text: string) {
    if (text === "") return;
    Papa.parse<string[]>(text, {
      delimiter,
      header: false,
      skipEmptyLines: false,
      step: (results) => readRecord(results.data),
    });
  }

  function push(chunk: string) {
    if (!started) {
      if (chunk === "") return;
      started = true;
      if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1); // byte-order mark from spreadsheet exports
    }
    pending += chunk;
    // Hand Papa Parse only whole records: cut after the last line break that is outside quotes.
    let lastBreak = -1;
    for (let position = scanFrom; position < pending.length; position++) {
      const code = pending.charCodeAt(position);
      if (code === 34) inQuotes = !inQuotes;
      else if (code === 10 && !inQuotes) lastBreak = position;
    }
    scanFrom = pending.length;
    if (lastBreak < 0) return;
    let complete = pending.slice(0, lastBreak + 1);
    pending = pending.slice(lastBreak + 1);
    scanFrom = pending.length;
    if (headers === null && settings.delimiter === undefined) {
      delimiter = detectDelimiter(complete.slice(0, complete.indexOf("\n")));
    }
    // Drop the final line break so Papa Parse does not report a phantom empty record.
    complete = complete.endsWith("\r\n") ? complete.slice(0, -2) : complete.slice(0, -1);
    if (complete === "" || complete === "\r") recordNumber++; // a lone blank line still takes a row number
    else parseComplete(complete);
  }

  // ---- bytes -------------------------------------------------------------------------------
  // Until a quote shows up, whole lines are read from the bytes; a line the fast reader does not
  // take (see `fastLine`) is decoded and split like Papa Parse splits an unquoted line, then read
  // by `readRecord` as any text line is. From a quote on, the rest of the file goes the text way
  // (a quoted field may hold a delimiter or a line break).
  const decoder = new TextDecoder("utf-8", { ignoreBOM: true });
  const cellDecoder = new TextDecoder("utf-8", { ignoreBOM: true });
  let byteMode = true;
  let byteTail: Uint8Array | null = null;
  /** Per column of the file: which number field it holds (0 easting … 4 elevation, see `fastValues`), −1 none. */
  let numberSlot: Int8Array | null = null;
  const fastValues = new Float64Array(5);
  let fastRequired: boolean[] = [];
  let fastPresent: boolean[] = [];
  let timeColumn = -1;
  let idColumn = -1;
  let expectedRows = 0;

  function prepareFastLines() {
    const index = columnIndex!;
    numberSlot = new Int8Array(Math.max(headers!.length, 1)).fill(-1);
    const fields = ["easting", "northing", "depth", "probe", "elevation"] as const;
    fields.forEach((field, slot) => {
      if (index[field] >= 0) numberSlot![index[field]] = slot;
    });
    const present = (field: SoundingField) => index[field] >= 0;
    fastPresent = fields.map(present);
    fastRequired = [true, true, !present("elevation"), false, present("elevation") && !present("depth")];
    timeColumn = index.time;
    idColumn = index.id;
    // Room for every row at once for the columns that are returned (the depth always is).
    if (expectedRows > 0) {
      for (const [slot, builder] of [easting, northing, depth, probe, elevation].entries()) if (slot === 2 || fastPresent[slot]) builder.reserve(expectedRows);
    }
  }

  /** A line the byte reader does not take: decoded and split as Papa Parse splits an unquoted line. */
  function slowLine(bytes: Uint8Array, start: number, end: number) {
    readRecord(cellDecoder.decode(bytes.subarray(start, end)).split(delimiter));
  }

  /**
   * Reads the whole lines of `bytes` from `position` (one loop, so it is optimised early even on a
   * small file). Returns where it stopped: the end of the last whole line, or −1 − the start of a
   * line holding a quote (from there the text way).
   */
  function readLines(bytes: Uint8Array, position: number): number {
    const delimiterCode = delimiter.charCodeAt(0);
    const decimalComma = delimiter !== ",";
    const slots = numberSlot!;
    const index = columnIndex!;
    const needed = Math.max(index.easting, index.northing, index.depth >= 0 ? index.depth : index.elevation);
    const columns = headers!.length;
    const easy = !fileError;
    lines: for (;;) {
      const lineEnd = bytes.indexOf(10, position);
      if (lineEnd < 0) return position;
      const start = position;
      const end = lineEnd > start && bytes[lineEnd - 1] === 13 ? lineEnd - 1 : lineEnd;
      position = lineEnd + 1;
      if (!easy) {
        if (bytes.subarray(start, end).includes(34)) return -1 - start;
        slowLine(bytes, start, end);
        continue;
      }
      fastValues.fill(Number.NaN);
      let column = 0;
      let cellStart = start;
      let timeStart = -1, timeEnd = -1, idStart = -1, idEnd = -1;
      let cellEnd = start;
      for (;;) {
        // One cell: [cellStart, cellEnd).
        while (cellEnd < end) {
          const byte = bytes[cellEnd];
          if (byte === delimiterCode) break;
          if (byte === 34) return -1 - start;
          cellEnd++;
        }
        const slot = column < slots.length ? slots[column] : -1;
        if (slot >= 0) {
          if (cellEnd === cellStart) {
            if (fastRequired[slot]) {
              slowLine(bytes, start, end);
              continue lines;
            }
          } else {
            // [+-]digits[.digits] (a comma for the point when the delimiter is not a comma): read
            // exactly, as Number() would (an integer of at most 15 digits over a power of ten up to
            // 10^22 are both exact doubles, and one division rounds correctly). Anything else: text way.
            let cursor = cellStart;
            let negative = false;
            const first = bytes[cursor];
            if (first === 45 || first === 43) {
              negative = first === 45;
              cursor++;
            }
            let mantissa = 0;
            let digits = 0;
            let fraction = 0;
            let point = false;
            for (; cursor < cellEnd; cursor++) {
              const byte = bytes[cursor];
              if (byte >= 48 && byte <= 57) {
                mantissa = mantissa * 10 + (byte - 48);
                digits++;
                if (point) fraction++;
              } else if (!point && (byte === 46 || (decimalComma && byte === 44))) point = true;
              else {
                slowLine(bytes, start, end);
                continue lines;
              }
            }
            if (digits === 0 || digits > 15) {
              slowLine(bytes, start, end);
              continue lines;
            }
            const value = mantissa / POWERS_OF_TEN[fraction];
            fastValues[slot] = negative ? -value : value;
          }
        } else if (column === timeColumn) {
          timeStart = cellStart;
          timeEnd = cellEnd;
        } else if (column === idColumn) {
          idStart = cellStart;
          idEnd = cellEnd;
        }
        column++;
        if (cellEnd >= end) break;
        cellEnd++;
        cellStart = cellEnd;
      }
      const eastingValue = fastValues[0], northingValue = fastValues[1], depthValue = fastValues[2], probeValue = fastValues[3], elevationValue = fastValues[4];
      // A row cut short is one problem with its own message, and a row that fails a check of
      // `rowSchema` gets that check's message: the text way.
      if (
        (column <= needed && column < columns) ||
        depthValue < 0 || probeValue < 0 || probeValue < depthValue ||
        (fastPresent[2] && fastPresent[4] && Number.isNaN(depthValue) && Number.isNaN(elevationValue))
      ) {
        slowLine(bytes, start, end);
        continue;
      }
      recordNumber++;
      rowCount++;
      easting.push(eastingValue);
      northing.push(northingValue);
      depth.push(depthValue);
      // A column not in the file is not returned: nothing to keep.
      if (fastPresent[3]) probe.push(probeValue);
      if (fastPresent[4]) elevation.push(elevationValue);
      sourceRows.push(recordNumber);
      if (timeColumn >= 0) times.push(timeStart < 0 ? "" : cellDecoder.decode(bytes.subarray(timeStart, timeEnd)).trim());
      if (idColumn >= 0) ids.push(idStart < 0 ? "" : cellDecoder.decode(bytes.subarray(idStart, idEnd)).trim());
    }
  }

  function pushBytes(chunk: Uint8Array) {
    if (!byteMode) {
      push(decoder.decode(chunk, { stream: true }));
      return;
    }
    let bytes = chunk;
    if (byteTail !== null) {
      bytes = new Uint8Array(byteTail.length + chunk.length);
      bytes.set(byteTail);
      bytes.set(chunk, byteTail.length);
      byteTail = null;
    }
    let position = 0;
    // The header (and a "sep=" line before it) the text way, a whole line at a time.
    while (headers === null) {
      const lineEnd = bytes.indexOf(10, position);
      if (lineEnd < 0) {
        byteTail = bytes.slice(position);
        return;
      }
      const line = bytes.subarray(position, lineEnd + 1);
      position = lineEnd + 1;
      push(decoder.decode(line, { stream: true }));
      if (line.includes(34)) return textFrom(bytes, position);
    }
    if (numberSlot === null) prepareFastLines();
    const stopped = readLines(bytes, position);
    if (stopped < 0) return textFrom(bytes, -1 - stopped);
    if (stopped < bytes.length) byteTail = bytes.slice(stopped);
  }

  /** From `position` on, the text way. */
  function textFrom(bytes: Uint8Array, position: number) {
    byteMode = false;
    if (position < bytes.length) push(decoder.decode(bytes.subarray(position), { stream: true }));
  }

  function end(): ParsedSoundings {
    if (byteTail !== null) {
      // The last line, without a line break: the text way.
      push(decoder.decode(byteTail, { stream: true }));
      byteTail = null;
    }
    const rest = decoder.decode();
    if (rest !== "") push(rest);
    if (pending !== "") {
      if (headers === null && settings.delimiter === undefined) delimiter = detectDelimiter(pending.split("\n")[0]);
      parseComplete(pending.replace(/\r?\n$/, ""));
      pending = "";
    }
    if (headers === null) {
      addError({ row: 1, column: "", value: "", message: "the file is empty; a header row is required" });
    }
    const index = columnIndex;
    return {
      easting: easting.toArray(),
      northing: northing.toArray(),
      depth: depth.toArray(),
      probe: index && index.probe >= 0 ? probe.toArray() : null,
      elevation: index && index.elevation >= 0 ? elevation.toArray() : null,
      time: index && index.time >= 0 ? times : null,
      id: index && index.id >= 0 ? ids : null,
      sourceRow: Uint32Array.from(sourceRows),
      errors,
      rowCount,
      delimiter,
    };
  }

  return {
    push,
    pushBytes,
    end,
    expectRows: (rows: number) => {
      expectedRows = rows;
    },
  };
}

/** Exact powers of ten for the byte reader's plain numbers. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, power) => 10 ** power);

/** The whole file as UTF-8 bytes (as read from disk): the fast way, same result as `parseSoundingsCsv` of its text. */
export function parseSoundingsCsvBytes(bytes: Uint8Array, options: SoundingCsvOptions = {}): ParsedSoundings {
  const parser = createSoundingCsvParser(options);
  // Data rows: the lines after the header (the last may lack its line break).
  let lines = bytes.length > 0 && bytes[bytes.length - 1] !== 10 ? 1 : 0;
  for (let position = bytes.indexOf(10); position >= 0; position = bytes.indexOf(10, position + 1)) lines++;
  parser.expectRows(Math.max(0, lines - 1));
  parser.pushBytes(bytes);
  return parser.end();
}

export function parseSoundingsCsv(text: string, options: SoundingCsvOptions = {}): ParsedSoundings {
  const parser = createSoundingCsvParser(options);
  parser.push(text);
  return parser.end();
}
