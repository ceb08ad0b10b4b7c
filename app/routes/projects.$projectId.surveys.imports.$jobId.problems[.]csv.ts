import { z } from "zod";
import { requireRole } from "~/lib/auth/access.server";
import { findImportJob, jobPreview } from "~/lib/import/import-job-view.server";
import { csvLine } from "../../shared/csv-safe";
import type { Route } from "./+types/projects.$projectId.surveys.imports.$jobId.problems[.]csv";

// Every problem of the last preview as CSV (row, column, value, rule, message), to fix the file in
// a spreadsheet. The values come from the uploaded file, so they go through the formula-safe writer.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "surveys.import");
  const { project, user } = access;
  const jobId = z.coerce.number().int().positive().safeParse(params.jobId);
  const job = jobId.success ? await findImportJob(access, jobId.data) : null;
  const preview = job ? jobPreview(job) : null;
  if (!job || !preview) throw new Response("There is no such import.", { status: 404 });
  const lines = [csvLine(["row", "column", "value", "rule", "message"])];
  for (const message of preview.fileProblems) lines.push(csvLine([null, "file", null, "file", message]));
  for (const problem of preview.problems) lines.push(csvLine([problem.row, problem.column, problem.value, problem.rule, problem.message]));
  const name = job.fileName.replace(/\.[^.]+$/, "").replace(/[^A-Za-z0-9_-]+/g, "-");
  return new Response(lines.join(""), {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${name}-problems.csv"`, "Cache-Control": "no-store" },
  });
}
