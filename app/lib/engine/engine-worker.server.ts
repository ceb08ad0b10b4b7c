import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import {
  addSurfaceSummaries,
  computeVolumesFromRasters,
  computeVolumesFromSurfaces,
  firmSharesBaselinePositions,
  layGridLines,
  prepareGrids,
  clipToMask,
  type EngineResult,
  type EngineSettings,
  type EngineSurfaces,
  type EngineSurveys,
  type GridLines,
  type ProgressCallback,
  type SurveyPoints,
} from "../../../shared/pipeline";
import type { Tin } from "../../../shared/surface/triangulate";
import type { SurveyKind } from "../../../shared/surveys-in-force";
import type { ComputationSurvey } from "./engine-surveys";
import type { Bands, BandsInput } from "./project-bands";
import type { PeriodFigures, PeriodFiguresInput } from "./period-figures";
import type { SurveyWork, SurveyWorkDone, SurveyWorkSettings } from "./survey-work";
import { gatherSurveyWork, planProjectWork, type ProjectState, type ProjectStateInput, type SampledProjectInput } from "./project-state";

/**
 * A small pool of worker threads for the engine's heavy work, so it never blocks the web
 * server's event loop. A project's engine state (project-state.ts) runs as one job per survey
 * (triangulated and sampled in parallel when there are several threads) and then one job that
 * lays the grids and computes the state from the rasters; the command line and the benchmark
 * triangulate surveys the same way. Inputs are copied in, or transferred when the caller says it
 * is done with them; results come back as transferred buffers. The pool is long-lived: a thread
 * takes tens of milliseconds to start. Idle threads do not hold the process open; `close()` ends them.
 *
 * The worker entry is engine-worker.thread.ts when running from sources (tsx: development, the
 * CLI, the benchmark, Vitest) and engine-worker.thread.mjs beside the server bundle in the
 * production build (emitted by the build: see vite.config.ts).
 */

/** One survey's TINs (one per value layer), without a raster: the command line without a work limit. */
export interface TinJob {
  kind: "tins";
  id: number;
  easting: Float64Array;
  northing: Float64Array;
  layers: Float64Array[];
  maxEdge: number;
}

/** One survey's work: triangulated and sampled, and/or counted per cell (survey-work.ts). */
export interface SurveyWorkJob {
  kind: "survey";
  id: number;
  work: SurveyWork;
  settings: SurveyWorkSettings;
}

/** A project's engine state from its sampled surveys (project-state.ts, step 2), progress reported back as it goes. */
export interface StateJob {
  kind: "state";
  id: number;
  input: SampledProjectInput;
}

/** Filled contour bands of one surface of the state, in lon/lat (shared/bands.ts). */
export interface BandsJob {
  kind: "bands";
  id: number;
  input: BandsInput;
}

/** A pay period's figures from the state's rasters (period-figures.ts): one pass over every raster node. */
export interface PeriodJob {
  kind: "period";
  id: number;
  input: PeriodFiguresInput;
}

export type EngineJob = TinJob | SurveyWorkJob | StateJob | BandsJob | PeriodJob;
type NewJob = Omit<TinJob, "id"> | Omit<SurveyWorkJob, "id"> | Omit<StateJob, "id"> | Omit<BandsJob, "id"> | Omit<PeriodJob, "id">;

export type EngineReply =
  | { id: number; done: { tins: Tin[] } | { survey: SurveyWorkDone } | { state: ProjectState } | { bands: Bands } | { period: PeriodFigures } }
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

/**
 * An array that owns its whole buffer, so the buffer can cross to a thread without carrying (or
 * detaching) anything else: a view into a larger buffer is copied first.
 */
function ownBuffer<T extends Float64Array>(array: T): T {
  return array.byteOffset === 0 && array.byteLength === array.buffer.byteLength ? array : (array.slice() as T);
}

/**
 * The survey work items as they go to the threads, each with the buffers it may take: a buffer
 * of a survey the caller hands over (`transferIds`), or one the plan made itself (the firm-sand
 * points), and that no other item reads. Everything else is copied; a column that is a view into
 * a larger buffer is copied first, so neither the whole buffer crosses nor is taken.
 */
