import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { parentPort } from "node:worker_threads";
import { createRasterValues, rasterizeTinInto } from "../../../shared/surface/raster";
import { prepareVertices, triangulateVertices } from "../../../shared/surface/triangulate";
import type { EngineJob, EngineReply, SurfaceJob, SurfaceReply } from "./engine-worker.server";
// The project-figures and map-surfaces jobs load their modules (the whole pipeline) on first use:
// a thread that only triangulates and rasterises stays lean (measured: 2 bay threads 481 → 460 MB).
const projectComputation = () => import("./project-figures");
const latestSurfaces = () => import("./latest-surfaces");

/**
 * Worker-thread side of the engine pool. Three kinds of job: one survey's triangulation (one or
 * more value layers on the same soundings), sending back the TINs or, when the raster grid is
 * known, only the rasters sampled here; a project's whole figures computation; the map's latest
 * surfaces. Result buffers are transferred, not copied.
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

function reply(message: EngineReply, transfer: ArrayBuffer[] = []) {
  parentPort?.postMessage(message, transfer);
}

function surfaceJob(message: SurfaceJob): SurfaceReply {
  const job: Partial<SurfaceJob> & Pick<SurfaceJob, "id" | "maxEdge"> = message;
  const prepared = prepareVertices(job.easting!, job.northing!, job.layers!);
  // The input columns are copied into `prepared`; drop them (and collect, when allowed) before
  // Delaunator allocates its own arrays, so a million-sounding job does not hold both.
  job.easting = job.northing = job.layers = undefined;
  if (prepared.xy.length >= 2 * largeJobSoundings) collect?.();
  const tins = triangulateVertices(prepared, { maxEdge: job.maxEdge });
  if (message.raster) {
    const { grid, precision } = message.raster;
    const rasters = tins.map((tin) => {
      const values = createRasterValues(grid, precision);
      rasterizeTinInto(tin, grid, values, null);
      return values;
    });
    const { duplicatesMerged, longTrianglesDropped, invalidSkipped } = tins[0];
    return { id: job.id, rasters, summary: { duplicatesMerged, longTrianglesDropped, invalidSkipped } };
  }
  return { id: job.id, tins };
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
    let done: Extract<EngineReply, { done: unknown }>["done"];
    if (message.kind === "figures") {
      const { computeProjectFigures } = await projectComputation();
      done = { figures: computeProjectFigures(message.input, (stage, fraction) => reply({ id, progress: { stage, fraction } })) };
    } else if (message.kind === "surfaces") {
      const { computeLatestSurfaces } = await latestSurfaces();
      done = { surfaces: computeLatestSurfaces(message.input) };
    } else {
      const large = message.easting.length >= largeJobSoundings;
      done = surfaceJob(message);
      reply({ id, done }, buffersOf(done));
      // The TIN and Delaunator's arrays are garbage now; free them while the main thread carries on.
      if (large) collect?.();
      return;
    }
    reply({ id, done }, buffersOf(done));
  } catch (error) {
    reply({ id, error: (error as Error).message });
  }
});

parentPort?.postMessage({ ready: true });
