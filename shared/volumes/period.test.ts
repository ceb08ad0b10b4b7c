import { describe, expect, it } from "vitest";
import { averageEndAreaVolume } from "../end-area";
import { createCellGrid } from "../grid/cell-grid";
import type { ProjectedMultiPolygon } from "../grid/work-limit";
import { nodeCells, workLimitMask } from "../grid/work-limit-mask";
import { computeVolumesFromRasters, prepareGrids, type EngineSettings } from "../pipeline";
import { cubicToVolumeUnit } from "../units";
import { computePeriodCells, PERIOD_VOLUME_KEYS, rollUpPeriod } from "./period";
import { NO_ZONE, zoneOfEachCell } from "./rollup";

const rules = { tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };

function square(minX: number, minY: number, maxX: number, maxY: number): ProjectedMultiPolygon {
  return [[[[minX, minY], [maxX, minY], [maxX, maxY], [minX, maxY], [minX, minY]]]];
}

/** A site on a raster of `spacing`, with surfaces painted from node coordinates (node centres). */
function site(limit: ProjectedMultiPolygon, cellSize: number, spacing: number) {
  const cellGrid = createCellGrid(limit, { cellSize });
  const [minX, minY] = limit[0][0][0];
  const [maxX, maxY] = limit[0][0][2];
  const rasterGrid = { originX: minX, originY: minY, spacing, cols: Math.round((maxX - minX) / spacing), rows: Math.round((maxY - minY) / spacing) };
  const nodeCell = nodeCells(cellGrid, rasterGrid, workLimitMask(limit, rasterGrid));
  const surface = (elevation: (x: number, y: number) => number) =>
    Float64Array.from({ length: rasterGrid.cols * rasterGrid.rows }, (_, node) =>
      elevation(rasterGrid.originX + ((node % rasterGrid.cols) + 0.5) * spacing, rasterGrid.originY + (Math.floor(node / rasterGrid.cols) + 0.5) * spacing));
  return { grids: { cellGrid, rasterGrid, nodeCell }, surface };
}

const yd3 = (cubicFeet: number) => cubicToVolumeUnit(cubicFeet, "ft");

describe("pay periods between surveys: the flat muck layer of issue 14", () => {
  // A flat muck layer 2 ft thick over one 100 × 100 ft cell (top 0, firm sand −2); three surveys
  // after the baseline lower the bottom by 0.5 ft, then 1.5 ft more (at firm sand), then 0.5 ft
  // more (below it). Computed: 0.5 ft × 10,000 ft² = 5,000 ft³ = 185.19 yd³; 1.5 ft → 555.56 yd³.
  const { grids, surface } = site(square(0, 0, 100, 100), 100, 5);
  const rasters = { muckTop: surface(() => 0), firm: surface(() => -2), progress: [surface(() => -0.5), surface(() => -2), surface(() => -2.5)] };
  const period = (from: number, to: number, allowance = 0) => {
    const stats = computePeriodCells(grids, rasters, from, to, rules, allowance);
    return rollUpPeriod(stats, new Int32Array(stats.count).fill(NO_ZONE), 0, "ft").project;
  };

  it("each period is paid for what came out above firm sand; below it is over-dredge", () => {
    // computed, issue 14's closed form: 185.19, 555.56, then 0 paid with 185.19 over-dredge
    expect(period(0, 1)).toEqual({ removedVolume: expect.closeTo(185.185, 3), paidVolume: expect.closeTo(185.185, 3), overDredgeVolume: 0, depositedVolume: 0, remainingVolume: expect.closeTo(555.556, 3) });
    expect(period(1, 2)).toEqual({ removedVolume: expect.closeTo(555.556, 3), paidVolume: expect.closeTo(555.556, 3), overDredgeVolume: 0, depositedVolume: 0, remainingVolume: 0 });
    expect(period(2, 3)).toEqual({ removedVolume: expect.closeTo(185.185, 3), paidVolume: 0, overDredgeVolume: expect.closeTo(185.185, 3), depositedVolume: 0, remainingVolume: 0 });
  });

  it("baseline to the last survey: 740.74 paid, 185.19 over-dredge, nothing remaining, and the periods add up to it", () => {
    const whole = period(0, 3);
    // computed: 2 ft × 10,000 ft² = 20,000 ft³ = 740.74 yd³ paid; 0.5 ft below firm = 185.19 yd³
    expect(whole.paidVolume).toBeCloseTo(yd3(20_000), 9);
    expect(whole.overDredgeVolume).toBeCloseTo(yd3(5_000), 9);
    expect(whole.remainingVolume).toBe(0);
    // invariant: consecutive periods add up to the whole, column by column
    for (const key of ["removedVolume", "paidVolume", "overDredgeVolume"] as const) {
      expect(period(0, 1)[key] + period(1, 2)[key] + period(2, 3)[key]).toBeCloseTo(whole[key], 9);
    }
  });

  it("an over-dredge allowance moves the pay surface down by that much", () => {
    // computed: a 0.3 ft allowance pays 0.3 of the last 0.5 ft → 3,000 ft³ paid, 2,000 ft³ over-dredge
    const last = period(2, 3, 0.3);
    expect(last.paidVolume).toBeCloseTo(yd3(3_000), 9);
    expect(last.overDredgeVolume).toBeCloseTo(yd3(2_000), 9);
  });

  it("the period from the baseline to the latest survey is the engine's own latest figures", () => {
    const settings: EngineSettings = { cellSize: 100, resolution: 5, maxEdge: 1e9, originX: 0, originY: 0, ...rules };
    const engineGrids = prepareGrids(square(0, 0, 100, 100), settings);
    const latest = computeVolumesFromRasters(engineGrids, { ...rasters, progress: [...rasters.progress], surfaces: { duplicatesMerged: 0, longTrianglesDropped: 0, invalidSkipped: 0 } }, settings);
    const stats = computePeriodCells(engineGrids, rasters, 0, 3, rules, 0);
    // invariant: one computation, so the same numbers bit for bit
    expect(Array.from(stats.removedVolumeCubicLength)).toEqual(Array.from(latest.cells.removedVolumeCubicLength));
    expect(Array.from(stats.remainingVolumeCubicLength)).toEqual(Array.from(latest.cells.remainingVolumeCubicLength));
    expect(Array.from(stats.depositedVolumeCubicLength)).toEqual(Array.from(latest.cells.depositedVolumeCubicLength));
  });

  it("a bottom that rose (slumping) is deposited, not negative removal", () => {
    const slumped = { ...rasters, progress: [surface(() => -1), surface(() => -0.8)] };
    const stats = computePeriodCells(grids, slumped, 1, 2, rules, 0);
    const totals = rollUpPeriod(stats, new Int32Array(stats.count).fill(NO_ZONE), 0, "ft").project;
    // computed: 0.2 ft × 10,000 ft² = 2,000 ft³ deposited
    expect(totals.depositedVolume).toBeCloseTo(yd3(2_000), 9);
    expect(totals.removedVolume).toBe(0);
  });
});

