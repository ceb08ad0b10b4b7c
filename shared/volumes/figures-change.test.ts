import { describe, expect, it } from "vitest";
import { emptyFigureTotals, type FigureTotals } from "./figure-totals";
import { compareFigures, describeFiguresChange, type FiguresSide } from "./figures-change";

const totals = (values: Partial<FigureTotals>): FigureTotals => ({ ...emptyFigureTotals(), ...values });

describe("compareFigures and describeFiguresChange", () => {
  const before: FiguresSide = {
    totals: totals({ plannedVolume: 6348.2, removedVolume: 1200, remainingVolume: 5148.2 }),
    cells: [
      { label: "A1", status: "in-work" },
      { label: "A2", status: "untouched" },
      { label: "A3", status: "at-firm-sand" },
      { label: "B1", status: "no-data" },
    ],
    zones: [
      { name: "North", totals: totals({ plannedVolume: 4000, remainingVolume: 3000 }) },
      { name: "South", totals: totals({ plannedVolume: 2348.2, remainingVolume: 2148.2 }) },
    ],
  };
  const after: FiguresSide = {
    totals: totals({ plannedVolume: 6401.4, removedVolume: 1200, remainingVolume: 5201.4 }),
    cells: [
      { label: "A1", status: "at-firm-sand" },
      { label: "A2", status: "untouched" },
      { label: "A3", status: "in-work" },
      { label: "C1", status: "untouched" },
    ],
    zones: [
      { name: "North", totals: totals({ plannedVolume: 4000, remainingVolume: 3000 }) },
      { name: "South", totals: totals({ plannedVolume: 2401.4, remainingVolume: 2201.4 }) },
    ],
  };

  it("on the same grid counts cells by label: changed status, added, removed (computed by hand)", () => {
    const change = compareFigures(before, after, true);
    // computed: A1 in-work → at-firm-sand and A3 at-firm-sand → in-work changed; C1 is new; B1 left
    expect([change.statusChanged, change.cellsAdded, change.cellsRemoved]).toEqual([2, 1, 1]);
    expect(change.cells).toEqual({ before: 4, after: 4 });
    // computed: only South's figures moved (2,348.2 → 2,401.4); North agrees to the hundredth
    expect(change.zones.map((zone) => [zone.name, zone.plannedBefore, zone.plannedAfter])).toEqual([["South", 2348.2, 2401.4]]);
    expect(describeFiguresChange(change, "yd³")).toBe("planned volume 6,348 → 6,401 yd³; remaining volume 5,148 → 5,201 yd³; 2 cells changed status; 1 cell added; 1 cell removed");
  });

  it("on a new grid compares only the counts by status, never labels that name other ground (computed)", () => {
    const change = compareFigures(before, after, false);
    expect([change.statusChanged, change.cellsAdded, change.cellsRemoved]).toEqual([null, null, null]);
    // computed: no-data 1 → 0, untouched 1 → 2; in work and at firm sand stay at 1 each
    expect(change.statusCounts).toEqual([{ status: "no-data", before: 1, after: 0 }, { status: "untouched", before: 1, after: 2 }]);
    expect(describeFiguresChange(change, "yd³")).toBe("planned volume 6,348 → 6,401 yd³; remaining volume 5,148 → 5,201 yd³; a new grid: 4 → 4 cells; without data 1 → 0 cells; untouched 1 → 2 cells");
  });

  it("says so when nothing changed, and names a zone that came or went (invariant)", () => {
    expect(describeFiguresChange(compareFigures(before, before, true), "m³")).toBe("no figure changed");
    const withEast: FiguresSide = { ...before, zones: [...before.zones, { name: "East", totals: totals({ plannedVolume: 0 }) }] };
    expect(describeFiguresChange(compareFigures(before, withEast, true), "m³")).toBe('zone "East" added');
  });

  it("treats a project with no figures before as none, not zero (invariant)", () => {
    const change = compareFigures({ totals: null, cells: [], zones: [] }, after, true);
    expect(describeFiguresChange(change, "yd³")).toMatch(/^planned volume none → 6,401 yd³; removed volume none → 1,200 yd³; remaining volume none → 5,201 yd³; deposited volume none → 0 yd³; 4 cells added/);
  });
});
