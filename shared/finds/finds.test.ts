import { describe, expect, it } from "vitest";
import { cellIndex, cellPolygon, fromGridFrame, type CellGrid } from "../grid/cell-grid";
import { amountText, basketTotals, agenciesToNotify, catalogueNumber, cellsWithinRadius, DEFAULT_HOLD_RADIUS_M, defaultCataloguePrefix, instantToLocalDateTime, localDateTimeToInstant, localYear, PERMIT_HOLD_DIAMETER_M } from "./finds";

const grid: CellGrid = { originX: 1000, originY: 2000, cellSize: 10, rotationDegrees: 0, firstCol: 0, firstRow: 0, cols: 30, rows: 30 };
const everywhere = () => true;

/** Distance from a point to a convex polygon (ring), brute force from its edges: independent of the grid frame. */
function distanceToRing(x: number, y: number, ring: number[][]): number {
  let inside = false;
  let best = Infinity;
  for (let index = 0; index < ring.length - 1; index++) {
    const [ax, ay] = ring[index];
    const [bx, by] = ring[index + 1];
    if (ay > y !== by > y && x < ((bx - ax) * (y - ay)) / (by - ay) + ax) inside = !inside;
    const length2 = (bx - ax) ** 2 + (by - ay) ** 2;
    const t = Math.max(0, Math.min(1, ((x - ax) * (bx - ax) + (y - ay) * (by - ay)) / length2));
    best = Math.min(best, Math.hypot(x - (ax + t * (bx - ax)), y - (ay + t * (by - ay))));
  }
  return inside ? 0 : best;
}

describe("hold cells", () => {
  it("the default radius is half the permit condition's 100-metre diameter", () => {
    // Source: published permit general and special conditions (REFERENCES.md, cultural finds on state lands).
    expect(PERMIT_HOLD_DIAMETER_M).toBe(100);
    expect(DEFAULT_HOLD_RADIUS_M).toBe(50);
  });

  it("a point at a cell centre with a radius under half a cell holds that cell alone", () => {
    expect(cellsWithinRadius(grid, 1000 + 55, 2000 + 75, 4.99, everywhere).map((cell) => cell.label)).toEqual(["F8"]);
  });

  it("a radius just past half a cell reaches the four edge neighbours, not the corners", () => {
    // From the centre of a 10-unit cell, the edge neighbours are 5 away and the diagonal ones 5√2 ≈ 7.07.
    expect(cellsWithinRadius(grid, 1055, 2075, 5.01, everywhere)).toHaveLength(5);
    expect(cellsWithinRadius(grid, 1055, 2075, 7.08, everywhere)).toHaveLength(9);
  });

  for (const rotationDegrees of [0, 33]) {
    it(`agrees with a brute-force point-to-polygon distance on a grid rotated ${rotationDegrees}°`, () => {
      const rotated = { ...grid, rotationDegrees };
      const radius = 50;
      const [x, y] = fromGridFrame(rotated, 150.3, 147.8);
      const held = new Set(cellsWithinRadius(rotated, x, y, radius, everywhere).map((cell) => `${cell.row},${cell.col}`));
      let expected = 0;
      for (let row = -5; row < 35; row++) {
        for (let col = -5; col < 35; col++) {
          const within = cellIndex(rotated, row, col) >= 0 && distanceToRing(x, y, cellPolygon(rotated, row, col)) <= radius;
          if (within) expected++;
          expect(held.has(`${row},${col}`), `${row},${col}`).toBe(within);
        }
      }
      // Closed-form bounds: the cells held cover the disc (area ≥ πr²) and lie within r + s√2 of the point.
      const cellArea = grid.cellSize ** 2;
      expect(expected).toBeGreaterThanOrEqual((Math.PI * radius ** 2) / cellArea);
      expect(expected).toBeLessThanOrEqual((Math.PI * (radius + grid.cellSize * Math.SQRT2) ** 2) / cellArea);
    });
  }

  it("keeps only cells the caller says are inside the work limit", () => {
    const all = cellsWithinRadius(grid, 1055, 2075, 20, everywhere);
    const some = cellsWithinRadius(grid, 1055, 2075, 20, (index) => index % 2 === 0);
    expect(some.length).toBeGreaterThan(0);
    expect(some.length).toBeLessThan(all.length);
  });
});

