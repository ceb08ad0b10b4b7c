import { describe, expect, it } from "vitest";
import { soundingElevations } from "./elevations";
import { parseSoundingsCsv } from "./parse-csv";

// Hand-written cases; depths and probe depths are read downward from the water surface
// (practice; DESIGN.md, step 1), so elevation = water surface − depth and refusal elevation =
// water surface − probe depth. NaN stands for a missing reading.
const readings = (depth: number[], probe: number[] | null, elevation: number[] | null) => ({
  depth: Float64Array.from(depth),
  probe: probe && Float64Array.from(probe),
  elevation: elevation && Float64Array.from(elevation),
});

describe("soundingElevations", () => {
  it("elevation = water surface − depth, refusal = water surface − probe depth", () => {
    const { elevation, refusalElevation } = soundingElevations(readings([3, 4.25, 0], [5, 7.5, 0.5], null), 12.5);
    // closed form: 12.5 − 3 = 9.5, 12.5 − 4.25 = 8.25, 12.5 − 0 = 12.5 (a sounding at the water's edge)
    expect(Array.from(elevation)).toEqual([9.5, 8.25, 12.5]);
    // closed form: 12.5 − 5 = 7.5, 12.5 − 7.5 = 5, 12.5 − 0.5 = 12
    expect(Array.from(refusalElevation!)).toEqual([7.5, 5, 12]);
    // invariant: muck thickness = probe − depth = elevation − refusal elevation
    for (let index = 0; index < 3; index++) expect(elevation[index] - refusalElevation![index]).toBeCloseTo([2, 3.25, 0.5][index], 12);
  });

  it("a water surface below the datum gives elevations below it: −2 − 3 = −5", () => {
    const { elevation, refusalElevation } = soundingElevations(readings([3], [4], null), -2);
    expect(elevation[0]).toBe(-5); // closed form: −2 − 3
    expect(refusalElevation![0]).toBe(-6); // closed form: −2 − 4
  });

  it("a file's bottom elevation wins row by row; depth fills in where the elevation cell is empty", () => {
    const { elevation } = soundingElevations(readings([3, 4], null, [Number.NaN, -10]), 12.5);
    expect(elevation[0]).toBe(9.5); // closed form: 12.5 − 3
    expect(elevation[1]).toBe(-10); // given
  });

  it("a non-finite file elevation counts as missing", () => {
    const { elevation } = soundingElevations(readings([3, 3], null, [Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]), 10);
    expect(Array.from(elevation)).toEqual([7, 7]); // closed form: 10 − 3
  });

  it("missing readings stay missing: no depth and no elevation, no probe, no probe column", () => {
    const { elevation, refusalElevation } = soundingElevations(readings([Number.NaN, 2], [6, Number.NaN], [Number.NaN, Number.NaN]), 10);
    expect(elevation[0]).toBeNaN(); // neither a depth nor an elevation
    expect(elevation[1]).toBe(8); // closed form: 10 − 2
    // The probe is read from the water surface, so it needs no depth: 10 − 6 = 4.
    expect(refusalElevation![0]).toBe(4);
    expect(refusalElevation![1]).toBeNaN(); // no probe reading on this row
    expect(soundingElevations(readings([1], null, null), 0).refusalElevation).toBeNull();
  });

  it("without a water surface, elevations come from the file and refusal from each row's own surface (elevation + depth)", () => {
    // Row 1: surface = −10 + 3 = −7, so refusal = −7 − 5 = −12 = −10 − (5 − 3).
    // Row 2: no elevation and no surface: nothing to start from.
    // Row 3: an elevation but no depth: the probe's surface is unknown.
    const { elevation, refusalElevation } = soundingElevations(readings([3, 4, Number.NaN], [5, 6, 6], [-10, Number.NaN, -9]), null);
    expect(elevation[0]).toBe(-10);
    expect(elevation[1]).toBeNaN();
    expect(elevation[2]).toBe(-9);
    expect(refusalElevation![0]).toBe(-12);
    expect(refusalElevation![1]).toBeNaN();
    expect(refusalElevation![2]).toBeNaN();
  });

  it("reads the parser's columns as they come: an empty probe cell is NaN, a file without elevations has none", () => {
    const parsed = parseSoundingsCsv("x,y,depth,probe\n0,0,3,5\n1,0,4,\n");
    const { elevation, refusalElevation } = soundingElevations(parsed, 12.5);
    expect(Array.from(elevation)).toEqual([9.5, 8.5]); // closed form: 12.5 − 3, 12.5 − 4
    expect(refusalElevation![0]).toBe(7.5); // closed form: 12.5 − 5
    expect(refusalElevation![1]).toBeNaN();
  });
});
