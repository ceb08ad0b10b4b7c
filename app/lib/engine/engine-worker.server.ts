import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import { createCellGrid } from "../../../shared/grid/cell-grid";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
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
} from "../../../shared/pipeline";
import type { RasterGrid, RasterPrecision, RasterValues } from "../../../shared/surface/raster";
import type { Tin } from "../../../shared/surface/triangulate";
import type { ComputationSurvey, ProjectComputation, ProjectComputationInput } from "./project-figures";
import type { LatestSurfacesInput, ProjectSurfaces } from "./latest-surfaces";

/**
 * A small pool of worker threads for the engine's heavy work, so it never blocks the web
 * server's event loop: each survey's triangulation and rasterisation (the CLI, the benchmark), a
 * project's whole figures computation (an import commit or retraction) and the map's latest
 * surfaces. Inputs are copied in, or transferred when the caller says it is done with them;
 * results come back as transferred buffers. The pool is long-lived: a thread takes tens of
 * milliseconds to start. Idle threads do not hold the process open; `close()` ends them.
 *
 * The worker entry is engine-worker.thread.ts when running from sources (tsx: development, the
 * CLI, the benchmark, Vitest) and engine-worker.thread.mjs beside the server bundle in the
 * production build (emitted by the build: see vite.config.ts).
 */
export interface SurfaceJob {
  kind?: undefined;
  id: number;
  easting: Float64Array;
  northing: Float64Array;
  layers: Float64Array[];
  maxEdge: number;
  /** Sample in the worker and return rasters (not clipped: the main thread applies the mask). */
  raster?: { grid: RasterGrid; precision: RasterPrecision };
}

/** A project's figures (computeProjectFigures), progress reported back as it goes. */
export interface FiguresJob {
  kind: "figures";
  id: number;
  input: ProjectComputationInput;
}

/** The map's latest surfaces (computeLatestSurfaces). */
export interface LatestSurfacesJob {
  kind: "surfaces";
  id: number;
  input: LatestSurfacesInput;
}

export type EngineJob = SurfaceJob | FiguresJob | LatestSurfacesJob;
type NewJob = SurfaceJobWithoutId | Omit<FiguresJob, "id"> | Omit<LatestSurfacesJob, "id">;
type SurfaceJobWithoutId = Omit<SurfaceJob, "id">;

export type SurfaceReply =
  | { id: number; tins: Tin[]; rasters?: undefined; summary?: undefined; error?: undefined }
  | { id: number; rasters: RasterValues[]; summary: SurfaceSummary; tins?: undefined; error?: undefined };

export type EngineReply =
  | { id: number; done: SurfaceReply | { figures: ProjectComputation | null } | { surfaces: ProjectSurfaces | null } }
  | { id: number; progress: { stage: string; fraction: number } }
  | { id: number; error: string };

/** What the thread posts: a job's reply, the answer to a garbage-collection request, or that it has loaded. */
export type ThreadMessage = EngineReply | { collected: true } | { ready: true };

interface PendingJob {
  job: EngineJob;
  transfer: ArrayBuffer[];
  onProgress?: ProgressCallback;
  resolve: (reply: unknown) => void;
  reject: (error: Error) => void;
}

/** The built worker's file name, beside the server bundle (vite.config.ts emits it under this name). */
export const BUILT_WORKER_FILE = "engine-worker.thread.mjs";

/** Where this module's worker entry is: the TypeScript source, or the built file beside the bundle. */
export function workerEntry(moduleUrl: string = import.meta.url): { url: URL; fromSources: boolean } {
  const fromSources = moduleUrl.endsWith(".ts");
  return { url: new URL(fromSources ? "./engine-worker.thread.ts" : `./${BUILT_WORKER_FILE}`, moduleUrl), fromSources };
}

/**
 * Start one engine thread. From TypeScript sources Node 20 does not apply the parent's loader
 * hooks to a worker's entry module, so the thread starts from a two-line JavaScript bootstrap that
 * imports the TypeScript entry through tsx's own API.
 */
function startWorker(): Worker {
  const entry = workerEntry();
  if (!existsSync(fileURLToPath(entry.url))) {
    throw new Error(
      `Firmsand's engine worker is missing: ${fileURLToPath(entry.url)}. The production build emits it beside the server bundle; rebuild the app (npm start or react-router build).`,
    );
  }
  if (!entry.fromSources) return new Worker(entry.url);
  const tsxApi = tsxApiUrl();
  const bootstrap = `import { tsImport } from ${JSON.stringify(tsxApi)}; await tsImport(${JSON.stringify(entry.url.href)}, ${JSON.stringify(import.meta.url)});`;
  return new Worker(new URL(`data:text/javascript,${encodeURIComponent(bootstrap)}`), { execArgv: [] });
}

