import { describe, expect, it } from "vitest";
import { linearScale, niceStep, niceTicks, spreadLabels } from "./chart-scale";

describe("chart scales", () => {
  it("maps the domain's ends onto the range's ends and is linear between", () => {
    // computed: a linear map sends d0→r0, d1→r1 and the midpoint to the midpoint
    const scale = linearScale([0, 200], [300, 20]);
    expect(scale(0)).toBe(300);
    expect(scale(200)).toBe(20);
    expect(scale(100)).toBe(160);
    expect(linearScale([5, 5], [0, 10])(5)).toBe(5);
  });

  it("picks 1, 2 or 5 times a power of ten and covers the maximum", () => {
    // practice: round-number axes (1-2-5 series)
    expect(niceStep(8600)).toBe(2000);
    expect(niceStep(0.37)).toBe(0.1);
    expect(niceTicks(8600)).toEqual([0, 2000, 4000, 6000, 8000, 10000]);
    expect(niceTicks(0)).toEqual([0, 1]);
    for (const max of [1, 3.3, 47, 999, 12345]) {
      const ticks = niceTicks(max);
      expect(ticks[ticks.length - 1]).toBeGreaterThanOrEqual(max); // invariant: the axis reaches the data
      expect(ticks.length).toBeLessThanOrEqual(11);
    }
  });
});

describe("outline paths", () => {
  it("fits a square into the width, keeps the aspect and writes whole units", async () => {
    const { fitOutlineFrame, ringsPath } = await import("./outline-svg");
    // computed: at the equator cos(0) = 1, so a 0.01° square stays square: 1000 − 2·10 wide and as high
    const ring: Array<[number, number]> = [[0, 0], [0.01, 0], [0.01, 0.01], [0, 0.01], [0, 0]];
    const frame = fitOutlineFrame([ring], 1000, 10);
    expect(frame.height).toBe(1000);
    const [topX, topY] = frame.project(0, 0.01);
    const [bottomX, bottomY] = frame.project(0.01, 0);
    expect([topX, topY]).toEqual([10, 10]);
    expect(bottomX).toBeCloseTo(990, 9);
    expect(bottomY).toBeCloseTo(990, 4); // cos(0.005°) = 1 − 4e-9: a few millionths of a unit taller
    expect(ringsPath(frame, [ring])).toBe("M10 990L990 990L990 10L10 10L10 990Z");
    // computed: at 60° latitude a degree of longitude is cos 60° = half a degree of latitude wide
    const wide = fitOutlineFrame([[[0, 60], [0.02, 60], [0.02, 60.01], [0, 60.01]]], 1000, 0);
    expect(Math.abs(wide.height - 1000 * (0.01 / (0.02 * Math.cos(((60 + 60.01) / 2) * Math.PI / 180))))).toBeLessThanOrEqual(0.5); // whole units, rounded
  });
});

describe("spreadLabels", () => {
  // Invariants (no external source needed): order kept, gaps at least minGap, untouched when already apart.
  it("leaves labels that are already apart where they are", () => {
    expect(spreadLabels([10, 40, 80], 12)).toEqual([10, 40, 80]);
  });
  it("pushes overlapping labels apart, keeping their order", () => {
    const placed = spreadLabels([100, 98, 30], 12);
    expect(placed[2]).toBe(30);
    expect(placed[1]).toBe(98);
    expect(placed[0]).toBe(110);
  });
  it("moves the block back inside the upper bound when there is room below", () => {
    const placed = spreadLabels([195, 196, 197], 12, 0, 200);
    const sorted = [...placed].sort((a, b) => a - b);
    expect(sorted[2]).toBeLessThanOrEqual(200);
    expect(sorted[1] - sorted[0]).toBeGreaterThanOrEqual(12);
    expect(sorted[2] - sorted[1]).toBeGreaterThanOrEqual(12);
  });
});
