import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvField, csvLine, csvNumber, csvText, startsLikeFormula } from "./csv-safe";

// Source for every rule below: OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection):
// fields starting with = + - @ tab or carriage return are prefixed with a single quote, each field
// is wrapped in double quotes and embedded double quotes are doubled. Quoting per RFC 4180.

describe("formula-injection escaping", () => {
  it.each(["=1+1", "+1", "-2+3", "@SUM(A1:A9)", "\t=1", "\r=1", '=HYPERLINK("http://x","y")'])("neutralises %j", (text) => {
    // published: OWASP CSV Injection (the six trigger characters)
    expect(startsLikeFormula(text)).toBe(true);
    const field = csvText(text);
    const [parsed] = Papa.parse<string[]>(field, { header: false }).data[0];
    expect(parsed).toBe(`'${text}`);
    expect(startsLikeFormula(parsed)).toBe(false);
  });

  it("leaves ordinary text alone apart from quoting", () => {
    // published: OWASP CSV Injection (only the trigger characters are prefixed); RFC 4180 quoting
    expect(csvText("Vent basin")).toBe('"Vent basin"');
    expect(csvText('a "b", c')).toBe('"a ""b"", c"');
    expect(csvText("")).toBe('""');
    expect(startsLikeFormula("1=1")).toBe(false);
  });

  it("keeps a separator inside text in one cell", () => {
    // published: RFC 4180 §2 (fields containing commas, quotes or line breaks are quoted)
    const line = csvLine(["x,=1", 2.5, null, "-1", 4]);
    const rows = Papa.parse<string[]>(line.trimEnd()).data;
    expect(rows).toEqual([["x,=1", "2.500", "", "'-1", "4"]]);
  });

  it("writes numbers as numbers, negative ones included, and no data as empty", () => {
    // practice: computed figures are numbers, not text, so they are not prefixed
    expect(csvNumber(-3.25, 2)).toBe("-3.25");
    expect(csvField(12.3456, 1)).toBe("12.3");
    expect(csvNumber(-7)).toBe("-7");
    expect(csvNumber(Number.NaN)).toBe("");
    expect(csvNumber(Number.POSITIVE_INFINITY)).toBe("");
    expect(csvLine([1, "a"]).endsWith("\r\n")).toBe(true);
  });
});
