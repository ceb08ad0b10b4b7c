/**
 * CSV fields that a spreadsheet cannot run as formulas. Following the OWASP "CSV Injection"
 * guidance: a text field that begins with `=`, `+`, `-`, `@`, a tab (0x09) or a carriage return
 * (0x0D) is prefixed with a single quote so the spreadsheet shows it as text; every text field is
 * wrapped in double quotes and its own double quotes are doubled (RFC 4180), so a separator inside
 * the text cannot start a new cell. Numbers we computed are written as numbers (a negative volume
 * stays a number, not a formula).
 */

const FORMULA_TRIGGERS = new Set(["=", "+", "-", "@", "\t", "\r"]);

/** True when a spreadsheet would read `text` as the start of a formula. */
export function startsLikeFormula(text: string): boolean {
  return text.length > 0 && FORMULA_TRIGGERS.has(text[0]);
}

/** One text field, escaped and quoted. */
export function csvText(text: string): string {
  const neutralised = startsLikeFormula(text) ? `'${text}` : text;
  return `"${neutralised.replaceAll('"', '""')}"`;
}

/** One number field: integers (counts, rows) as they are, others to `fractionDigits`; NaN and infinities (no data) empty. */
export function csvNumber(value: number, fractionDigits = 3): string {
  if (!Number.isFinite(value)) return "";
  if (Number.isInteger(value)) return String(value);
  return value.toFixed(fractionDigits);
}

export type CsvValue = string | number | null;

/** A field of either kind; null is an empty field. */
export function csvField(value: CsvValue, fractionDigits = 3): string {
  if (value === null) return "";
  return typeof value === "number" ? csvNumber(value, fractionDigits) : csvText(value);
}

/** One CSV line (CRLF-terminated, RFC 4180). */
export function csvLine(values: readonly CsvValue[], fractionDigits = 3): string {
  return `${values.map((value) => csvField(value, fractionDigits)).join(",")}\r\n`;
}
