import { describe, expect, it } from "vitest";
import { countFinite, finiteValues } from "./finite";

describe("finite values of a column", () => {
  // computed by hand: NaN and ±Infinity are left out, the others keep their order
  const column = Float64Array.from([3, Number.NaN, 1, Number.POSITIVE_INFINITY, 4, 1, Number.NEGATIVE_INFINITY, 5, 9]);

  it("counts and copies every finite value", () => {
    expect(countFinite(column)).toBe(6);
    expect(Array.from(finiteValues(column))).toEqual([3, 1, 4, 1, 5, 9]);
  });

  it("takes every step-th finite value, counted among the finite ones", () => {
    expect(Array.from(finiteValues(column, 2))).toEqual([3, 4, 5]);
    expect(Array.from(finiteValues(column, 4))).toEqual([3, 5]);
    expect(Array.from(finiteValues([Number.NaN], 3))).toEqual([]);
  });
});
