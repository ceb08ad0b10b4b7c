import { describe, expect, it } from "vitest";
import { cellIndex } from "../../../shared/grid/cell-grid";
import type { ComputationSurvey } from "./engine-surveys";
import { computeProjectState, type ProjectStateInput } from "./project-state";

// A closed-form site: a 40 ft × 40 ft work limit, a flat muck top at 10 ft, firm sand at 8 ft
// (2 ft of muck), a progress pass down to 8.1 ft everywhere (inside the 0.25 ft tolerance) and a
// closeout over the western half at 8.05 ft.

function flatSurvey(id: number, kind: ComputationSurvey["kind"], surveyedOn: string, elevation: number, maxX: number, refusal?: number): ComputationSurvey {
  const easting: number[] = [];
  const northing: number[] = [];
  for (let x = -4; x <= maxX; x += 2) for (let y = -4; y <= 44; y += 2) { easting.push(x); northing.push(y); }
  const count = easting.length;
  return {
    id, kind, surveyedOn,
    easting: Float64Array.from(easting), northing: Float64Array.from(northing),
    elevation: new Float64Array(count).fill(elevation),
    refusalElevation: refusal === undefined ? null : new Float64Array(count).fill(refusal),
  };
}

const settings = { cellSize: 10, resolution: 1, maxEdge: 5, originX: 0, originY: 0, rotationDegrees: 0, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };
const workLimit = [[[[0, 0], [40, 0], [40, 40], [0, 40], [0, 0]] as Array<[number, number]>]];

const input = (surveys: ComputationSurvey[]): ProjectStateInput => ({
  surveys, workLimit, zones: [{ id: 7, name: "West", polygon: [[[[0, 0], [20, 0], [20, 40], [0, 40], [0, 0]]]] }], settings, lengthUnit: "ft", waterSurfaceElevation: 12, withFigures: true,
});

describe("computeProjectState: the figures", () => {
  const surveys = [
    flatSurvey(1, "baseline", "2026-01-01", 10, 44, 8),
    flatSurvey(2, "progress", "2026-02-01", 8.1, 44),
    flatSurvey(3, "closeout", "2026-03-01", 8.05, 19),
  ];
  const state = computeProjectState(input(surveys))!;
  const figures = state.figures!;

  it("plans the closed-form muck volume: 2 ft over 1,600 ft², in cubic yards", () => {
    // computed: 1600 ft² × 2 ft = 3200 ft³ = 3200 / 27 yd³ (27 ft³ per yd³, NIST SP 811)
    expect(figures.totals.plannedVolume).toBeCloseTo(3200 / 27, 6);
    expect(figures.cells).toHaveLength(16);
  });

  it("keeps one snapshot per survey date, each the state after that date", () => {
    expect(figures.snapshots.map((snapshot) => snapshot.surveyedOn)).toEqual(["2026-01-01", "2026-02-01", "2026-03-01"]);
    // computed: nothing removed at the baseline; 1.9 ft removed over 1,600 ft² after the progress pass
    expect(figures.snapshots[0].totals.removedVolume).toBeCloseTo(0, 9);
    expect(figures.snapshots[1].totals.removedVolume).toBeCloseTo((1600 * 1.9) / 27, 6);
    expect(figures.snapshots[1].totals.cellsConfirmed).toBe(0);
  });

  it("confirms the at-firm-sand cells whose latest bottom comes from the closeout, and only those", () => {
    const confirmed = figures.cells.filter((cell) => cell.status === "confirmed").map((cell) => cell.col).sort();
    const atFirm = figures.cells.filter((cell) => cell.status === "at-firm-sand").map((cell) => cell.col);
    // The closeout's points reach x = 18 (plus one 2 ft triangle): columns 0 and 1 (x 0–20) are its.
    expect(new Set(confirmed)).toEqual(new Set([0, 1]));
    expect(confirmed).toHaveLength(8);
    expect(new Set(atFirm)).toEqual(new Set([2, 3]));
    expect(figures.totals.cellsConfirmed).toBe(8);
    expect(figures.totals.cellsAtFirmSand).toBe(16); // a confirmed cell is also at firm sand
    expect(figures.cells.filter((cell) => cell.col < 2).every((cell) => cell.latestSurveyId === 3)).toBe(true);
  });

  it("rolls the western zone up from its cells", () => {
    const west = figures.snapshots[2].zones[0];
    expect(west.zoneId).toBe(7);
    expect(west.totals.cells).toBe(8);
    expect(west.totals.plannedVolume).toBeCloseTo(1600 / 27, 6); // computed: half the site
  });

  it("puts the eastern half, in no zone, in an Unzoned row, so every date's rows add up to the project", () => {
    for (const snapshot of figures.snapshots) {
      expect(snapshot.zones.map((zone) => [zone.zoneId, zone.name])).toEqual([[7, "West"], [null, "Unzoned"]]);
      const unzoned = snapshot.zones[1].totals;
      expect(unzoned.cells).toBe(8); // computed: columns 2 and 3, x 20–40
      expect(unzoned.plannedVolume).toBeCloseTo(1600 / 27, 6); // computed: the other half
      // invariant: zone rows sum to the project for every figure
      for (const key of Object.keys(snapshot.totals) as Array<keyof typeof snapshot.totals>) {
        expect(snapshot.zones.reduce((sum, zone) => sum + zone.totals[key], 0), `${snapshot.surveyedOn} ${key}`).toBeCloseTo(snapshot.totals[key], 9);
      }
    }
    expect(figures.cells.filter((cell) => cell.zoneId === null).map((cell) => cell.col).sort()).toEqual([2, 2, 2, 2, 3, 3, 3, 3]);
  });

  it("has no state without a baseline", () => {
    expect(computeProjectState(input(surveys.slice(1)))).toBeNull();
  });
});