function movableWork(surveys: readonly ComputationSurvey[], work: readonly SurveyWork[], transferIds: ReadonlySet<number>) {
  const ownerOf = new Map<ArrayBufferLike, number>();
  for (const survey of surveys) {
    for (const column of [survey.easting, survey.northing, survey.elevation, survey.refusalElevation]) if (column) ownerOf.set(column.buffer, survey.id);
  }
  const columnsOf = (item: SurveyWork) => [item.easting, item.northing, item.elevation, item.refusalElevation].filter((column): column is Float64Array => Boolean(column));
  const readers = new Map<ArrayBufferLike, number>();
  for (const item of work) for (const buffer of new Set(columnsOf(item).map((column) => column.buffer))) readers.set(buffer, (readers.get(buffer) ?? 0) + 1);
  return work.map((item) => {
    const transfer = new Set<ArrayBuffer>();
    const prepare = <Column extends Float64Array | null | undefined>(column: Column): Column => {
      if (!column) return column;
      const owner = ownerOf.get(column.buffer);
      const movable = (owner === undefined || transferIds.has(owner)) && readers.get(column.buffer) === 1;
      const own = ownBuffer(column);
      if (movable || own !== column) transfer.add(own.buffer as ArrayBuffer);
      return own as Column;
    };
    const prepared: SurveyWork = { ...item, easting: prepare(item.easting), northing: prepare(item.northing), elevation: prepare(item.elevation) };
    if (item.refusalElevation !== undefined) prepared.refusalElevation = prepare(item.refusalElevation);
    return { work: prepared, transfer: [...transfer] };
  });
}

export interface PoolRunOptions {
  /** Hand the survey buffers to the workers instead of copying them; the caller's arrays become unusable. */
  transferInputs?: boolean;
}

export interface StateRunOptions {
  onProgress?: ProgressCallback;
  /**
   * Ids of the surveys whose arrays the caller is done with: their buffers move to the threads
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

  /**
   * A project's engine state (`computeProjectState` in project-state.ts) without blocking this
   * thread: one job per survey, spread over the threads, then one job for the state. Survey
   * arrays are copied unless listed in `transferSurveys`. Null when no baseline is in force.
   */
  async computeProjectState(input: ProjectStateInput, options: StateRunOptions = {}): Promise<ProjectState | null> {
    const work = planProjectWork(input);
    if (work === null) return null;
    const items = movableWork(input.surveys, work.plan.work, options.transferSurveys ?? new Set());
    let finished = 0;
    const done = await Promise.all(
      items.map(({ work: item, transfer }) =>
        this.submit<{ survey: SurveyWorkDone }>({ kind: "survey", work: item, settings: work.settings }, transfer).then((reply) => {
          options.onProgress?.("triangulate", ++finished / items.length);
          return reply.survey;
        }),
      ),
    );
    const { surveys: _surveys, ...rest } = input;
    const dated = (survey: { id: number; kind: SurveyKind; surveyedOn: string }) => ({ id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn });
    const gathered = gatherSurveyWork(work.plan, done);
    const stateInput: SampledProjectInput = {
      ...rest,
      inForce: { baseline: dated(work.inForce.baseline), later: work.inForce.later.map(dated) },
      lines: work.lines,
      ...gathered,
    };
    const transfer = [...new Set([gathered.sampled.muckTop, gathered.sampled.firm, ...gathered.sampled.progress, ...gathered.soundingsPerCell].map((array) => array.buffer as ArrayBuffer))];
    const reply = await this.submit<{ state: ProjectState }>({ kind: "state", input: stateInput }, transfer, options.onProgress);
    return reply.state;
  }

  /** Contour bands (`computeProjectBands`) in a thread; the raster is copied, the bands come back. */
  async computeProjectBands(input: BandsInput): Promise<Bands> {
    return (await this.submit<{ bands: Bands }>({ kind: "bands", input }, [])).bands;
  }

  /**
   * A pay period's figures (`computePeriodFigures`) in a thread. The rasters a period reads are in
   * shared memory since the state job made them (engine-worker.thread.ts, shareWhatPeriodsRead),
   * so handing them to the thread copies nothing; the figures come back as typed columns.
   */
  async computePeriodFigures(input: PeriodFiguresInput): Promise<PeriodFigures> {
    return (await this.submit<{ period: PeriodFigures }>({ kind: "period", input }, [])).period;
  }

  private tinJobs(surveys: EngineSurveys): Array<Omit<TinJob, "id" | "maxEdge">> {
    const { baseline, firm } = surveys;
    const shared = firmSharesBaselinePositions(surveys);
    return [
      { kind: "tins", easting: baseline.easting, northing: baseline.northing, layers: shared ? [baseline.elevation, firm.elevation] : [baseline.elevation] },
      ...(shared ? [] : [{ kind: "tins" as const, easting: firm.easting, northing: firm.northing, layers: [firm.elevation] }]),
      ...surveys.progress.map((survey) => ({ kind: "tins" as const, easting: survey.easting, northing: survey.northing, layers: [survey.elevation] })),
    ];
  }

  private static inputTransfer(job: { easting: Float64Array; northing: Float64Array; layers: Float64Array[] }, transferInputs: boolean): ArrayBuffer[] {
    return transferInputs ? [...new Set([job.easting, job.northing, ...job.layers].map((array) => array.buffer as ArrayBuffer))] : [];
  }

