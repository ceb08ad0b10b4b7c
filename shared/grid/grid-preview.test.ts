import { describe, expect, it } from "vitest";
import { cellCount, createCellGrid, fromGridFrame } from "./cell-grid";
import { cellsInFrame, layPreviewGrid, metresPerPixel, zoomForCellPixels } from "./grid-preview";
import { prepareGrids } from "../pipeline";
import type { ProjectedMultiPolygon } from "./work-limit";

// A limit with a notch, a hole and a slanted side, so the edge cells are not all whole squares.
const LIMIT: ProjectedMultiPolygon = [[
  [[0, 0], [400, 0], [400, 130], [260, 300], [0, 300], [0, 0]],
  [[100, 100], [160, 100], [160, 160], [100, 160], [100, 100]],
]];

describe("layPreviewGrid: the grid as typed, before it is saved", () => {
  it("counts the grid's frame as the saved grid does and the cells inside the work limit as the engine does", () => {
    const settings = { cellSize: 25, rotationDegrees: 15, originX: -3, originY: 2, rasterResolution: 1 };
    const preview = layPreviewGrid(LIMIT, settings);
    expect(preview.exact).toBe(true);
    expect(preview.cells).toBe(cellCount(createCellGrid(LIMIT, settings)));
    // invariant: the engine's own grids mark the same cells (a cell counts when it has area inside the limit).
    const engine = prepareGrids(LIMIT, { cellSize: 25, rotationDegrees: 15, originX: -3, originY: 2, resolution: 1, maxEdge: 10, tolerance: 0.5, firmShare: 0.9, minCoverage: 0.9, surveyNoise: 0.05 });
    const engineInLimit = Array.from(engine.cellAreaInLimit, (area) => (area > 0 ? 1 : 0));
    expect(Array.from(preview.inLimit!)).toEqual(engineInLimit);
    expect(preview.inLimitCount).toBe(engineInLimit.reduce((sum: number, flag) => sum + flag, 0));
    expect(preview.inLimitCount!).toBeLessThan(preview.cells);
  });

  it("over its node budget samples every k-th node (k odd): every cell it counts is one the engine counts", () => {
    const settings = { cellSize: 20, rotationDegrees: 0, originX: 0, originY: 0, rasterResolution: 0.5 };
    const full = layPreviewGrid(LIMIT, settings);
    const sampled = layPreviewGrid(LIMIT, settings, 20_000);
    expect(full.exact).toBe(true);
    expect(sampled.exact).toBe(false);
    expect(Math.round(sampled.rasterSpacing / 0.5) % 2).toBe(1);
    for (let cell = 0; cell < full.cells; cell++) if (sampled.inLimit![cell]) expect(full.inLimit![cell]).toBe(1);
    // computed: the whole interior cells are found whatever the sampling; only slivers may be missed.
    expect(sampled.inLimitCount!).toBeGreaterThan(0.95 * full.inLimitCount!);
  });

  it("samples no sparser than a node a cell, so every cell wholly inside the limit is counted", () => {
    // A budget that would ask for every 9th node (4.5 units apart) while cells are 2 units wide.
    const settings = { cellSize: 2, rotationDegrees: 0, originX: 0, originY: 0, rasterResolution: 0.5 };
    const full = layPreviewGrid(LIMIT, settings);
    const sampled = layPreviewGrid(LIMIT, settings, 6_000);
    expect(sampled.rasterSpacing).toBe(1.5); // computed: the widest odd step within 2 / 0.5 = 4 nodes is 3
    for (let cell = 0; cell < full.cells; cell++) if (sampled.inLimit![cell]) expect(full.inLimit![cell]).toBe(1);
    expect(sampled.inLimitCount!).toBeGreaterThan(0.97 * full.inLimitCount!);
  });

  it("a grid too large to lay out in the browser gives its count only", () => {
    const preview = layPreviewGrid(LIMIT, { cellSize: 0.1, rotationDegrees: 0, originX: 0, originY: 0, rasterResolution: 0.1 });
    expect(preview.cells).toBe(4000 * 3000); // computed: 400 / 0.1 × 300 / 0.1
    expect(preview.inLimit).toBeNull();
  });
});

describe("cellsInFrame: a bounded number of cells in the map's view", () => {
  const preview = layPreviewGrid(LIMIT, { cellSize: 10, rotationDegrees: 0, originX: 0, originY: 0, rasterResolution: 1 });

  it("returns the in-limit cells of the view, up to the cap, with how many there are", () => {
    const frame: Array<[number, number]> = [[0, 0], [50, 0], [50, 30], [0, 30]];
    const all = cellsInFrame(preview, frame, 1000);
    // computed: columns 0–5 × rows 0–3 (cells touching x = 50 and y = 30 included), all inside the limit.
    expect(all.total).toBe(6 * 4);
    expect(all.indices).toHaveLength(24);
    const capped = cellsInFrame(preview, frame, 10);
    expect(capped.total).toBe(24);
    expect(capped.indices).toEqual(all.indices.slice(0, 10));
  });

  it("leaves out the cells of the hole", () => {
    const frame = [fromGridFrame(preview.grid, 112, 112), fromGridFrame(preview.grid, 148, 148)];
    expect(cellsInFrame(preview, frame, 1000).total).toBe(0);
  });
});

describe("label zoom", () => {
  it("ground resolution follows the Web Mercator formula (published: 156,543.03 m/px at zoom 0 for 256-px tiles, so half that for MapLibre's 512-px tiles)", () => {
    expect(metresPerPixel(0, 0)).toBeCloseTo(78271.517, 2);
    expect(metresPerPixel(1, 60)).toBeCloseTo(78271.517 / 2 / 2, 2); // computed: cos 60° = 1/2, one zoom halves it
  });

  it("the zoom at which a cell spans a given width on screen inverts the resolution", () => {
    const zoom = zoomForCellPixels(6.096, 29.1, 40); // a 20 ft cell
    expect(6.096 / metresPerPixel(zoom, 29.1)).toBeCloseTo(40, 9);
    expect(zoomForCellPixels(12.192, 29.1, 40)).toBeCloseTo(zoom - 1, 9); // computed: twice the cell, one zoom level less
  });
});