/** tsx's loader API; Vite's dev-server module runner may not offer import.meta.resolve, hence the fallback. */
function tsxApiUrl(): string {
  try {
    return import.meta.resolve("tsx/esm/api");
  } catch {
    return pathToFileURL(createRequire(import.meta.url).resolve("tsx/esm/api")).href;
  }
}

function clipToMask(values: RasterValues, mask: Uint8Array): RasterValues {
  for (let node = 0; node < mask.length; node++) if (mask[node] === 0) values[node] = Number.NaN;
  return values;
}

/**
 * An array that owns its whole buffer, so the buffer can cross to a thread without carrying (or
 * detaching) anything else: a view into a larger buffer is copied first.
 */
function ownBuffer<T extends Float64Array>(array: T): T {
  return array.byteOffset === 0 && array.byteLength === array.buffer.byteLength ? array : (array.slice() as T);
}

export interface PoolRunOptions {
  /** Hand the survey buffers to the workers instead of copying them; the caller's arrays become unusable. */
  transferInputs?: boolean;
}

export interface FiguresRunOptions {
  onProgress?: ProgressCallback;
  /**
   * Ids of the surveys whose arrays the caller is done with: their buffers move to the thread
   * (no copy) and become unusable here. The others are copied.
   */
  transferSurveys?: ReadonlySet<number>;
}

export class EngineWorkerPool {
  private readonly idle: Worker[] = [];
  private readonly workers: Worker[] = [];
  private readonly queue: PendingJob[] = [];
  private readonly running = new Map<number, PendingJob & { worker: Worker }>();
  private nextId = 1;
  private readonly collected = new Map<Worker, () => void>();
  private closing = false;
  /** Threads whose entry module has loaded; one that exits before that is not replaced (it would fail again). */
  private readonly ready = new Set<Worker>();
  private startError: Error | null = null;

  /**
   * @param size threads to start
   * @param options.unrefIdle let idle threads not hold the process open (a long-lived pool in the
   *   server or a script); a thread with a job holds it open until the job ends.
   */
  constructor(
    size = 2,
    private readonly options: { unrefIdle?: boolean } = {},
  ) {
    if (!Number.isInteger(size) || size < 1) throw new Error(`an engine pool needs at least one thread (asked for ${size})`);
    for (let index = 0; index < size; index++) this.addWorker();
  }

  get size(): number {
    return this.workers.length;
  }

  private addWorker() {
    const worker = startWorker();
    worker.on("message", (message: ThreadMessage) => {
      if ("ready" in message) this.ready.add(worker);
      else if ("collected" in message) this.collected.get(worker)?.();
      else if ("progress" in message) this.running.get(message.id)?.onProgress?.(message.progress.stage, message.progress.fraction);
      else this.finish(worker, message);
    });
    let lastError: Error | null = null;
    worker.on("error", (error) => {
      lastError = error;
      this.failJobsOf(worker, error);
    });
    // A thread that dies (out of memory, a crash) fails its job and is replaced, so the pool keeps
    // its size; one that could not even load its entry is not, and once none is left every job fails.
    worker.on("exit", (code) => {
      this.failJobsOf(worker, lastError ?? new Error(`an engine thread stopped (exit code ${code})`));
      this.workers.splice(this.workers.indexOf(worker), 1);
      const idleAt = this.idle.indexOf(worker);
      if (idleAt >= 0) this.idle.splice(idleAt, 1);
      this.collected.get(worker)?.();
      if (this.closing) return;
      if (this.ready.delete(worker)) {
        this.addWorker();
        this.dispatch();
      } else if (this.workers.length === 0) {
        this.startError = new Error(`the engine threads could not start: ${lastError?.message ?? `exit code ${code}`}`);
        for (const task of this.queue.splice(0)) task.reject(this.startError);
      }
    });
    if (this.options.unrefIdle) worker.unref();
    this.workers.push(worker);
    this.idle.push(worker);
  }

  private failJobsOf(worker: Worker, error: Error) {
    for (const [id, task] of this.running) {
      if (task.worker === worker) {
        this.running.delete(id);
        task.reject(error);
      }
    }
  }

