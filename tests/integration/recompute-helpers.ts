import { ORIGIN } from "./helpers";
import * as recomputeApi from "~/routes/api.projects.$projectId.recomputes.$jobId";
import type { RecomputeJobView } from "~/lib/engine/recompute-jobs.server";

/** GET /api/projects/<id>/recomputes/<jobId> as a client sends it. */
export async function getRecompute(token: string, projectId: number, jobId: number | string): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/projects/${projectId}/recomputes/${jobId}`, { headers: { Authorization: `Bearer ${token}` } });
  return recomputeApi.loader({ request, params: { projectId: String(projectId), jobId: String(jobId) }, context: {} } as never);
}

/** Polls the job's address as a client would, until it is done or failed (within `timeoutMs`); every answer seen is kept. */
export async function finishedRecompute(token: string, projectId: number, jobId: number, timeoutMs = 80_000, seen: RecomputeJobView[] = []): Promise<RecomputeJobView> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const response = await getRecompute(token, projectId, jobId);
    if (response.status !== 200) throw new Error(`GET recompute ${jobId}: ${response.status} ${await response.text()}`);
    const job = (await response.json()) as RecomputeJobView;
    seen.push(job);
    if (job.state === "done" || job.state === "failed") return job;
    if (Date.now() > deadline) throw new Error(`recompute ${jobId} still ${job.state} (${job.stage}) after ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}
