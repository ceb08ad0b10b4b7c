import { describe, expect, it } from "vitest";
import { findBottomShift } from "./bottom-shift";

// Closed-form bins: 20 cells whose earlier bottom is 28 ft with firm sand at 24 ft (4 ft of muck).
const keys = Array.from({ length: 20 }, (_, index) => `${index},0`);
const bins = (value: (index: number) => number) => new Map(keys.map((key, index) => [key, value(index)]));
const previousBottom = bins(() => 28);
const previousRefusal = bins(() => 24);
const base = { previousBottom, previousRefusal, unit: "us-ft" as const, measure: "depth" as const, waterSurfaceElevation: 0, datum: "NAVD88" };

describe("findBottomShift", () => {
  it("holds a bottom 32 ft down everywhere (water surface 0 for 32) and names the likely water surface", () => {
    // computed: depths of 4–5 ft under a water surface of 0 give a bottom of −4…−5, 32–33 ft below 28 and 28 ft below firm sand.
    const shift = findBottomShift({ ...base, given: bins((index) => -4 - (index % 2)) })!;
    expect(shift.direction).toBe("down");
    expect(shift.medianShift).toBeCloseTo(-32.5, 9);
    expect(shift.likelyWaterSurface).toBeCloseTo(32.5, 9);
    expect(shift.message).toBe(
      "The bottom in this file lies a median 32.5 ftUS lower than the earlier surveys of the same 20 cells, and below firm sand (where the probe stopped) in 100 % of them: far more than dredging could remove. " +
      "A whole bottom moving at once is what a wrong water-surface elevation does: 0.00 ftUS was entered, and about 32.5 ftUS would put the bottom where the earlier surveys found it. " +
      "Check the staff-gauge reading for the survey day (and that it is on the project's datum, NAVD88), correct it and check again, or confirm that the bottom really moved.",
    );
  });

  it("says nothing of a dredge pass, however deep, that stays above firm sand", () => {
    // practice: a pass that takes 1–4 ft of the 4 ft of muck.
    expect(findBottomShift({ ...base, waterSurfaceElevation: 32, given: bins((index) => 27 - (index % 4)) })).toBeNull();
  });

  it("without probe readings only a cut deeper than 10 ft counts, and a rise of more than 2 ft", () => {
    const noFirm = { ...base, previousRefusal: new Map<string, number>() };
    expect(findBottomShift({ ...noFirm, given: bins(() => 20) })).toBeNull(); // 8 ft: a deep pass, possible
    expect(findBottomShift({ ...noFirm, given: bins(() => 10) })?.direction).toBe("down");
    const up = findBottomShift({ ...noFirm, measure: "elevation", waterSurfaceElevation: null, given: bins(() => 31) })!;
    expect(up.direction).toBe("up");
    expect(up.likelyWaterSurface).toBeNull();
    expect(up.message).toMatch(/higher than the earlier surveys of the same 20 cells in 100 % of them: far more than sediment settles back between passes\. A whole bottom moving at once is what elevations on another vertical datum do/);
  });

  it("needs five cells in common and most of them beyond what dredging explains", () => {
    expect(findBottomShift({ ...base, given: new Map(keys.slice(0, 4).map((key) => [key, -4])) })).toBeNull();
    expect(findBottomShift({ ...base, given: bins((index) => (index < 10 ? -4 : 27)) })).toBeNull(); // half the cells: not a whole-bottom shift
  });
});
