import { describe, expect, it } from "vitest";
import { checkPlausibleRanges, checkRows, plausibleProjectBounds } from "./row-checks";

const base = (depth: number[], easting = depth.map((_, index) => index)) => ({
  sourceRow: Uint32Array.from(depth.map((_, index) => index + 2)),
  easting: Float64Array.from(easting),
  northing: Float64Array.from(depth.map(() => 0)),
  depth: Float64Array.from(depth),
  probe: null,
  elevation: null,
  time: null,
  id: null,
  depthHeader: "depth",
  probeHeader: "probe",
  unit: "ft" as const,
});

describe("checkRows", () => {
  it("flags depths deeper than 100 m, in the file's unit (328.08 ft: 100 / 0.3048, NIST SP 811)", () => {
    const { problems } = checkRows(base([5, 328, 329]));
    expect(problems.map((problem) => problem.row)).toEqual([4]);
    expect(problems[0].rule).toBe("depth range");
  });

  it("flags an exact repeat and names the row it repeats", () => {
    const { problems, duplicateRows } = checkRows(base([5, 6, 5], [1, 2, 1]));
    expect(duplicateRows).toBe(1);
    expect(problems).toEqual([{ row: 4, column: "", value: "", rule: "duplicate row", message: "repeats row 2 exactly; leave one of them out" }]);
  });

  it("does not flag two soundings at one spot with different depths", () => {
    expect(checkRows(base([5, 6], [1, 1])).duplicateRows).toBe(0);
  });
});

describe("checkRows duplicates (hashed)", () => {
  it("finds every repeat in a large file and names the first row each repeats", () => {
    const count = 50_000;
    const easting = Array.from({ length: count }, (_, index) => 1000 + (index % 20_000) * 0.01);
    const depth = Array.from({ length: count }, (_, index) => 5 + (index % 20_000) * 0.001);
    const { problems, duplicateRows } = checkRows(base(depth, easting));
    expect(duplicateRows).toBe(30_000);
    expect(problems[0]).toMatchObject({ row: 20_002, message: "repeats row 2 exactly; leave one of them out" });
    expect(problems.at(-1)).toMatchObject({ row: count + 1, message: `repeats row ${(count - 1) % 20_000 + 2} exactly; leave one of them out` });
  });

  it("tells rows apart by point id and time, treats empty probes as equal and −0 as 0", () => {
    const input = { ...base([5, 5, 5, 5], [0, 0, 0, -0]), id: ["a", "b", "a", "a"], time: ["t", "t", "t", "t"] };
    const { problems } = checkRows(input);
    expect(problems.map((problem) => [problem.row, problem.message])).toEqual([
      [4, "repeats row 2 exactly; leave one of them out"],
      [5, "repeats row 2 exactly; leave one of them out"],
    ]);
  });
});

describe("plausible ranges", () => {
  // An equirectangular stand-in for a projection: 1 unit per degree, so the bounds are closed-form.
  const plateCarree = (lon: number, lat: number): [number, number] => [lon, lat];
  const area = { west: -83, south: 26, east: -81, north: 30 };

  it("widens the area of use by its own width and height on every side", () => {
    expect(plausibleProjectBounds(area, plateCarree)).toEqual({ minX: -85, minY: 22, maxX: -79, maxY: 34 });
    expect(plausibleProjectBounds({ west: 170, south: -50, east: -170, north: -30 }, plateCarree), "across the antimeridian").toBeNull();
    expect(plausibleProjectBounds(null, plateCarree)).toBeNull();
  });

  it("flags infinities, values beyond ±1e7 and points outside the widened area; an empty cell is the parser's", () => {
    const easting = [-82, 1e308, Infinity, -82, -78.9, -84.9, Number.NaN];
    const northing = [28, 28, 28, -1.0000001e7, 28, 33.9, 28];
    const depth = [1, 1, 1, 1, 1, 1, 1];
    const problems = checkPlausibleRanges({
      sourceRow: Uint32Array.from(easting.map((_, index) => index + 2)),
      fileEasting: Float64Array.from(easting), fileNorthing: Float64Array.from(northing),
      projectEasting: Float64Array.from(easting), projectNorthing: Float64Array.from(northing),
      depth: Float64Array.from(depth), probe: Float64Array.from([1, 1, 1, 1, 1, 1, -Infinity]), elevation: null,
      eastingHeader: "x", northingHeader: "y", depthHeader: "depth", probeHeader: "probe", elevationHeader: "z",
      projectBounds: plausibleProjectBounds(area, plateCarree), projectCrs: "EPSG:test",
    });
    expect(problems.map((problem) => [problem.row, problem.column, problem.rule])).toEqual([
      [3, "x", "coordinate range"],
      [4, "x", "coordinate range"],
      [5, "y", "coordinate range"],
      [6, "x", "coordinate range"],
      [8, "probe", "depth range"],
    ]);
  });
});
