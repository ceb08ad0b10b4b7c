/**
 * Looks at the start of a sounding file to tell how it is written: byte-order mark, delimiter,
 * whether the first row is a header, decimal comma, and the first rows for the mapping table.
 * Pure: the first few kilobytes of text in, a description out.
 */
export type Delimiter = "," | ";" | "\t";

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
  const first = lines[0] ?? "";
  const candidates: Delimiter[] = ["\t", ";", ","];
  // The delimiter is the candidate that splits the first lines into the same, largest number of cells.
  let delimiter: Delimiter = ",";
  let best = 0;
  for (const candidate of candidates) {
    const counts = lines.slice(0, 5).map((line) => countOutsideQuotes(line, candidate));
    const consistent = counts.every((count) => count === counts[0]);
    if (counts[0] > best && consistent) {
      best = counts[0];
      delimiter = candidate;
    }
  }
  const rows = lines.map((line) => splitLine(line, delimiter));
  const firstCells = rows[0] ?? [];
  const hasHeader = firstCells.length > 0 && firstCells.some((cell) => cell !== "" && !NUMBER.test(cell));
  const headers = hasHeader ? firstCells : firstCells.map((_, index) => `column ${index + 1}`);
  const dataRows = rows.slice(hasHeader ? 1 : 0, (hasHeader ? 1 : 0) + sampleRows);
  const decimalComma = delimiter === ";" && dataRows.some((row) => row.some((cell) => /^[+-]?\d+,\d+$/.test(cell)));
  return { hasBom, delimiter, decimalComma, hasHeader, headers, firstRows: dataRows };
}
