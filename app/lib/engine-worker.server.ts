import { Worker } from "node:worker_threads";
import { createCellGrid } from "../../shared/grid/cell-grid";
import type { ProjectedMultiPolygon } from "../../shared/grid/work-limit";
import {
  computeVolumesFromRasters,
  computeVolumesFromSurfaces,
  firmSharesBaselinePositions,
  prepareGrids,
  rasterGridFor,
  type EngineResult,
  type EngineSettings,
  type EngineSurfaces,
  type EngineSurveys,
  type ProgressCallback,
  type SurfaceSummary,
} from "../../shared/pipeline";
import type { RasterGrid, RasterPrecision, RasterValues } from "../../shared/surface/raster";
import type { Tin } from "../../shared/surface/triangulate";

/**
 * A small pool of worker threads for the engine's heaviest independent steps: each survey's
 * triangulation and, when the work limit is known up front, its rasterisation. Survey arrays are
 * copied in (or transferred, if the caller says it is done with them) and results come back as
 * transferred buffers. The pool is long-lived: start it once with the server (a thread takes tens
 * of milliseconds to start) and `close()` it on shutdown.
 *
 * The worker entry is a TypeScript file when running from sources (tsx: development, the CLI, the
 * benchmark) and its compiled .js sibling otherwise.
 */
export interface SurfaceJob {
  id: number;
  easting: Float64Array;
  northing: Float64Array;
  layers: Float64Array[];
  maxEdge: number;
  /** Sample in the worker and return rasters (not clipped: the main thread applies the mask). */
  raster?: { grid: RasterGrid; precision: RasterPrecision };
}

export type SurfaceReply =
  | { id: number; tins: Tin[]; rasters?: undefined; summary?: undefined; error?: undefined }
  | { id: number; rasters: RasterValues[]; summary: SurfaceSummary; tins?: undefined; error?: undefined }
  | { id: number; error: string; tins?: undefined; rasters?: undefined; summary?: undefined };

interface PendingJob {
  job: SurfaceJob;
  transfer: ArrayBuffer[];
  resolve: (reply: SurfaceReply) => void;
  reject: (error: Error) => void;
}

/**
 * Start one engine thread. From TypeScript sources Node 20 does not apply the parent's loader
 * hooks to a worker's entry module, so the thread starts from a two-line JavaScript bootstrap that
 * imports the TypeScript entry through tsx's own API.
 */
function startWorker(): Worker {
  const fromSources = import.meta.url.endsWith(".ts");
  if (!fromSources) return new Worker(new URL("./engine-worker.thread.js", import.meta.url));
  const entry = new URL("./engine-worker.thread.ts", import.meta.url).href;
  const tsxApi = import.meta.resolve("tsx/esm/api");
  const bootstrap = `import { tsImport } from ${JSON.stringify(tsxApi)}; await tsImport(${JSON.stringify(entry)}, ${JSON.stringify(import.meta.url)});`;
  return new Worker(new URL(`data:text/javascript,${encodeURIComponent(bootstrap)}`), { execArgv: [] });
}

function clipToMask(values: RasterValues, mask: Uint8Array): RasterValues {
  for (let node = 0; node < mask.length; node++) if (mask[node] === 0) values[node] = Number.NaN;
  return values;
}

export interface PoolRunOptions {
  /** Hand the survey buffers to the workers instead of copying them; the caller's arrays become unusable. */
  transferInputs?: boolean;
}

export class EngineWorkerPool {
  private readonly idle: Worker[] = [];
  private readonly workers: Worker[] = [];
  private readonly queue: PendingJob[] = [];
  private readonly running = new Map<number, PendingJob & { worker: Worker }>();
  private nextId = 1;
  private readonly collected = new Map<Worker, () => void>();

  constructor(size = 2) {
    for (let index = 0; index < size; index++) {
      const worker = startWorker();
      worker.on("message", (reply: SurfaceReply | { collected: true }) => {
        if ("collected" in reply) this.collected.get(worker)?.();
        else this.finish(worker, reply);
      });
      worker.on("error", (error) => {
        for (const [id, task] of this.running) {
          if (task.worker === worker) {
            this.running.delete(id);
            task.reject(error);
          }
        }
      });
      this.workers.push(worker);
      this.idle.push(worker);
    }
  }

  private run(job: Omit<SurfaceJob, "id">, transferInputs: boolean): Promise<SurfaceReply> {
    const transfer = transferInputs ? [...new Set([job.easting, job.northing, ...job.layers].map((array) => array.buffer as ArrayBuffer))] : [];
    return new Promise((resolve, reject) => {
      this.queue.push({ job: { ...job, id: this.nextId++ }, transfer, resolve, reject });
      this.dispatch();
    });
  }

