import { describe, expect, it } from "vitest";
import { checkRows } from "./row-checks";

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
