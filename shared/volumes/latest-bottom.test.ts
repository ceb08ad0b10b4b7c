import { describe, expect, it } from "vitest";
import { noSurvey, stackLatestBottom } from "./latest-bottom";

describe("latest bottom", () => {
  it("takes the newest survey covering each node and falls back to older ones", () => {
    const grid = { originX: 0, originY: 0, spacing: 1, cols: 4, rows: 1 };
    const baseline = Float64Array.of(-3, -3, -3, Number.NaN);
    const firstPass = Float64Array.of(-4, -4, Number.NaN, Number.NaN);
    const secondPass = Float64Array.of(-5, Number.NaN, Number.NaN, Number.NaN);
    // practice: a progress survey covers only the cells worked since the last pass.
    const latest = stackLatestBottom(grid, [secondPass, firstPass, baseline]);
    expect(Array.from(latest.values.slice(0, 3))).toEqual([-5, -4, -3]);
    expect(Number.isNaN(latest.values[3])).toBe(true);
    expect(Array.from(latest.source)).toEqual([0, 1, 2, noSurvey]);
  });
});
