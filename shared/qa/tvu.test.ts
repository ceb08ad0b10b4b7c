import { describe, expect, it } from "vitest";
import { convertLength } from "../units";
import { TVU_COEFFICIENTS, allowedTvu, allowedTvuM, surveyOrderSchema } from "./tvu";

describe("IHO S-44 ed. 6.0.0 (2020) total vertical uncertainty", () => {
  it("holds the table 1 coefficients", () => {
    // published: IHO S-44 ed. 6.0.0, table 1
    expect(TVU_COEFFICIENTS.exclusive).toEqual({ aM: 0.15, b: 0.0075 });
    expect(TVU_COEFFICIENTS.special).toEqual({ aM: 0.25, b: 0.0075 });
    expect(TVU_COEFFICIENTS["1a"]).toEqual({ aM: 0.5, b: 0.013 });
    expect(TVU_COEFFICIENTS["1b"]).toEqual({ aM: 0.5, b: 0.013 });
    expect(TVU_COEFFICIENTS["2"]).toEqual({ aM: 1.0, b: 0.023 });
  });

  it("Special order at 5 m: 0.252797 m", () => {
    // computed from S-44: √(0.25² + (0.0075 × 5)²)
    expect(Math.abs(allowedTvuM("special", 5) - 0.252797)).toBeLessThan(1e-6);
    expect(allowedTvuM("special", 5)).toBeCloseTo(Math.sqrt(0.0625 + 0.0375 ** 2), 15);
  });

  it("Order 1a at 40 m: 0.721388 m", () => {
    // computed from S-44: √(0.5² + (0.013 × 40)²)
    expect(Math.abs(allowedTvuM("1a", 40) - 0.721388)).toBeLessThan(1e-6);
    expect(allowedTvuM("1a", 40)).toBeCloseTo(Math.sqrt(0.25 + 0.52 ** 2), 15);
  });

  it("reduces to a at zero depth and grows with depth", () => {
    // computed: TVU(0) = a
    expect(allowedTvuM("exclusive", 0)).toBe(0.15);
    expect(allowedTvuM("2", 100)).toBeGreaterThan(allowedTvuM("2", 10));
  });

  it("works in project feet by converting the depth to metres", () => {
    // computed: 5 m in US survey feet gives the Special-order 0.252797 m back in US survey feet
    const depthFt = convertLength(5, "m", "us-ft");
    const tvuFt = allowedTvu("special", depthFt, "us-ft");
    expect(convertLength(tvuFt, "us-ft", "m")).toBeCloseTo(0.252797, 6);
    expect(allowedTvu("1a", 40, "m")).toBeCloseTo(allowedTvuM("1a", 40), 15);
  });

  it("validates an order at the boundary", () => {
    expect(surveyOrderSchema.safeParse("3").success).toBe(false);
  });
});