describe("computeProjectState: the latest surfaces and the end-area check", () => {
  const surveys = [
    flatSurvey(1, "baseline", "2026-01-01", 10, 44, 8),
    flatSurvey(2, "progress", "2026-02-01", 8.1, 44),
    flatSurvey(3, "closeout", "2026-03-01", 8.05, 19),
  ];
  const state = computeProjectState(input(surveys))!;
  const { surfaces } = state;
  const cell = (row: number, col: number) => cellIndex(surfaces.result.cellGrid, row, col);

  it("reads depths below the newest water surface: 12 − 8.05 ft where the closeout is the bottom, 12 − 8.1 ft elsewhere", () => {
    expect(surfaces.cellMaxDepth[cell(0, 0)]).toBeCloseTo(3.95, 5); // computed; the depth raster is float32
    expect(surfaces.cellMaxDepth[cell(3, 3)]).toBeCloseTo(3.9, 5);
    expect(surfaces.depth!.values[0]).toBeCloseTo(3.95, 5);
  });

  it("counts every active survey's soundings per cell", () => {
    // computed: soundings every 2 ft, so 5 × 5 in a 10 ft cell from each survey covering it.
    expect(surfaces.soundingsPerCell[cell(0, 0)]).toBe(75); // baseline, progress and closeout
    expect(surfaces.soundingsPerCell[cell(0, 3)]).toBe(50); // the closeout stops at x = 18
  });

  it("checks the removed volume by end areas against the surface figure", () => {
    // computed: raster nodes every 1 ft from x = 0.5; the closeout (8.05 ft) covers the 18 node
    // columns up to x = 17.5, the progress pass (8.1 ft) the other 22: 40 ft × (18 × 1.95 + 22 × 1.9) ft².
    expect(state.endArea.surfaceVolumeCubicLength).toBeCloseTo(40 * (18 * 1.95 + 22 * 1.9), 6);
    expect(state.figures!.totals.removedVolume).toBeCloseTo(state.endArea.surfaceVolumeCubicLength / 27, 9); // 27 ft³ a cubic yard (NIST SP 811)
    // Five sections 10 ft apart, each sampled at 1 ft steps a step past the limit's edges (where the
    // edge nodes still read), so a 40 ft section reads about 41 ft wide: a few per cent over.
    expect(state.endArea.sections).toBe(5);
    expect(state.endArea.differencePercent!).toBeGreaterThan(0);
    expect(state.endArea.differencePercent!).toBeLessThan(3);
  });

  it("leaves a superseded baseline out of the figures but counts its soundings", () => {
    const older = flatSurvey(9, "baseline", "2025-12-01", 11, 44, 7); // 4 ft of muck: would change every figure
    const withOlder = computeProjectState(input([older, ...surveys]))!;
    expect(withOlder.figures).toEqual(state.figures); // invariant: only the newest baseline is in force
    expect(withOlder.surfaces.result.cells).toEqual(surfaces.result.cells);
    expect(withOlder.surfaces.soundingsPerCell[cell(0, 0)]).toBe(100);
  });
});
