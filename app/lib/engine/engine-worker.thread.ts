import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { parentPort } from "node:worker_threads";
import { prepareVertices, triangulateVertices } from "../../../shared/surface/triangulate";
import { doSurveyWork } from "./survey-work";
import type { EngineJob, EngineReply, SurveyWorkJob, TinJob } from "./engine-worker.server";
import type { ProjectState } from "./project-state";
// The state job loads its modules (the figures, the end-area check) on first use: a thread that
// only triangulates and samples stays lean (measured: 2 bay threads 481 → 460 MB).
const projectState = () => import("./project-state");
const projectBands = () => import("./project-bands");
const periodFigures = () => import("./period-figures");

/**
 * Worker-thread side of the engine pool. Five kinds of job: one survey's work (triangulated and
 * sampled onto the project's raster, and/or counted per cell: survey-work.ts), one survey's TINs
 * (the command line without a work limit), a project's state from its sampled surveys
 * (project-state.ts), the contour bands of one of its surfaces (project-bands.ts), and a pay
 * period's figures from the state's rasters (period-figures.ts). Result buffers are transferred,
 * not copied.
 *
 * This file is the entry of its own bundle in the production build (vite.config.ts): it imports
 * only pure modules, and only types from the pool.
 */
/** Below this many soundings the arrays are small and a full collection would cost more than it saves. */
const largeJobSoundings = 250_000;

// A full collection, once the pool has asked for one (see `collectGarbage` in the pool); until then null.
let collect: (() => void) | null = null;

/** The buffers of every typed array reachable in a result (each once), for transferring it. */
function buffersOf(value: unknown, found = new Set<ArrayBuffer>(), seen = new Set<object>()): ArrayBuffer[] {
  if (ArrayBuffer.isView(value)) {
    if (value.buffer instanceof ArrayBuffer) found.add(value.buffer);
  } else if (value !== null && typeof value === "object" && !seen.has(value)) {
    seen.add(value);
    for (const child of Array.isArray(value) ? value : Object.values(value)) buffersOf(child, found, seen);
  }
  return [...found];
}

/** A copy of `array` on a SharedArrayBuffer: the request thread hands it to a later job without copying it again. */
function shared<T extends Float32Array | Float64Array | Int32Array>(array: T): T {
  const copy = new (array.constructor as new (buffer: SharedArrayBuffer) => T)(new SharedArrayBuffer(array.byteLength));
  copy.set(array);
  return copy;
}

/**
 * The rasters a pay period reads (period-figures.ts: the baseline's bottom, firm sand, the later
 * surveys' bottoms and each node's cell) moved to shared memory before the state goes back: the
 * state stays in the request thread, and each period job then passes them to a thread for nothing
 * rather than copying tens of megabytes on the request thread. Everything else is transferred.
 */
function shareWhatPeriodsRead(state: ProjectState) {
  const { result } = state.surfaces;
  result.rasters.muckTop = { ...result.rasters.muckTop, values: shared(result.rasters.muckTop.values) };
  result.rasters.firm = { ...result.rasters.firm, values: shared(result.rasters.firm.values) };
  result.nodeCell = shared(result.nodeCell);
  state.periods.progress = state.periods.progress.map(shared);
}

function reply(message: EngineReply, transfer: ArrayBuffer[] = []) {
  parentPort?.postMessage(message, transfer);
}

function surveyJob(message: SurveyWorkJob) {
  const work: Partial<SurveyWorkJob["work"]> = message.work;
  // Once the soundings are copied into the triangulation's arrays, drop the input columns (and
  // collect, when allowed) before Delaunator allocates its own, so a million-sounding job does not hold both.
  return doSurveyWork(message.work, message.settings, (vertices) => {
    work.easting = work.northing = work.elevation = work.refusalElevation = undefined;
    if (vertices >= largeJobSoundings) collect?.();
  });
}

function tinJob(message: TinJob) {
  const job: Partial<TinJob> & Pick<TinJob, "maxEdge"> = message;
  const prepared = prepareVertices(job.easting!, job.northing!, job.layers!);
  job.easting = job.northing = job.layers = undefined; // as in surveyJob
  if (prepared.xy.length / 2 >= largeJobSoundings) collect?.();
  return triangulateVertices(prepared, { maxEdge: job.maxEdge });
}

parentPort?.on("message", async (message: EngineJob | { collectGarbage: true }) => {
  if ("collectGarbage" in message) {
    if (collect === null) {
      setFlagsFromString("--expose-gc");
      collect = runInNewContext("gc") as () => void;
    }
    collect();
    parentPort?.postMessage({ collected: true });
    return;
  }
  const { id } = message;
  try {
    if (message.kind === "state") {
      const { computeStateFromRasters } = await projectState();
      const done = { state: computeStateFromRasters(message.input, (stage, fraction) => reply({ id, progress: { stage, fraction } })) };
      shareWhatPeriodsRead(done.state);
      reply({ id, done }, buffersOf(done));
      return;
    }
    if (message.kind === "bands") {
      const { computeProjectBands } = await projectBands();
      reply({ id, done: { bands: computeProjectBands(message.input) } });
      return;
    }
    if (message.kind === "period") {
      const { computePeriodFigures } = await periodFigures();
      const done = { period: computePeriodFigures(message.input) };
      reply({ id, done }, buffersOf(done));
      return;
    }
    const large = (message.kind === "survey" ? message.work.easting : message.easting).length >= largeJobSoundings;
    const done = message.kind === "survey" ? { survey: surveyJob(message) } : { tins: tinJob(message) };
    reply({ id, done }, buffersOf(done));
    // The TIN and Delaunator's arrays are garbage now; free them while the main thread carries on.
    if (large) collect?.();
  } catch (error) {
    reply({ id, error: (error as Error).message });
  }
});

parentPort?.postMessage({ ready: true });