describe("catalogue numbers and notices", () => {
  it("writes prefix, year and a four-digit sequence", () => {
    expect(catalogueNumber("SSR", 2026, 7)).toBe("SSR-2026-0007");
    expect(catalogueNumber("SSR", 2026, 12345)).toBe("SSR-2026-12345");
  });
  it("derives a prefix from the slug's words", () => {
    expect(defaultCataloguePrefix("silver-spring-run")).toBe("SSR");
    expect(defaultCataloguePrefix("lake")).toBe("LAK");
  });
  it("human remains are told to three agencies, a cultural find to one, others to none", () => {
    expect(agenciesToNotify("human-remains")).toHaveLength(3);
    expect(agenciesToNotify("cultural")).toEqual(["historic-preservation-office"]);
    expect(agenciesToNotify("faunal")).toEqual([]);
  });
});

describe("the catalogue year", () => {
  it("is the project's local year, not UTC's", () => {
    // 2027-01-01T03:00Z is still 31 December 2026 in New York (UTC−5 in winter).
    expect(localYear(new Date("2027-01-01T03:00:00Z"), "America/New_York")).toBe(2026);
    expect(localYear(new Date("2027-01-01T03:00:00Z"), "UTC")).toBe(2027);
  });
});

describe("project wall-clock times", () => {
  it("reads a form's local time in the project's zone, across daylight saving", () => {
    // US Eastern: UTC−4 in July (EDT), UTC−5 after the first Sunday of November (EST); 2026's change is 1 November.
    expect(localDateTimeToInstant("2026-07-01T10:00", "America/New_York")?.toISOString()).toBe("2026-07-01T14:00:00.000Z");
    expect(localDateTimeToInstant("2026-11-03T10:42", "America/New_York")?.toISOString()).toBe("2026-11-03T15:42:00.000Z");
    expect(localDateTimeToInstant("2026-11-03T10:42", "UTC")?.toISOString()).toBe("2026-11-03T10:42:00.000Z");
    expect(localDateTimeToInstant("2026-02-30T10:00", "UTC")).toBeNull();
    expect(localDateTimeToInstant("yesterday", "UTC")).toBeNull();
  });
  it("writes an instant back as the same wall-clock time (round trip)", () => {
    for (const local of ["2026-07-01T10:00", "2026-11-03T10:42", "2026-12-31T23:59"]) {
      expect(instantToLocalDateTime(localDateTimeToInstant(local, "America/New_York")!, "America/New_York")).toBe(local.replace("T", " "));
    }
  });
});

describe("basket lines' amounts", () => {
  it("says a count, a volume as measured, or both", () => {
    expect(amountText({ count: 14, volume: null })).toBe("14");
    expect(amountText({ count: null, volume: { value: 2.5, unit: "gal" } })).toBe("2.5 gal");
    expect(amountText({ count: 3, volume: { value: 0.75, unit: "ft3" } })).toBe("3 · 0.75 ft³");
    expect(amountText({ count: 1200, volume: null })).toBe("1,200");
  });
  it("adds volumes measured in different units in the project's unit", () => {
    // computed: 1 ft³ = 1728/231 gal = 7.48052 gal; 2 gal + 1 ft³ + 3.785411784 L (1 gal) = 10.48 gal
    const lines = [{ count: 4, volume: { value: 2, unit: "gal" as const } }, { count: null, volume: { value: 1, unit: "ft3" as const } }, { count: 2, volume: { value: 3.785411784, unit: "L" as const } }, { count: 5, volume: null }];
    expect(basketTotals(lines, "us-ft")).toEqual({ lines: 4, items: 11, volume: { value: 10.48, unit: "gal" } });
    // published (NIST SP 811): 2 gal = 7.570823568 L, 1 ft³ = 28.316846592 L; with 3.785411784 L the sum is 39.67 L
    expect(basketTotals(lines, "m").volume).toEqual({ value: 39.67, unit: "L" });
  });
  it("gives no volume when no line was measured by volume", () => {
    expect(basketTotals([{ count: 2, volume: null }], "m")).toEqual({ lines: 1, items: 2, volume: null });
    expect(basketTotals([], "ft")).toEqual({ lines: 0, items: 0, volume: null });
  });
});
