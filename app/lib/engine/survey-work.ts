import { cellIndexAt, type CellGrid } from "../../../shared/grid/cell-grid";
import type { SurfaceSummary, SurveyPoints } from "../../../shared/pipeline";
import { createRasterValues, rasterizeTinInto, type RasterGrid, type RasterPrecision, type RasterValues } from "../../../shared/surface/raster";
import { finiteAlike, prepareVertices, triangulateVertices, type PreparedVertices, type Tin } from "../../../shared/surface/triangulate";

/**
 * One survey's share of a project's engine state, done where the pool puts it (a thread of its
 * own when there are several): its soundings triangulated and sampled once onto the project's
 * raster, and counted per cell. The baseline's work includes its firm sand, from its probe.
 * Pure, and light on imports: the engine threads load this module at start.
 */
export interface SurveyWork {
  easting: Float64Array;
  northing: Float64Array;
  /** Bottom elevations to triangulate and sample; null for a survey only counted (a superseded baseline). */
  elevation: Float64Array | null;
  /** For the baseline in force: its probe's refusal elevations (NaN where a row has none), firm sand's surface. */
  refusalElevation?: Float64Array | null;
  /** Count the soundings in each cell of the project's grid. */
  count: boolean;
}

export interface SurveyWorkSettings {
  maxEdge: number;
  /** Sample onto this raster (not clipped: the mask is applied once, with every survey's rasters). */
  rasterGrid: RasterGrid;
  precision: RasterPrecision;
  cellGrid: CellGrid;
}

export interface SurveyWorkDone {
  /** The bottom's raster, then (the baseline) firm sand's; none when only counted. */
  rasters: RasterValues[];
  /** Null when nothing was triangulated. */
  summary: SurfaceSummary | null;
  /** Per grid cell (engine order); null when not counted. */
  soundingsPerCell: Uint32Array | null;
}

/**
 * Firm-sand points from the baseline's probe: the baseline's own arrays when every row has a
 * probe (one triangulation can then serve both surfaces), else the rows with one.
 */
export function firmPoints(baseline: { easting: Float64Array; northing: Float64Array; refusalElevation: Float64Array | null }): SurveyPoints {
  const refusal = baseline.refusalElevation;
  if (refusal === null) throw new Error("the active baseline has no probe column, so there is no firm-sand surface to measure to");
  let finite = 0;
  for (let index = 0; index < refusal.length; index++) if (Number.isFinite(refusal[index])) finite++;
  if (finite === refusal.length) return { easting: baseline.easting, northing: baseline.northing, elevation: refusal };
  const easting = new Float64Array(finite);
  const northing = new Float64Array(finite);
  const elevation = new Float64Array(finite);
  let next = 0;
  for (let index = 0; index < refusal.length; index++) {
    if (!Number.isFinite(refusal[index])) continue;
    easting[next] = baseline.easting[index];
    northing[next] = baseline.northing[index];
    elevation[next] = refusal[index];
    next++;
  }
  return { easting, northing, elevation };
}

/**
 * The work of one survey. `release` is called once the soundings are copied into the
 * triangulation's own arrays, before Delaunator allocates: a thread short of memory drops its
 * input columns there (see engine-worker.thread.ts).
 */
export function doSurveyWork(work: SurveyWork, settings: SurveyWorkSettings, release?: (vertexCount: number) => void): SurveyWorkDone {
  const soundingsPerCell = work.count ? countPerCell(work, settings.cellGrid) : null;
  if (work.elevation === null) return { rasters: [], summary: null, soundingsPerCell };
  // Every set of vertices is prepared before any triangulation, and no local keeps the input
  // columns, so `release` can let them go.
  const prepared: Array<PreparedVertices | null> = prepareSurvey(work);
  release?.(prepared.reduce((sum, vertices) => sum + vertices!.xy.length / 2, 0));
  const rasters: RasterValues[] = [];
  const summary: SurfaceSummary = { duplicatesMerged: 0, longTrianglesDropped: 0, invalidSkipped: 0 };
  for (let index = 0; index < prepared.length; index++) {
    const tins = triangulateVertices(prepared[index]!, { maxEdge: settings.maxEdge });
    prepared[index] = null; // the TINs hold what they need of it
    for (const tin of tins) rasters.push(sampleUnclipped(tin, settings));
    // Layers on one triangulation count once.
    summary.duplicatesMerged += tins[0].duplicatesMerged;
    summary.longTrianglesDropped += tins[0].longTrianglesDropped;
    summary.invalidSkipped += tins[0].invalidSkipped;
  }
  return { rasters, summary, soundingsPerCell };
}

function countPerCell(work: SurveyWork, cellGrid: CellGrid): Uint32Array {
  const counts = new Uint32Array(cellGrid.cols * cellGrid.rows);
  for (let index = 0; index < work.easting.length; index++) {
    const cell = cellIndexAt(cellGrid, work.easting[index], work.northing[index]);
    if (cell >= 0) counts[cell]++;
  }
  return counts;
}

/** The bottom's vertices, and the baseline's firm sand: on the same triangles when the probe sits on every sounding with a bottom. */
function prepareSurvey(work: SurveyWork): PreparedVertices[] {
  const { easting, northing } = work;
  const elevation = work.elevation!;
  if (work.refusalElevation === undefined) return [prepareVertices(easting, northing, [elevation])];
  const firm = firmPoints({ easting, northing, refusalElevation: work.refusalElevation });
  if (firm.easting === easting && finiteAlike(elevation, firm.elevation)) return [prepareVertices(easting, northing, [elevation, firm.elevation])];
  return [prepareVertices(easting, northing, [elevation]), prepareVertices(firm.easting, firm.northing, [firm.elevation])];
}

function sampleUnclipped(tin: Tin, settings: SurveyWorkSettings): RasterValues {
  const values = createRasterValues(settings.rasterGrid, settings.precision);
  rasterizeTinInto(tin, settings.rasterGrid, values, null);
  return values;
}