  private jobsFor(surveys: EngineSurveys): Array<{ easting: Float64Array; northing: Float64Array; layers: Float64Array[] }> {
    const { baseline, firm } = surveys;
    const shared = firmSharesBaselinePositions(surveys);
    return [
      { easting: baseline.easting, northing: baseline.northing, layers: shared ? [baseline.elevation, firm.elevation] : [baseline.elevation] },
      ...(shared ? [] : [{ easting: firm.easting, northing: firm.northing, layers: [firm.elevation] }]),
      ...surveys.progress.map((survey) => ({ easting: survey.easting, northing: survey.northing, layers: [survey.elevation] })),
    ];
  }

  /** Every survey's TIN, in parallel; the same result as `triangulateSurveys` in shared/pipeline. */
  async triangulateSurveys(surveys: EngineSurveys, maxEdge: number, options: PoolRunOptions = {}): Promise<EngineSurfaces> {
    const replies = await Promise.all(this.jobsFor(surveys).map((job) => this.run({ ...job, maxEdge }, options.transferInputs ?? false)));
    const tins = replies.flatMap((reply) => reply.tins ?? []);
    // Layers on the same soundings share their coordinate and triangle buffers; structured cloning keeps that sharing.
    const [baseline, firm, ...progress] = tins;
    return { baseline, firm, progress };
  }

  /**
   * The whole computation with the surveys triangulated and sampled in parallel. With a work limit
   * the raster grid is known before any triangulation, so each thread samples its own surfaces and
   * only rasters cross back; the main thread lays the mask meanwhile. Without one the limit is the
   * baseline's hull, which needs the baseline TIN first.
   */
  async computeSurveyVolumes(
    surveys: EngineSurveys,
    workLimit: ProjectedMultiPolygon | null,
    settings: EngineSettings,
    onProgress?: ProgressCallback,
    options: PoolRunOptions = {},
  ): Promise<EngineResult> {
    if (workLimit === null) {
      const surfaces = await this.triangulateSurveys(surveys, settings.maxEdge, options);
      onProgress?.("triangulate", 1);
      return computeVolumesFromSurfaces(surfaces, null, settings, onProgress);
    }
    const precision = settings.rasterPrecision ?? "float64";
    const cellGrid = createCellGrid(workLimit, { cellSize: settings.cellSize, originX: settings.originX, originY: settings.originY, rotationDegrees: settings.rotationDegrees });
    const grid = rasterGridFor(workLimit, cellGrid, settings.resolution);
    const pending = Promise.all(
      this.jobsFor(surveys).map((job) => this.run({ ...job, maxEdge: settings.maxEdge, raster: { grid, precision } }, options.transferInputs ?? false)),
    );
    const grids = prepareGrids(workLimit, settings, onProgress);
    const replies = await pending;
    onProgress?.("triangulate + raster (threads)", 1);
    const rasters = replies.flatMap((reply) => reply.rasters ?? []).map((values) => clipToMask(values, grids.mask));
    const [muckTop, firm, ...progress] = rasters;
    const summaries = replies.map((reply) => reply.summary!);
    const surfaces: SurfaceSummary = {
      duplicatesMerged: summaries.reduce((sum, summary) => sum + summary.duplicatesMerged, 0),
      longTrianglesDropped: summaries.reduce((sum, summary) => sum + summary.longTrianglesDropped, 0),
      invalidSkipped: summaries.reduce((sum, summary) => sum + summary.invalidSkipped, 0),
    };
    onProgress?.("clip", 1);
    return computeVolumesFromRasters(grids, { muckTop, firm, progress, surfaces }, settings, onProgress);
  }

  /** Run a full garbage collection in every idle thread (benchmarks call this between runs). */
  async collectGarbage(): Promise<void> {
    await Promise.all(
      this.idle.map(
        (worker) =>
          new Promise<void>((resolve) => {
            this.collected.set(worker, resolve);
            worker.postMessage({ collectGarbage: true });
          }),
      ),
    );
    this.collected.clear();
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }

  private dispatch() {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const worker = this.idle.pop()!;
      const task = this.queue.shift()!;
      this.running.set(task.job.id, { ...task, worker });
      worker.postMessage(task.job, task.transfer);
    }
  }

  private finish(worker: Worker, reply: SurfaceReply) {
    const task = this.running.get(reply.id);
    this.running.delete(reply.id);
    this.idle.push(worker);
    if (task) {
      if (reply.error !== undefined) task.reject(new Error(reply.error));
      else task.resolve(reply);
    }
    this.dispatch();
  }
}