  /** Every survey's TIN, in parallel; the same result as `triangulateSurveys` in shared/pipeline. */
  async triangulateSurveys(surveys: EngineSurveys, maxEdge: number, options: PoolRunOptions = {}): Promise<EngineSurfaces> {
    const replies = await Promise.all(
      this.tinJobs(surveys).map((job) => this.submit<{ tins: Tin[] }>({ ...job, maxEdge }, EngineWorkerPool.inputTransfer(job, options.transferInputs ?? false))),
    );
    const tins = replies.flatMap((reply) => reply.tins);
    // Layers on the same soundings share their coordinate and triangle buffers; structured cloning keeps that sharing.
    const [baseline, firm, ...progress] = tins;
    return { baseline, firm, progress };
  }

  /**
   * The whole computation of two surveys' volumes (the command line, the benchmark) with the
   * surveys triangulated and sampled in parallel. With a work limit the raster grid is known
   * before any triangulation, so each thread samples its own surfaces and only rasters cross
   * back; this thread lays the mask meanwhile. Without one the limit is the baseline's hull, which
   * needs the baseline TIN first.
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
    const lines = layGridLines(workLimit, settings);
    const workSettings = surveyWorkSettings(lines, settings);
    const work = [...baselineWork(surveys.baseline, surveys.firm), ...surveys.progress.map(progressWork)];
    const pending = work.map((item) => this.surveyWork(item, workSettings, options));
    return volumesFromSurveyWork(workLimit, settings, lines, pending, onProgress);
  }

  /**
   * One survey's work (triangulated and sampled, survey-work.ts) in a thread: the command line
   * hands each survey over as soon as its file is read. Inputs are copied unless `transferInputs`.
   */
  surveyWork(item: SurveyWork, settings: SurveyWorkSettings, options: PoolRunOptions = {}): Promise<SurveyWorkDone> {
    const layers = [item.elevation!, ...(item.refusalElevation ? [item.refusalElevation] : [])];
    return this.submit<{ survey: SurveyWorkDone }>(
      { kind: "survey", work: item, settings },
      EngineWorkerPool.inputTransfer({ easting: item.easting, northing: item.northing, layers }, options.transferInputs ?? false),
    ).then((reply) => reply.survey);
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

/** The survey-work settings of a computation on `lines` (every survey's work shares them). */
export function surveyWorkSettings(lines: GridLines, settings: EngineSettings): SurveyWorkSettings {
  return { maxEdge: settings.maxEdge, rasterGrid: lines.rasterGrid, precision: settings.rasterPrecision ?? "float64", cellGrid: lines.cellGrid };
}

/**
 * The baseline's work: it samples firm sand too when the probe sits on its soundings; firm points
 * of their own are a job of their own. Its rasters come back bottom first, then firm sand.
 */
export function baselineWork(baseline: SurveyPoints, firm: SurveyPoints): SurveyWork[] {
  const shared = firmSharesBaselinePositions({ baseline, firm, progress: [] });
  return [
    { easting: baseline.easting, northing: baseline.northing, elevation: baseline.elevation, ...(shared ? { refusalElevation: firm.elevation } : {}), count: false },
    ...(shared ? [] : [{ easting: firm.easting, northing: firm.northing, elevation: firm.elevation, count: false }]),
  ];
}

export function progressWork(survey: SurveyPoints): SurveyWork {
  return { easting: survey.easting, northing: survey.northing, elevation: survey.elevation, count: false };
}

/**
 * The volumes once every survey's work is back (`pending`: the baseline's work, then each
 * progress survey's, as from `baselineWork` and `progressWork`); the grids are laid on this
 * thread meanwhile, then the rasters clipped to the limit.
 */
export async function volumesFromSurveyWork(
  workLimit: ProjectedMultiPolygon,
  settings: EngineSettings,
  lines: GridLines,
  pending: ReadonlyArray<Promise<SurveyWorkDone>>,
  onProgress?: ProgressCallback,
  /** Called once every reply is in, before the rest is computed (the command line ends its threads there, freeing their memory). */
  whenBack?: () => Promise<void>,
): Promise<EngineResult> {
  const all = Promise.all(pending);
  all.catch(() => {}); // a failure is thrown below, once the grids are laid
  const grids = prepareGrids(workLimit, settings, onProgress, lines);
  const replies = await all;
  await whenBack?.();
  onProgress?.("triangulate + raster (threads)", 1);
  const rasters = replies.flatMap((reply) => reply.rasters).map((values) => clipToMask(values, grids.mask));
  const [muckTop, firmSand, ...progress] = rasters;
  const surfaces = addSurfaceSummaries(replies.map((reply) => reply.summary!));
  onProgress?.("clip", 1);
  return computeVolumesFromRasters(grids, { muckTop, firm: firmSand, progress, surfaces }, settings, onProgress);
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
