import { describe, expect, it } from "vitest";
import { guessColumns, headerUnit, normaliseHeader } from "./column-guess";
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

describe("delimiters as crews' files write them (practice)", () => {
  it("reads semicolons even when some rows end with a stray one", () => {
    const shape = sniffFileShape("easting;northing;depth\n600072.43;1679945.81;3.81;\n600072.67;1679948.29;3.83\n600072.55;1679950.43;3.86\n");
    expect(shape).toMatchObject({ delimiter: ";", decimalComma: false, headers: ["easting", "northing", "depth"] });
  });

  it("reads vertical bars and tabs, decimal commas with either", () => {
    expect(sniffFileShape("easting|northing|depth\n600072,43|1679945,81|3,81\n")).toMatchObject({ delimiter: "|", decimalComma: true });
    expect(sniffFileShape("easting\tnorthing\tdepth\n600072,43\t1679945,81\t3,81\n")).toMatchObject({ delimiter: "\t", decimalComma: true });
  });

  it("takes the delimiter from a first line such as sep=; and skips it", () => {
    const shape = sniffFileShape("sep=;\neasting;northing;depth\n600072,43;1679945,81;3,81\n");
    expect(shape).toMatchObject({ delimiter: ";", separatorLine: true, headers: ["easting", "northing", "depth"] });
  });
});

describe("header spellings and units (practice: exports of field software and spreadsheets)", () => {
  it("guesses East_ft, North_ft, Sounding_ft and friends", () => {
    expect(guessColumns(["PT", "East_ft", "North_ft", "Sounding_ft", "Probe_ft", "Date_Time"]).mapping).toEqual({ id: "PT", easting: "East_ft", northing: "North_ft", depth: "Sounding_ft", probe: "Probe_ft", time: "Date_Time" });
    expect(guessColumns(["Easting (m)", "Northing (m)", "Depth_ft", "Elev"]).mapping).toEqual({ easting: "Easting (m)", northing: "Northing (m)", depth: "Depth_ft", elevation: "Elev" });
    expect(guessColumns(["X", "Y", "Z"]).mapping).toEqual({ easting: "X", northing: "Y", elevation: "Z" });
    expect(guessColumns(["Point No", "WaterDepth", "RefusalDepth [ftUS]", "TimeStamp"]).mapping).toEqual({ id: "Point No", depth: "WaterDepth", probe: "RefusalDepth [ftUS]", time: "TimeStamp" });
  });

  it("recognises longitude/latitude spellings, also beside X/Y-free exports", () => {
    for (const [lon, lat] of [["Long", "Lat"], ["LON_DD", "LAT_DD"], ["lng", "lat"], ["Longitude (deg)", "Latitude (deg)"]]) {
      expect(guessColumns([lat, lon, "Depth"]), lon).toMatchObject({ mapping: { easting: lon, northing: lat, depth: "Depth" }, lonLat: true });
    }
  });

  it("reads the unit a header carries", () => {
    expect(["East_ft", "Easting (m)", "Depth [ftUS]", "depth_us_ft", "Elev_NAVD88_ft", "LAT_DD", "Depth", "Time"].map(headerUnit)).toEqual(["ft", "m", "us-ft", "us-ft", "ft", "degrees", null, null]);
  });

  it("the project's last accepted mapping wins over a guess and says which fields it gave", () => {
    const guess = guessColumns(["Depth", "Sounding_ft", "E", "N"], { depth: "Sounding_ft" });
    expect(guess.mapping.depth).toBe("Sounding_ft");
    expect(guess.remembered).toEqual(["depth"]);
  });
});