  private submit<T>(job: NewJob, transfer: ArrayBuffer[], onProgress?: ProgressCallback): Promise<T> {
    if (this.closing) return Promise.reject(new Error("the engine pool is closed"));
    if (this.startError) return Promise.reject(this.startError);
    return new Promise((resolve, reject) => {
      this.queue.push({ job: { ...job, id: this.nextId++ } as EngineJob, transfer, onProgress, resolve: resolve as (reply: unknown) => void, reject });
      this.dispatch();
    });
  }

  private run(job: Omit<SurfaceJob, "id">, transferInputs: boolean): Promise<SurfaceReply> {
    const transfer = transferInputs ? [...new Set([job.easting, job.northing, ...job.layers].map((array) => array.buffer as ArrayBuffer))] : [];
    return this.submit<SurfaceReply>(job, transfer);
  }

  /**
   * `computeProjectFigures` in a thread: the same figures, without blocking this thread. Survey
   * arrays are copied unless listed in `transferSurveys`.
   */
  computeProjectFigures(input: ProjectComputationInput, options: FiguresRunOptions = {}): Promise<ProjectComputation | null> {
    const { surveys, transfer } = this.prepareSurveys(input.surveys, options.transferSurveys);
    return this.submit<{ figures: ProjectComputation | null }>({ kind: "figures", input: { ...input, surveys } }, transfer, options.onProgress).then((done) => done.figures);
  }

  /** `computeLatestSurfaces` in a thread (the map's surfaces); surveys as in `computeProjectFigures`. */
  computeLatestSurfaces(input: LatestSurfacesInput, options: { transferSurveys?: ReadonlySet<number> } = {}): Promise<ProjectSurfaces | null> {
    const { surveys, transfer } = this.prepareSurveys(input.surveys, options.transferSurveys);
    return this.submit<{ surfaces: ProjectSurfaces | null }>({ kind: "surfaces", input: { ...input, surveys } }, transfer).then((done) => done.surfaces);
  }

  private prepareSurveys(surveys: ComputationSurvey[], transferIds: ReadonlySet<number> = new Set()) {
    const transfer = new Set<ArrayBuffer>();
    const prepared = surveys.map((survey) => {
      const columns = { easting: ownBuffer(survey.easting), northing: ownBuffer(survey.northing), elevation: ownBuffer(survey.elevation), refusalElevation: survey.refusalElevation && ownBuffer(survey.refusalElevation) };
      if (transferIds.has(survey.id)) for (const array of Object.values(columns)) if (array) transfer.add(array.buffer as ArrayBuffer);
      return { ...survey, ...columns };
    });
    return { surveys: prepared, transfer: [...transfer] };
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
    this.closing = true;
    for (const task of this.queue.splice(0)) task.reject(new Error("the engine pool was closed before the job started"));
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }

  private dispatch() {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const worker = this.idle.pop()!;
      const task = this.queue.shift()!;
      this.running.set(task.job.id, { ...task, worker });
      if (this.options.unrefIdle) worker.ref();
      worker.postMessage(task.job, task.transfer);
    }
  }

  private finish(worker: Worker, reply: Exclude<EngineReply, { progress: unknown }>) {
    const task = this.running.get(reply.id);
    this.running.delete(reply.id);
    this.idle.push(worker);
    if (this.options.unrefIdle) worker.unref();
    if (task) {
      if ("error" in reply) task.reject(new Error(reply.error));
      else task.resolve(reply.done);
    }
    this.dispatch();
  }
}

let appPool: EngineWorkerPool | null | undefined;

/**
 * The server's engine pool, started on first use and kept for the life of the process; its idle
 * threads do not hold the process open, so a graceful shutdown (app/serve.mjs) or the end of a
 * script needs no call to close it. `threads` comes from ENGINE_THREADS (see env.server.ts); 0
 * turns the pool off and the caller computes on its own thread, blocking it: meant for
 * debugging with a profiler, never the default.
 */
export function appEnginePool(threads: number): EngineWorkerPool | null {
  if (appPool === undefined) {
    appPool = threads > 0 ? new EngineWorkerPool(threads, { unrefIdle: true }) : null;
    if (appPool === null) process.stderr.write("[firmsand] ENGINE_THREADS=0: engine computations run on the request thread\n");
  }
  return appPool;
}

/** Ends the server's pool (tests, or a shutdown that wants to stop work in progress). */
export async function closeAppEnginePool(): Promise<void> {
  const pool = appPool;
  appPool = undefined;
  await pool?.close();
}
