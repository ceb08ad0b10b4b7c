import { z } from "zod";
import { createCellGrid, type CellGrid } from "./grid/cell-grid";
import { workLimitBounds, type ProjectedMultiPolygon } from "./grid/work-limit";
import { cellAreasInWorkLimit, nodeCells, rasterGridFor, workLimitMask } from "./grid/work-limit-mask";

export { rasterGridFor };
import { createRasterValues, rasterizeTinInto, type Raster, type RasterGrid, type RasterPrecision, type RasterValues } from "./surface/raster";
import { finiteAlike, hullRing, triangulate, triangulateLayers, type Tin } from "./surface/triangulate";
import { computeCellStats, type CellStats, type CellStatusRules } from "./volumes/cell-stats";
import { stackLatestBottom } from "./volumes/latest-bottom";
import { rollUpCells, type VolumeTotals } from "./volumes/rollup";

/**
 * Soundings to cell quantities in one call: triangulate each survey, lay the cell grid and the
 * raster over the work limit, sample every surface onto the raster, stack the latest bottom and
 * integrate per cell. All lengths are in the project's length unit, volumes in its cube.
 */

/** One survey's points in project coordinates with one elevation per point. */
export interface SurveyPoints {
  easting: Float64Array;
  northing: Float64Array;
  elevation: Float64Array;
}

export interface EngineSurveys {
  /** The baseline (pre-dredge) survey: the muck top, and what removal is measured from. */
  baseline: SurveyPoints;
  /** Progress and closeout surveys, oldest first; each covers what was surveyed on that pass. */
  progress: ReadonlyArray<SurveyPoints>;
  /**
   * Refusal (firm-sand) elevations. When its easting/northing arrays are the baseline's own
   * (the baseline's probe column), the baseline triangulation is reused.
   */
  firm: SurveyPoints;
}

export interface EngineSettings extends CellStatusRules {
  cellSize: number;
  /** Raster spacing (project length unit). */
  resolution: number;
  /** Longest triangle edge kept (project length unit). */
  maxEdge: number;
  originX?: number;
  originY?: number;
  rotationDegrees?: number;
  /** float32 halves raster memory (about 7 significant digits: ample for elevations to 0.001 ft); default float64. */
  rasterPrecision?: RasterPrecision;
}

/** The settings as they cross into the engine (from a form, the database or the command line). */
export const engineSettingsSchema = z.object({
  cellSize: z.number().positive(),
  resolution: z.number().positive(),
  maxEdge: z.number().positive(),
  tolerance: z.number().nonnegative(),
  firmShare: z.number().min(0).max(1),
  minCoverage: z.number().min(0).max(1),
  surveyNoise: z.number().nonnegative(),
  originX: z.number().finite().optional(),
  originY: z.number().finite().optional(),
  rotationDegrees: z.number().finite().optional(),
  rasterPrecision: z.enum(["float32", "float64"]).optional(),
});

export type ProgressCallback = (stage: string, fraction: number) => void;

export interface EngineSurfaces {
  baseline: Tin;
  progress: Tin[];
  firm: Tin;
}

export interface EngineResult extends EngineGrids {
  rasters: {
    muckTop: Raster;
    firm: Raster;
    latestBottom: Raster;
    /** max(latest − firm, 0) where both have data: the surface the thickness bands are drawn from. */
    remainingThickness: Raster;
  };
  /** Per node, which survey the latest bottom came from: 0 = newest progress survey … progress.length = baseline; 255 none. */
  latestSource: Uint8Array;
  cells: CellStats;
  totals: VolumeTotals;
  surfaces: SurfaceSummary;
}

