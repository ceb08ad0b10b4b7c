import { z } from "zod";
import { requireRole } from "~/lib/auth/access.server";
import { findImportJob, presentJobProgress } from "~/lib/import/import-job-view.server";
import type { Route } from "./+types/projects.$projectId.surveys.imports.$jobId.progress";

// Polled by the import page while a commit runs: state, stage and 0–1 fraction.
export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "surveys.import");
  const { project, user } = access;
  const jobId = z.coerce.number().int().positive().safeParse(params.jobId);
  const job = jobId.success ? await findImportJob(access, jobId.data) : null;
  if (!job) return Response.json({ error: "There is no such import." }, { status: 404 });
  return Response.json(presentJobProgress(job), { headers: { "Cache-Control": "no-store" } });
}
