/**
 * Looks at the start of a sounding file to tell how it is written: byte-order mark, delimiter,
 * whether the first row is a header, decimal comma, and the first rows for the mapping table.
 * Pure: the first few kilobytes of text in, a description out.
 */
export type Delimiter = "," | ";" | "\t" | "|";

/** The delimiter in the crew's words: "semicolons (;)". */
export function delimiterName(delimiter: string): string {
  return delimiter === "\t" ? "tabs" : delimiter === ";" ? "semicolons (;)" : delimiter === "|" ? "vertical bars (|)" : "commas (,)";
}

/** A first line such as `sep=;`, which spreadsheet programs write to name the delimiter. */
export const SEPARATOR_LINE = /^sep=([,;|\t])$/i;

export interface FileShape {
  hasBom: boolean;
  delimiter: Delimiter;
  /** Comma as the decimal mark (only with ";" delimiters, as spreadsheets in many European locales write; the engine reads it so). */
  decimalComma: boolean;
  hasHeader: boolean;
  /** The header row's names, or "column 1", "column 2", … when the file has none. */
  headers: string[];
  /** Up to `sampleRows` data rows, split into cells. */
  firstRows: string[][];
  /** The file starts with a `sep=` line naming its delimiter (it is skipped). */
  separatorLine?: boolean;
}

function splitLine(line: string, delimiter: Delimiter): string[] {
  const cells: string[] = [];
  let cell = "";
  let inQuotes = false;
  for (let position = 0; position < line.length; position++) {
    const character = line[position];
    if (character === '"') {
      if (inQuotes && line[position + 1] === '"') {
        cell += '"';
        position++;
      } else inQuotes = !inQuotes;
    } else if (character === delimiter && !inQuotes) {
      cells.push(cell);
      cell = "";
    } else cell += character;
  }
  cells.push(cell);
  return cells.map((value) => value.trim());
}

function countOutsideQuotes(line: string, character: string): number {
  let count = 0;
  let inQuotes = false;
  for (const current of line) {
    if (current === '"') inQuotes = !inQuotes;
    else if (!inQuotes && current === character) count++;
  }
  return count;
}

const NUMBER = /^[+-]?(\d+[.,]?\d*|[.,]\d+)([eE][+-]?\d+)?$/;

export function sniffFileShape(head: string, sampleRows = 8): FileShape {
  const hasBom = head.charCodeAt(0) === 0xfeff;
  const text = hasBom ? head.slice(1) : head;
  // The last line of a partial read may be cut off: keep whole lines only when there are several.
  let lines = text.split(/\r?\n/);
  if (lines.length > 1 && !/\r?\n$/.test(text)) lines = lines.slice(0, -1);
  lines = lines.filter((line) => line.trim() !== "");
  const separator = SEPARATOR_LINE.exec(lines[0]?.trim() ?? "");
  if (separator) lines = lines.slice(1);
  const delimiter = separator ? (separator[1] as Delimiter) : detectDelimiter(lines.slice(0, 20));
  const rows = lines.map((line) => splitLine(line, delimiter));
  const firstCells = rows[0] ?? [];
  const hasHeader = firstCells.length > 0 && firstCells.some((cell) => cell !== "" && !NUMBER.test(cell));
  const headers = hasHeader ? firstCells : firstCells.map((_, index) => `column ${index + 1}`);
  const dataRows = rows.slice(hasHeader ? 1 : 0, (hasHeader ? 1 : 0) + sampleRows);
  const decimalComma = delimiter !== "," && dataRows.some((row) => row.some((cell) => /^[+-]?\d+,\d+$/.test(cell)));
  return { hasBom, delimiter, decimalComma, hasHeader, headers, firstRows: dataRows, ...(separator ? { separatorLine: true } : {}) };
}

/**
 * The delimiter is the candidate that splits the first line (the header) into more than one cell
 * and most of the next lines into as many; a delimiter at the end of a line (an empty last cell)
 * does not count. Ties go to the candidate that splits into more cells. A file of decimal commas
 * and semicolons is so read as semicolons: its header holds no comma.
 */
function detectDelimiter(lines: string[]): Delimiter {
  const candidates: Delimiter[] = ["\t", ";", "|", ","];
  let best: { delimiter: Delimiter; share: number; cells: number } | null = null;
  for (const candidate of candidates) {
    const counts = lines.map((line) => countOutsideQuotes(line.trimEnd().endsWith(candidate) && candidate !== "\t" ? line.trimEnd().slice(0, -1) : line, candidate));
    const headerCount = counts[0] ?? 0;
    if (headerCount === 0) continue;
    const rest = counts.slice(1);
    const share = rest.length === 0 ? 1 : rest.filter((count) => count === headerCount).length / rest.length;
    if (share < 0.6) continue;
    if (!best || share > best.share + 1e-9 || (Math.abs(share - best.share) < 1e-9 && headerCount > best.cells)) best = { delimiter: candidate, share, cells: headerCount };
  }
  return best?.delimiter ?? ",";
}
