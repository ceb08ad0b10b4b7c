import { parentPort } from "node:worker_threads";
import { triangulateLayers } from "../../shared/surface/triangulate";
import type { TriangulationJob, TriangulationReply } from "./engine-worker.server";

/**
 * Worker-thread side of the engine pool: triangulates one survey (one or more value layers on the
 * same soundings) and sends the TINs back, transferring their buffers instead of copying them.
 */
parentPort?.on("message", (job: TriangulationJob) => {
  try {
    const tins = triangulateLayers(job.easting, job.northing, job.layers, { maxEdge: job.maxEdge });
    const buffers = new Set<ArrayBuffer>();
    for (const tin of tins) for (const array of [tin.x, tin.y, tin.z, tin.triangles, tin.hull]) buffers.add(array.buffer as ArrayBuffer);
    const reply: TriangulationReply = { id: job.id, tins };
    parentPort?.postMessage(reply, [...buffers]);
  } catch (error) {
    const reply: TriangulationReply = { id: job.id, error: (error as Error).message };
    parentPort?.postMessage(reply);
  }
});