/** Triangulate every survey (the part worth moving to worker threads). */
export function triangulateSurveys(surveys: EngineSurveys, maxEdge: number, onProgress?: ProgressCallback): EngineSurfaces {
  const { baseline, firm } = surveys;
  const stages = 1 + surveys.progress.length + 1;
  let done = 0;
  const report = () => onProgress?.("triangulate", ++done / stages);
  let baselineTin: Tin;
  let firmTin: Tin;
  if (firmSharesBaselinePositions(surveys)) {
    [baselineTin, firmTin] = triangulateLayers(baseline.easting, baseline.northing, [baseline.elevation, firm.elevation], { maxEdge });
    report();
    report();
  } else {
    baselineTin = triangulate(baseline.easting, baseline.northing, baseline.elevation, { maxEdge });
    report();
    firmTin = triangulate(firm.easting, firm.northing, firm.elevation, { maxEdge });
    report();
  }
  const progress = surveys.progress.map((survey) => {
    const tin = triangulate(survey.easting, survey.northing, survey.elevation, { maxEdge });
    report();
    return tin;
  });
  return { baseline: baselineTin, progress, firm: firmTin };
}

/**
 * True when the firm-sand values sit on the baseline's own soundings (its probe column) and are
 * finite exactly where the baseline's are, so one triangulation serves both surfaces.
 */
export function firmSharesBaselinePositions(surveys: EngineSurveys): boolean {
  const { baseline, firm } = surveys;
  return firm.easting === baseline.easting && firm.northing === baseline.northing && finiteAlike(baseline.elevation, firm.elevation);
}

/** One TIN onto the shared raster, clipped to the work limit. */
export function sample(tin: Tin, grid: RasterGrid, mask: Uint8Array, precision: RasterPrecision): RasterValues {
  const values = createRasterValues(grid, precision);
  rasterizeTinInto(tin, grid, values, mask);
  return values;
}

/** The grids every surface shares. */
export interface EngineGrids {
  workLimit: ProjectedMultiPolygon;
  cellGrid: CellGrid;
  rasterGrid: RasterGrid;
  mask: Uint8Array;
  nodeCell: Int32Array;
  cellAreaInLimit: Float64Array;
}

/** The cell grid and the raster grid over the limit: a few arithmetic steps, so a caller can lay them before it hands work to threads. */
export interface GridLines {
  cellGrid: CellGrid;
  rasterGrid: RasterGrid;
}

export function layGridLines(workLimit: ProjectedMultiPolygon, settings: EngineSettings): GridLines {
  engineSettingsSchema.parse(settings);
  const nodesAcross = workLimitBounds(workLimit);
  const rasterNodes = ((nodesAcross.maxX - nodesAcross.minX) / settings.resolution) * ((nodesAcross.maxY - nodesAcross.minY) / settings.resolution);
  // A typo in the resolution (0.001 for 1) would ask for billions of nodes; stop before allocating.
  if (rasterNodes > 400_000_000) throw new Error(`a raster of ${Math.round(rasterNodes).toLocaleString("en-US")} nodes is too large; use a coarser resolution`);
  if (workLimit.length === 0 || workLimit[0].length === 0 || workLimit[0][0].length < 4) {
    throw new Error("the work limit is empty (fewer than three distinct soundings give no hull)");
  }
  const cellGrid = createCellGrid(workLimit, {
    cellSize: settings.cellSize,
    originX: settings.originX,
    originY: settings.originY,
    rotationDegrees: settings.rotationDegrees,
  });
  return { cellGrid, rasterGrid: rasterGridFor(workLimit, cellGrid, settings.resolution) };
}

/** The grids every surface shares, laid once per computation: `lines` when the caller has laid them already. */
export function prepareGrids(workLimit: ProjectedMultiPolygon, settings: EngineSettings, onProgress?: ProgressCallback, lines: GridLines = layGridLines(workLimit, settings)): EngineGrids {
  const { cellGrid, rasterGrid } = lines;
  const mask = workLimitMask(workLimit, rasterGrid);
  const nodeCell = nodeCells(cellGrid, rasterGrid, mask);
  const cellAreaInLimit = cellAreasInWorkLimit(cellGrid, rasterGrid, nodeCell);
  onProgress?.("work limit", 1);
  return { workLimit, cellGrid, rasterGrid, mask, nodeCell, cellAreaInLimit };
}

/** A raster sampled without the mask, clipped to the work limit afterwards (in place): the same values as sampling with it. */
export function clipToMask(values: RasterValues, mask: Uint8Array): RasterValues {
  for (let node = 0; node < mask.length; node++) if (mask[node] === 0) values[node] = Number.NaN;
  return values;
}

