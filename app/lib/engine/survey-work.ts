import { cellIndexAt, type CellGrid } from "../../../shared/grid/cell-grid";
import type { SurfaceSummary } from "../../../shared/pipeline";
import { createRasterValues, rasterizeTinInto, type RasterGrid, type RasterPrecision, type RasterValues } from "../../../shared/surface/raster";
import { prepareVertices, triangulateVertices, type Tin } from "../../../shared/surface/triangulate";

/**
 * One survey's share of the work: triangulate its soundings (one TIN per value layer, all on the
 * same triangles) and sample each layer onto the raster, and/or count its soundings per cell. A
 * survey that is not in force (a superseded baseline) is only counted; the baseline's firm sand,
 * when it has its own positions, is only sampled.
 */
export interface SurveyWork {
  easting: Float64Array;
  northing: Float64Array;
  /** Value layers to triangulate and sample; none to count only. */
  layers: Float64Array[];
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
  /** One raster per layer, in layer order. */
  rasters: RasterValues[];
  /** Null when the work had no layers. */
  summary: SurfaceSummary | null;
  /** Per grid cell (engine order); null when not counted. */
  soundingsPerCell: Uint32Array | null;
}

/**
 * The work of one survey. `release` is called once the soundings are copied into the
 * triangulation's own arrays, before Delaunator allocates: a thread short of memory drops its
 * input columns there (see engine-worker.thread.ts).
 */
export function doSurveyWork(work: SurveyWork, settings: SurveyWorkSettings, release?: (vertexCount: number) => void): SurveyWorkDone {
  let soundingsPerCell: Uint32Array | null = null;
  if (work.count) {
    const { cellGrid } = settings;
    soundingsPerCell = new Uint32Array(cellGrid.cols * cellGrid.rows);
    for (let index = 0; index < work.easting.length; index++) {
      const cell = cellIndexAt(cellGrid, work.easting[index], work.northing[index]);
      if (cell >= 0) soundingsPerCell[cell]++;
    }
  }
  if (work.layers.length === 0) return { rasters: [], summary: null, soundingsPerCell };
  const prepared = prepareVertices(work.easting, work.northing, work.layers);
  release?.(prepared.xy.length / 2);
  const tins = triangulateVertices(prepared, { maxEdge: settings.maxEdge });
  return { rasters: tins.map((tin) => sampleUnclipped(tin, settings)), summary: summaryOf(tins[0]), soundingsPerCell };
}

function sampleUnclipped(tin: Tin, settings: SurveyWorkSettings): RasterValues {
  const values = createRasterValues(settings.rasterGrid, settings.precision);
  rasterizeTinInto(tin, settings.rasterGrid, values, null);
  return values;
}

function summaryOf(tin: Tin): SurfaceSummary {
  return { duplicatesMerged: tin.duplicatesMerged, longTrianglesDropped: tin.longTrianglesDropped, invalidSkipped: tin.invalidSkipped };
}
