import { describe, expect, it } from "vitest";
import { createSoundingCsvParser, parseSoundingsCsv } from "./parse-csv";

// Row numbers are spreadsheet rows (practice: a technician opens the CSV in a spreadsheet, where
// the header is row 1), so the first data row is row 2.

describe("parseSoundingsCsv", () => {
  it("reads comma-separated columns by header name, case-insensitively", () => {
    const parsed = parseSoundingsCsv("Easting,NORTHING,Depth,Probe_Depth\n100.5,200,3.2,5.1\n101,201,3.4,\n");
    expect(Array.from(parsed.easting)).toEqual([100.5, 101]);
    expect(Array.from(parsed.northing)).toEqual([200, 201]);
    expect(Array.from(parsed.depth)).toEqual([3.2, 3.4]);
    expect(parsed.probe?.[0]).toBe(5.1);
    expect(Number.isNaN(parsed.probe?.[1])).toBe(true); // empty probe cell → NaN, not an error
    expect(parsed.errors).toEqual([]);
    expect(parsed.rowCount).toBe(2);
    expect(Array.from(parsed.sourceRow)).toEqual([2, 3]);
  });

  it("detects semicolons with decimal commas, tabs, and strips a byte-order mark", () => {
    const semicolon = parseSoundingsCsv("\uFEFFx;y;water_depth\r\n1,5;2,25;3,75\r\n");
    expect(semicolon.delimiter).toBe(";");
    expect([semicolon.easting[0], semicolon.northing[0], semicolon.depth[0]]).toEqual([1.5, 2.25, 3.75]);
    const tab = parseSoundingsCsv("x\ty\tdepth\n1\t2\t3\n");
    expect(tab.delimiter).toBe("\t");
    expect(tab.depth[0]).toBe(3);
  });

  it("leaves out a field mapped to null (not in the file), even when a column has its built-in name", () => {
    // The technician said the "probe" column is not a probe depth: it must not be read as one,
    // nor checked against the depth (its 1.0 would otherwise be "shallower than the water depth").
    const text = "easting,northing,depth,probe,time\n100,200,3.2,1.0,t1\n101,201,3.4,junk,t2\n";
    const ignored = parseSoundingsCsv(text, { columns: { probe: null, time: null } });
    expect(ignored.probe).toBeNull();
    expect(ignored.time).toBeNull();
    expect(ignored.errors).toEqual([]);
    expect(Array.from(ignored.depth)).toEqual([3.2, 3.4]);
    // Without the mapping the same column is read, and its values fail the rules.
    const read = parseSoundingsCsv(text);
    expect(read.probe).not.toBeNull();
    expect(read.errors.map((error) => error.row)).toEqual([2, 3]);
  });

  it("a required field marked as not in the file is a file problem, not a fallback to its built-in name", () => {
    const parsed = parseSoundingsCsv("easting,northing,depth\n100,200,3.2\n", { columns: { easting: null } });
    expect(parsed.errors).toEqual([{ row: 1, column: "easting", value: "", message: expect.stringMatching(/easting is required, but it was marked as not in the file/) }]);
    expect(parsed.easting.length).toBe(0);
    // Depth marked absent is fine when the file has elevations, and an error when it has not.
    const elevations = parseSoundingsCsv("x,y,depth,elevation\n1,2,3,40.5\n", { columns: { depth: null } });
    expect(elevations.errors).toEqual([]);
    expect(Array.from(elevations.elevation!)).toEqual([40.5]);
    expect(Number.isNaN(elevations.depth[0])).toBe(true);
    const neither = parseSoundingsCsv("x,y,depth\n1,2,3\n", { columns: { depth: null } });
    expect(neither.errors[0].message).toMatch(/water depth is required, but it was marked as not in the file/);
  });

  it("accepts an explicit column mapping, and keeps time and point id text", () => {
    const parsed = parseSoundingsCsv("E_ft,N_ft,Sounding,Point_ID,time\n1,2,3,P-7,2031-04-02T09:15\n", {
      columns: { easting: "e_ft", northing: "N_FT", depth: "sounding" },
    });
    expect([parsed.easting[0], parsed.northing[0], parsed.depth[0]]).toEqual([1, 2, 3]);
    expect(parsed.id).toEqual(["P-7"]);
    expect(parsed.time).toEqual(["2031-04-02T09:15"]);
  });

  it("reports bad cells by spreadsheet row and column in plain words", () => {
    const text = [
      "easting,northing,depth,probe",
      "1,2,3,4", // row 2 fine
      "abc,2,3,4", // row 3 not a number
      "", // row 4 blank line: skipped, keeps its number
      "1,,3,4", // row 5 empty northing
      "1,2,-3,4", // row 6 negative depth
      "1,2,5,4.5", // row 7 probe above the bottom
    ].join("\n");
    const parsed = parseSoundingsCsv(text);
    expect(parsed.rowCount).toBe(5);
    expect(parsed.easting.length).toBe(1);
    const byRow = Object.fromEntries(parsed.errors.map((error) => [error.row, error]));
    expect(byRow[3]).toMatchObject({ column: "easting", value: "abc" });
    expect(byRow[3].message).toMatch(/not a number/);
    expect(byRow[5]).toMatchObject({ column: "northing", value: "" });
    expect(byRow[5].message).toMatch(/empty/);
    expect(byRow[6]).toMatchObject({ column: "depth", value: "-3" });
    expect(byRow[6].message).toMatch(/negative/);
    expect(byRow[7]).toMatchObject({ column: "probe", value: "4.5" });
    expect(byRow[7].message).toMatch(/shallower than the water depth/);
  });

  it("names a missing required column against the header row", () => {
    const parsed = parseSoundingsCsv("easting,northing,probe\n1,2,3\n");
    expect(parsed.errors[0]).toMatchObject({ row: 1, column: "depth" });
    expect(parsed.errors[0].message).toMatch(/water depth/);
    expect(parsed.easting.length).toBe(0);
  });

  it("gives the same result fed in arbitrary chunks as in one string", () => {
    const rows = ["x,y,depth,probe"];
    for (let index = 0; index < 500; index++) rows.push(`${1000 + index * 0.5},${2000 - index},${(index % 17) / 3},${index % 5 === 0 ? "" : 9}`);
    rows.push('"1,5",2,3,4'); // a quoted cell with the delimiter inside: one bad row, still one row
    const text = rows.join("\r\n") + "\r\n";
    const whole = parseSoundingsCsv(text);
    const parser = createSoundingCsvParser();
    for (let start = 0; start < text.length; start += 37) parser.push(text.slice(start, start + 37));
    const chunked = parser.end();
    expect(Array.from(chunked.easting)).toEqual(Array.from(whole.easting));
    expect(Array.from(chunked.depth)).toEqual(Array.from(whole.depth));
    expect(chunked.errors).toEqual(whole.errors);
    expect(whole.errors).toHaveLength(1);
    expect(whole.errors[0]).toMatchObject({ row: 502, column: "x", value: "1,5" });
    expect(whole.rowCount).toBe(501);
  });
});

describe("rows cut short (practice: a row written with another delimiter)", () => {
  it("is one problem naming the delimiter, never \"easting is empty\"", () => {
    const parsed = parseSoundingsCsv("easting;northing;depth\n600072.43;1679945.81;3.81\n600072.67,1679948.29,3.83\n", { delimiter: ";" });
    expect(parsed.errors).toEqual([{ row: 3, column: "", value: "600072.67,1679948.29,3.83", message: "has 1 value where the header has 3 columns: its values seem to be separated by commas (,), not semicolons (;) like the header's" }]);
    expect(parsed.sourceRow).toEqual(Uint32Array.from([2]));
  });

  it("skips a first line sep=; and numbers rows as the spreadsheet does", () => {
    const parsed = parseSoundingsCsv("sep=;\neasting;northing;depth\n600072,43;1679945,81;3,81\n");
    expect(parsed.errors).toEqual([]);
    expect(parsed.sourceRow).toEqual(Uint32Array.from([3]));
    expect(parsed.easting[0]).toBe(600072.43);
  });
});
