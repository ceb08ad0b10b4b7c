import { describe, expect, it } from "vitest";
import { FEET_PER_METRE, METRES_PER_FOOT, METRES_PER_US_SURVEY_FOOT } from "../units";
import { binKey, binMedians, findDepthUnitMistake, type DepthUnitCheckInput } from "./depth-unit-mistakes";

// Synthetic bins: the expectation is what earlier surveys leave there; the file's values are built
// from it with the factor of the mistake under test. Source of the factors: NIST SP 811 (2008)
// appendix B (1 ft = 0.3048 m exactly, the 1959 international yard and pound agreement) and NIST,
// 85 FR 62698 (2020) for the US survey foot (1200/3937 m).

/** A fixed pseudo-random sequence so the cells differ but the test is repeatable. */
function sequence(count: number, seed = 7): number[] {
  let state = seed;
  return Array.from({ length: count }, () => {
    state = (state * 1103515245 + 12345) % 2 ** 31;
    return state / 2 ** 31;
  });
}

function bins(values: number[]): Map<string, number> {
  return new Map(values.map((value, index) => [`${index},0`, value]));
}

const noise = sequence(40);
/** Expected depths of 6–14 ft over 40 cells. */
const expectedDepths = noise.map((r) => 6 + 8 * r);
/** The same cells after a dredge pass: 0–2.5 ft deeper, differently in each cell. */
const dredged = expectedDepths.map((depth, index) => depth + 2.5 * sequence(40, 11)[index]);

function check(given: number[], expected: number[], overrides: Partial<DepthUnitCheckInput> = {}) {
  return findDepthUnitMistake({ measure: "depth", given: bins(given), expected: bins(expected), declaredUnit: "ft", projectUnit: "ft", ...overrides });
}

describe("depth unit mistakes", () => {
  it("names the exact factors", () => {
    expect(METRES_PER_FOOT).toBe(0.3048);
    expect(FEET_PER_METRE).toBeCloseTo(3.280839895, 9);
    // 85 FR 62698: the US survey foot is 1200/3937 m = 0.3048006096012192 m.
    expect(METRES_PER_US_SURVEY_FOOT).toBeCloseTo(0.3048006096012192, 15);
  });

  it("says nothing when the depths agree with the earlier surveys, dredged or not", () => {
    expect(check(expectedDepths, expectedDepths)).toBeNull();
    expect(check(dredged, expectedDepths)).toBeNull();
  });

  it("finds metres declared as feet: every depth 3.2808 times too small", () => {
    const mistake = check(dredged.map((depth) => depth * METRES_PER_FOOT), expectedDepths);
    expect(mistake?.kind).toBe("metres-as-feet");
    expect(mistake!.typicalRatio).toBeGreaterThan(0.3);
    expect(mistake!.typicalRatio).toBeLessThan(0.4);
    expect(mistake!.cellsCompared).toBe(40);
    expect(mistake!.message).toMatch(/look like metres, not international feet as declared/);
    expect(mistake!.message).toMatch(/times smaller than/);
    expect(mistake!.message).toMatch(/multiplied by 3\.28/);
    expect(mistake!.message).toMatch(/Choose metres as the file's unit/);
  });

  it("finds feet declared as metres in a feet project (the conversion made them 3.2808 times too large)", () => {
    const mistake = check(dredged.map((depth) => depth * FEET_PER_METRE), expectedDepths, { declaredUnit: "m", projectUnit: "us-ft" });
    expect(mistake?.kind).toBe("feet-as-metres");
    expect(mistake!.factor).toBeCloseTo(3.2808, 4);
    expect(mistake!.message).toMatch(/look like feet, not metres as declared.*about 3\.\d\d times larger/);
  });

  it("finds tenths of a foot and centimetres", () => {
    expect(check(dredged.map((depth) => depth * 10), expectedDepths)?.kind).toBe("tenths");
    const metres = expectedDepths.map((depth) => depth * METRES_PER_FOOT);
    const centimetres = check(metres.map((depth) => depth * 100), metres, { declaredUnit: "m", projectUnit: "m" });
    expect(centimetres?.kind).toBe("hundredths");
    expect(centimetres!.message).toMatch(/look like centimetres/);
    expect(check(metres.map((depth) => depth * 10), metres, { declaredUnit: "m", projectUnit: "m" })?.kind).toBe("tenths");
  });

  it("judges a file of bottom elevations against the earlier bottom elevations", () => {
    const bottoms = noise.map((r) => 40 + 6 * r);
    const mistake = check(bottoms.map((elevation) => (elevation - 1) * METRES_PER_FOOT), bottoms, { measure: "elevation" });
    expect(mistake?.kind).toBe("metres-as-feet");
    expect(mistake!.message).toMatch(/The elevations look like metres/);
    expect(check(bottoms.map((elevation) => elevation - 1.5), bottoms, { measure: "elevation" })).toBeNull();
  });

  it("says nothing with too few cells in common, or when no factor fits", () => {
    expect(check(dredged.slice(0, 4).map((depth) => depth * METRES_PER_FOOT), expectedDepths.slice(0, 4))).toBeNull();
    // Depths that disagree by no single factor (a different site, say) are not a unit mistake.
    const scattered = expectedDepths.map((depth, index) => depth * (0.2 + 5 * sequence(40, 3)[index]));
    expect(check(scattered, expectedDepths)).toBeNull();
    // Cells left dry by a lower water surface are not compared.
    expect(check(dredged.map((depth) => depth * METRES_PER_FOOT), expectedDepths.map(() => -1))).toBeNull();
  });

  it("bins points by squares from the origin and takes each bin's median", () => {
    expect(binKey(10, 25, 20)).toBe("0,1");
    expect(binKey(-1, 0, 20)).toBe("-1,0");
    expect(binKey(110, 100, 20, 100, 100)).toBe("0,0");
    const medians = binMedians([1, 2, 3, 25, Number.NaN], [1, 2, 3, 1, 1], [5, 7, 100, 2, 9], 20);
    expect(medians.get("0,0")).toBe(7);
    expect(medians.get("1,0")).toBe(2);
    expect(medians.size).toBe(2);
  });
});