export interface SurfaceSummary {
  duplicatesMerged: number;
  longTrianglesDropped: number;
  invalidSkipped: number;
}

export function summariseSurfaces(tins: ReadonlyArray<Tin>): SurfaceSummary {
  // Layers sharing one triangulation are counted once.
  return addSurfaceSummaries(tins.filter((tin, index) => tins.findIndex((other) => other.triangles === tin.triangles) === index));
}

/** The summaries of separate triangulations (each survey's, done in different threads) added up. */
export function addSurfaceSummaries(summaries: ReadonlyArray<SurfaceSummary>): SurfaceSummary {
  return {
    duplicatesMerged: summaries.reduce((sum, summary) => sum + summary.duplicatesMerged, 0),
    longTrianglesDropped: summaries.reduce((sum, summary) => sum + summary.longTrianglesDropped, 0),
    invalidSkipped: summaries.reduce((sum, summary) => sum + summary.invalidSkipped, 0),
  };
}

/** Every survey sampled on the shared raster grid. */
export interface SampledSurveys {
  muckTop: RasterValues;
  firm: RasterValues;
  /** Oldest first, as in `EngineSurveys.progress`. */
  progress: RasterValues[];
  surfaces: SurfaceSummary;
}

/** Latest bottom, cell integrals and roll-up from rasters already sampled on `grids`. */
export function computeVolumesFromRasters(grids: EngineGrids, sampled: SampledSurveys, settings: EngineSettings, onProgress?: ProgressCallback): EngineResult {
  const precision = settings.rasterPrecision ?? "float64";
  const { rasterGrid, cellGrid, nodeCell } = grids;
  const { muckTop, firm, progress } = sampled;
  const latest = stackLatestBottom(rasterGrid, [...progress].reverse().concat([muckTop]), precision);
  onProgress?.("latest bottom", 1);

  const cells = computeCellStats(cellGrid, rasterGrid, nodeCell, { muckTop, firm, before: muckTop, after: latest.values }, settings);
  onProgress?.("cells", 1);

  const remainingThickness = createRasterValues(rasterGrid, precision);
  for (let node = 0; node < remainingThickness.length; node++) {
    const left = latest.values[node] - firm[node]; // NaN propagates where either has no data
    remainingThickness[node] = left > 0 ? left : left === left ? 0 : Number.NaN;
  }
  return {
    ...grids,
    rasters: {
      muckTop: { ...rasterGrid, values: muckTop },
      firm: { ...rasterGrid, values: firm },
      latestBottom: { ...rasterGrid, values: latest.values },
      remainingThickness: { ...rasterGrid, values: remainingThickness },
    },
    latestSource: latest.source,
    cells,
    totals: rollUpCells(cells),
    surfaces: sampled.surfaces,
  };
}

/** Everything after triangulation. `workLimit` null: the baseline survey's convex hull. */
export function computeVolumesFromSurfaces(
  surfaces: EngineSurfaces,
  workLimit: ProjectedMultiPolygon | null,
  settings: EngineSettings,
  onProgress?: ProgressCallback,
): EngineResult {
  const precision = settings.rasterPrecision ?? "float64";
  const grids = prepareGrids(workLimit ?? [[hullRing(surfaces.baseline)]], settings, onProgress);
  const toSample = [surfaces.baseline, surfaces.firm, ...surfaces.progress];
  const sampled: RasterValues[] = [];
  toSample.forEach((tin, index) => {
    sampled.push(sample(tin, grids.rasterGrid, grids.mask, precision));
    onProgress?.("raster", (index + 1) / toSample.length);
  });
  const [muckTop, firm, ...progress] = sampled;
  return computeVolumesFromRasters(grids, { muckTop, firm, progress, surfaces: summariseSurfaces(toSample) }, settings, onProgress);
}

/** The whole computation in one call (single thread). */
export function computeSurveyVolumes(
  surveys: EngineSurveys,
  workLimit: ProjectedMultiPolygon | null,
  settings: EngineSettings,
  onProgress?: ProgressCallback,
): EngineResult {
  const surfaces = triangulateSurveys(surveys, settings.maxEdge, onProgress);
  return computeVolumesFromSurfaces(surfaces, workLimit, settings, onProgress);
}
