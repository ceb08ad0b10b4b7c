import { describe, expect, it } from "vitest";
import { searchCrs, type CrsEntry } from "./search";

// Names and codes as the EPSG registry publishes them (published: epsg.org), a few of each kind.
const ENTRIES: CrsEntry[] = [
  { code: 2236, name: "NAD83 / Florida East (ftUS)", unit: "US survey foot", area: "United States (USA) - Florida - counties of Brevard; Broward." },
  { code: 2237, name: "NAD83 / Florida West (ftUS)", unit: "US survey foot", area: "United States (USA) - Florida - counties of Charlotte; Citrus." },
  { code: 2238, name: "NAD83 / Florida North (ftUS)", unit: "US survey foot", area: "United States (USA) - Florida - counties of Alachua; Baker." },
  { code: 3511, name: "NAD83(NSRS2007) / Florida East", unit: "metre", area: "United States (USA) - Florida - counties of Brevard; Broward." },
  { code: 26917, name: "NAD83 / UTM zone 17N", unit: "metre", area: "North America - between 84°W and 78°W - onshore and offshore." },
  { code: 32617, name: "WGS 84 / UTM zone 17N", unit: "metre", area: "Between 84°W and 78°W, northern hemisphere between equator and 84°N." },
  { code: 22, name: "Imaginary short code", unit: "metre", area: "" },
];

describe("searching the EPSG list", () => {
  it("finds a CRS by its code, with or without the EPSG: prefix, the exact code first (published codes)", () => {
    expect(searchCrs(ENTRIES, "2237").map((match) => match.code)).toEqual([2237]);
    expect(searchCrs(ENTRIES, "EPSG:2237")[0]).toMatchObject({ code: 2237, matchedBy: "code" });
    // Codes beginning with the digits, shortest first (computed from the list above).
    expect(searchCrs(ENTRIES, "epsg 22").map((match) => match.code)).toEqual([22, 2236, 2237, 2238]);
  });

  it("finds a CRS by words of its name in any case, those in the query's order first", () => {
    // Both hold the words in order; the shorter name first (computed).
    expect(searchCrs(ENTRIES, "Florida East").map((match) => match.code)).toEqual([2236, 3511]);
    expect(searchCrs(ENTRIES, "east florida").map((match) => match.code).sort()).toEqual([2236, 3511]);
    expect(searchCrs(ENTRIES, "utm 17n").map((match) => match.code)).toEqual([26917, 32617]);
    expect(searchCrs(ENTRIES, "flor w")[0].code).toBe(2237);
  });

  it("falls back to the area of use, ranked after names", () => {
    expect(searchCrs(ENTRIES, "Brevard").map((match) => [match.code, match.matchedBy])).toEqual([[2236, "area"], [3511, "area"]]);
    // A name match outranks an area match.
    expect(searchCrs(ENTRIES, "florida").every((match) => match.matchedBy === "name")).toBe(true);
  });

  it("finds nothing for a blank query or words that begin no word (negative control)", () => {
    expect(searchCrs(ENTRIES, "   ")).toEqual([]);
    expect(searchCrs(ENTRIES, "Florida Middle")).toEqual([]);
    expect(searchCrs(ENTRIES, "99999")).toEqual([]);
  });

  it("returns at most the limit", () => {
    expect(searchCrs(ENTRIES, "nad83", 2)).toHaveLength(2);
  });
});
