import { describe, expect, it } from "vitest";
import { guessColumns, normaliseHeader } from "./column-guess";
import { sniffFileShape } from "./sniff";

describe("sniffFileShape", () => {
  it("reads a comma file with a header", () => {
    const shape = sniffFileShape("point_id,easting,northing,depth\nA,1.5,2.5,3\nB,1.6,2.6,3.1\n");
    expect(shape).toMatchObject({ hasBom: false, delimiter: ",", decimalComma: false, hasHeader: true, headers: ["point_id", "easting", "northing", "depth"] });
    expect(shape.firstRows).toEqual([["A", "1.5", "2.5", "3"], ["B", "1.6", "2.6", "3.1"]]);
  });

  it("finds a byte-order mark, semicolons and decimal commas (European spreadsheet export)", () => {
    const shape = sniffFileShape("\ufeffeasting;northing;depth\r\n600072,43;1679945,81;3,81\r\n");
    expect(shape).toMatchObject({ hasBom: true, delimiter: ";", decimalComma: true, headers: ["easting", "northing", "depth"] });
  });

  it("tells a headerless file and names its columns", () => {
    const shape = sniffFileShape("600072.4\t1679945.8\t3.81\n600072.6\t1679948.2\t3.83\n");
    expect(shape).toMatchObject({ delimiter: "\t", hasHeader: false, headers: ["column 1", "column 2", "column 3"] });
    expect(shape.firstRows).toHaveLength(2);
  });

  it("does not split on delimiters inside quotes", () => {
    expect(sniffFileShape('id,"note, with comma",depth\n1,"a, b",3\n').headers).toEqual(["id", "note, with comma", "depth"]);
  });
});

describe("guessColumns", () => {
  it("maps the usual header names, units in brackets ignored", () => {
    expect(normaliseHeader(" Depth (ft) ")).toBe("depth");
    const { mapping, lonLat } = guessColumns(["Point", "X", "Y", "Depth (ft)", "Probe_Depth", "Time"]);
    expect(mapping).toEqual({ id: "Point", easting: "X", northing: "Y", depth: "Depth (ft)", probe: "Probe_Depth", time: "Time" });
    expect(lonLat).toBe(false);
  });

  it("recognises longitude and latitude", () => {
    const guess = guessColumns(["Longitude", "Latitude", "depth"]);
    expect(guess).toEqual({ mapping: { easting: "Longitude", northing: "Latitude", depth: "depth" }, lonLat: true, remembered: [] });
  });

  it("prefers the project's remembered mapping where the file still has that header", () => {
    expect(guessColumns(["E", "N", "WD"], { depth: "WD", probe: "PR" }).mapping).toEqual({ depth: "WD", easting: "E", northing: "N" });
  });

  it("a remembered mapping without a header for a field guesses that field afresh", () => {
    expect(guessColumns(["x", "y", "depth", "probe"], { probe: null }).mapping).toEqual({ easting: "x", northing: "y", depth: "depth", probe: "probe" });
  });
});
