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

describe("outline scale bar", () => {
  it("measures ground distance and picks a round length that fits", async () => {
    const { fitOutlineFrame, scaleBar, METRES_PER_DEGREE } = await import("./outline-svg");
    // computed: 2π × 6,371,008.8 m / 360 = 111,195.08 m per degree of latitude (IUGG mean radius)
    expect(METRES_PER_DEGREE).toBeCloseTo(111_195.08, 1);
    // 0.01° of latitude (1,111.95 m) over 1000 − 2·10 = 980 units: 1.13464 m per unit
    const ring: Array<[number, number]> = [[0, 0], [0.01, 0], [0.01, 0.01], [0, 0.01], [0, 0]];
    const frame = fitOutlineFrame([ring], 1000, 10);
    expect(frame.metresPerUnit).toBeCloseTo(1111.9508 / 980, 5);
    // 250 units = 283.7 m: the longest 1-2-5 length below it is 200 m, drawn 200 / 1.13464 = 176.3 units long
    const metres = scaleBar(frame, 250, "m")!;
    expect(metres.length).toBe(200);
    expect(metres.label).toBe("200 m");
    expect(metres.units).toBeCloseTo(200 / (1111.9508 / 980), 3);
    // in feet: 283.7 m = 930.7 ft → 500 ft, 500 × 0.3048 m = 152.4 m = 134.3 units
    const feet = scaleBar(frame, 250, "ft")!;
    expect([feet.length, feet.label]).toEqual([500, "500 ft"]);
    expect(feet.units).toBeCloseTo(152.4 / (1111.9508 / 980), 3);
    // invariant: the bar never exceeds the room it was given, whatever the room
    for (const room of [3, 17, 99, 250, 640]) expect(scaleBar(frame, room, "ft")!.units).toBeLessThanOrEqual(room);
    // an empty frame has no scale
    expect(scaleBar(fitOutlineFrame([], 1000, 10), 250, "m")).toBeNull();
  });
});

describe("thinPolygons", () => {
  it("keeps about the budget, every ring closed, small rings whole, and only original vertices", async () => {
    const { thinPolygons } = await import("./outline-svg");
    // a 1,001-vertex closed circle and a 5-vertex square: budget 100 → stride ceil(1006 / 100) = 11
    const circle: Array<[number, number]> = Array.from({ length: 1000 }, (_, index) => [Math.cos((index / 1000) * 2 * Math.PI), Math.sin((index / 1000) * 2 * Math.PI)] as [number, number]);
    circle.push(circle[0]);
    const square: Array<[number, number]> = [[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]];
    const [[thinCircle], [thinSquare]] = thinPolygons([[circle], [square]], 100);
    expect(thinSquare).toEqual(square); // too small to thin
    expect(thinCircle.length).toBe(Math.ceil(1000 / 11) + 1); // indices 0, 11, … 990, then the closing vertex
    expect(thinCircle[0]).toEqual(circle[0]);
    expect(thinCircle.at(-1)).toEqual(circle.at(-1)); // still closed
    const originals = new Set(circle.map((point) => point.join(",")));
    expect(thinCircle.every((point) => originals.has(point.join(",")))).toBe(true); // nothing invented
    // within budget: untouched
    expect(thinPolygons([[circle]], 5000)[0][0]).toEqual(circle);
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
