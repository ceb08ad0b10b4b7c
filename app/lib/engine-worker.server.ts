import { Worker } from "node:worker_threads";
import { firmSharesBaselinePositions, type EngineSurfaces, type EngineSurveys } from "../../shared/pipeline";
import type { Tin } from "../../shared/surface/triangulate";

/**
 * A small pool of worker threads for the engine's heaviest independent step: each survey's
 * triangulation. The surveys' arrays are copied in (the caller keeps them) and the TINs come back
 * as transferred buffers, so nothing large is copied twice. The pool is long-lived: start it once
 * with the server (thread start-up costs tens of milliseconds) and `close()` it on shutdown.
 *
 * The worker entry is a TypeScript file; it runs wherever the parent runs TypeScript (tsx in
 * development, tests, the CLI and the benchmark, which pass their loader on through execArgv).
 */
export interface TriangulationJob {
  id: number;
  easting: Float64Array;
  northing: Float64Array;
  layers: Float64Array[];
  maxEdge: number;
}

export type TriangulationReply = { id: number; tins: Tin[]; error?: undefined } | { id: number; error: string; tins?: undefined };

interface PendingJob {
  job: TriangulationJob;
  resolve: (tins: Tin[]) => void;
  reject: (error: Error) => void;
}

/**
 * Start one engine thread. Running from TypeScript sources (tsx), Node 20 does not apply the
 * parent's loader hooks to a worker's entry module, so the thread is started from a two-line
 * JavaScript bootstrap that imports the TypeScript entry through tsx's own API. From compiled
 * JavaScript the entry is loaded directly.
 */
function startWorker(): Worker {
  const fromSources = import.meta.url.endsWith(".ts");
  if (!fromSources) return new Worker(new URL("./engine-worker.thread.js", import.meta.url));
  const entry = new URL("./engine-worker.thread.ts", import.meta.url).href;
  const tsxApi = import.meta.resolve("tsx/esm/api");
  const bootstrap = `import { tsImport } from ${JSON.stringify(tsxApi)}; await tsImport(${JSON.stringify(entry)}, ${JSON.stringify(import.meta.url)});`;
  return new Worker(new URL(`data:text/javascript,${encodeURIComponent(bootstrap)}`), { execArgv: [] });
}

export class EngineWorkerPool {
  private readonly idle: Worker[] = [];
  private readonly workers: Worker[] = [];
  private readonly queue: PendingJob[] = [];
  private readonly running = new Map<number, PendingJob & { worker: Worker }>();
  private nextId = 1;

  constructor(size = 2) {
    for (let index = 0; index < size; index++) {
      const worker = startWorker();
      worker.on("message", (reply: TriangulationReply) => this.finish(worker, reply));
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

  /** Triangulate one set of layers on one worker. */
  triangulate(easting: Float64Array, northing: Float64Array, layers: Float64Array[], maxEdge: number): Promise<Tin[]> {
    return new Promise((resolve, reject) => {
      this.queue.push({ job: { id: this.nextId++, easting, northing, layers, maxEdge }, resolve, reject });
      this.dispatch();
    });
  }

  /** Every survey of a computation, in parallel; the same result as `triangulateSurveys` in shared/pipeline. */
  async triangulateSurveys(surveys: EngineSurveys, maxEdge: number): Promise<EngineSurfaces> {
    const { baseline, firm } = surveys;
    const shared = firmSharesBaselinePositions(surveys);
    const baselineJob = this.triangulate(baseline.easting, baseline.northing, shared ? [baseline.elevation, firm.elevation] : [baseline.elevation], maxEdge);
    const firmJob = shared ? null : this.triangulate(firm.easting, firm.northing, [firm.elevation], maxEdge);
    const progressJobs = surveys.progress.map((survey) => this.triangulate(survey.easting, survey.northing, [survey.elevation], maxEdge));
    const [baselineTins, firmTins, ...progressTins] = await Promise.all([baselineJob, firmJob, ...progressJobs]);
    // Layers on the same soundings share their x, y and triangle buffers; structured cloning keeps that sharing.
    return { baseline: baselineTins[0], firm: shared ? baselineTins[1] : firmTins![0], progress: progressTins.map((tins) => tins[0]) };
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }

  private dispatch() {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const worker = this.idle.pop()!;
      const task = this.queue.shift()!;
      this.running.set(task.job.id, { ...task, worker });
      worker.postMessage(task.job);
    }
  }

  private finish(worker: Worker, reply: TriangulationReply) {
    const task = this.running.get(reply.id);
    this.running.delete(reply.id);
    this.idle.push(worker);
    if (task) {
      if (reply.error !== undefined) task.reject(new Error(reply.error));
      else task.resolve(reply.tins);
    }
    this.dispatch();
  }
}