describe("a period measured against the average end area", () => {
  it("end areas of 50 and 150 ft² 50 ft apart: 5,000 ft³ = 185.19 yd³, by the formula and by the surfaces", () => {
    // computed from the average-end-area formula V = L(A1 + A2)/2 (USACE EM 1110-2-1003, ch. 15);
    // issue 14 cites these figures as a published worked example of the method.
    const endAreaCubicFeet = averageEndAreaVolume([50, 150], [0, 50]);
    expect(endAreaCubicFeet).toBe(5_000);
    expect(yd3(endAreaCubicFeet)).toBeCloseTo(185.19, 2);
    // The same solid as a period: 100 ft wide sections, removed thickness 0.5 ft at x = 0 rising
    // linearly to 1.5 ft at x = 50 (areas 50 and 150 ft²). A linear thickness makes the end-area
    // formula exact and the midpoint rule exact too, so the two agree to rounding.
    const { grids, surface } = site(square(0, 0, 50, 100), 50, 1);
    const rasters = { muckTop: surface(() => 0), firm: surface(() => -5), progress: [surface((x) => -(0.5 + x / 50))] };
    const stats = computePeriodCells(grids, rasters, 0, 1, rules, 0);
    const totals = rollUpPeriod(stats, new Int32Array(stats.count).fill(NO_ZONE), 0, "ft").project;
    expect(totals.removedVolume).toBeCloseTo(yd3(endAreaCubicFeet), 6);
    expect(totals.paidVolume).toBeCloseTo(yd3(endAreaCubicFeet), 6);
  });
});

describe("a period's zone rows add up to the project", () => {
  it("for every column, with the Unzoned row holding the cells no zone holds", () => {
    // Four 25 ft cells in a row; a zone over the first two, the last two in no zone; the bottom
    // varies by cell so that every column has something in it.
    const { grids, surface } = site(square(0, 0, 100, 25), 25, 1);
    const rasters = {
      muckTop: surface(() => 0),
      firm: surface(() => -2),
      progress: [surface((x) => -0.5 - x / 100), surface((x) => (x < 50 ? -2.4 : x < 75 ? -0.2 : -1.2))],
    };
    const stats = computePeriodCells(grids, rasters, 1, 2, rules, 0.1);
    const zone = { id: "west", polygon: square(0, -1, 50, 26) };
    const rows = rollUpPeriod(stats, zoneOfEachCell(grids.cellGrid, [zone]), 1, "ft");
    expect(rows.unzoned).not.toBeNull();
    for (const key of PERIOD_VOLUME_KEYS) {
      // invariant: every cell in exactly one row
      expect(rows.zones[0][key] + rows.unzoned![key]).toBeCloseTo(rows.project[key], 9);
    }
    // invariant: paid + over-dredge = removed
    expect(rows.project.paidVolume + rows.project.overDredgeVolume).toBeCloseTo(rows.project.removedVolume, 9);
    expect(rows.project.overDredgeVolume).toBeGreaterThan(0); // the west cells went 0.4 ft below firm, 0.3 past the allowance
    expect(rows.project.depositedVolume).toBeGreaterThan(0); // the third cell rose
  });
});
