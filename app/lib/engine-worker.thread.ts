import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { parentPort } from "node:worker_threads";
import { createRasterValues, rasterizeTinInto } from "../../shared/surface/raster";
import { prepareVertices, triangulateVertices } from "../../shared/surface/triangulate";
import type { SurfaceJob, SurfaceReply } from "./engine-worker.server";

/**
 * Worker-thread side of the engine pool: triangulates one survey (one or more value layers on the
 * same soundings) and either sends the TINs back or, when the raster grid is known, samples them
 * there and sends only the rasters. Buffers are transferred, not copied.
 */
/** Below this many soundings the arrays are small and a full collection would cost more than it saves. */
const largeJobSoundings = 250_000;

// A full collection, once the pool has asked for one (see `collectGarbage` in the pool); until then null.
let collect: (() => void) | null = null;

parentPort?.on("message", (message: SurfaceJob | { collectGarbage: true }) => {
  if ("collectGarbage" in message) {
    if (collect === null) {
      setFlagsFromString("--expose-gc");
      collect = runInNewContext("gc") as () => void;
    }
    collect();
    parentPort?.postMessage({ collected: true });
    return;
  }
  const job: Partial<SurfaceJob> & Pick<SurfaceJob, "id" | "maxEdge"> = message;
  try {
    const prepared = prepareVertices(job.easting!, job.northing!, job.layers!);
    // The input columns are copied into `prepared`; drop them (and collect, when allowed) before
    // Delaunator allocates its own arrays, so a million-sounding job does not hold both.
    job.easting = job.northing = job.layers = undefined;
    if (prepared.xy.length >= 2 * largeJobSoundings) collect?.();
    const tins = triangulateVertices(prepared, { maxEdge: job.maxEdge });
    const buffers = new Set<ArrayBuffer>();
    let reply: SurfaceReply;
    if (message.raster) {
      const { grid, precision } = message.raster;
      const rasters = tins.map((tin) => {
        const values = createRasterValues(grid, precision);
        rasterizeTinInto(tin, grid, values, null);
        buffers.add(values.buffer as ArrayBuffer);
        return values;
      });
      const { duplicatesMerged, longTrianglesDropped, invalidSkipped } = tins[0];
      reply = { id: job.id, rasters, summary: { duplicatesMerged, longTrianglesDropped, invalidSkipped } };
    } else {
      for (const tin of tins) for (const array of [tin.xy, tin.z, tin.triangles, tin.hull]) buffers.add(array.buffer as ArrayBuffer);
      reply = { id: job.id, tins };
    }
    parentPort?.postMessage(reply, [...buffers]);
    // The TIN and Delaunator's arrays are garbage now; free them while the main thread carries on.
    if (prepared.xy.length >= 2 * largeJobSoundings) collect?.();
  } catch (error) {
    parentPort?.postMessage({ id: job.id, error: (error as Error).message } satisfies SurfaceReply);
  }
});
