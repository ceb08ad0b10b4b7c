import type { ImportPreview } from "../../../shared/soundings/prepare";
import type { ProjectAccess } from "~/lib/auth/access.server";
import { ImportJob } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { CUT_OFF_COMMIT_MS, markCutOffCommits } from "./abandoned-uploads.server";
import { commitChoicesSchema, importOptionsSchema, type CommitChoices, type ImportOptions } from "./import-options";

/**
 * An import job as its page and its progress poll see it: its uploader's, or anyone's to those the
 * table allows. A commit whose heartbeat stopped (the server or its database went away mid-import)
 * is marked failed here, at once, so the page says so and the commit can be tried again.
 */
export async function findImportJob(access: ProjectAccess, jobId: number): Promise<ImportJob | null> {
  const job = await ImportJob.findOne({ where: { id: jobId, projectId: access.project.id } });
  if (!job) return null;
  if (job.userId !== access.user.id && !can(access, "surveys.import.others")) return null;
  // Only a job already silent past the cut-off is worth the conditional UPDATE (the page polls often).
  const silent = job.state === "committing" && Date.now() - job.updatedAt.getTime() > CUT_OFF_COMMIT_MS;
  if (silent && (await markCutOffCommits({ id: job.id })) === 1) await job.reload();
  return job;
}

export function jobOptions(job: ImportJob): ImportOptions {
  return importOptionsSchema.parse(job.options);
}

export function jobPreview(job: ImportJob): (ImportPreview & { choices?: CommitChoices }) | null {
  return job.preview as (ImportPreview & { choices?: CommitChoices }) | null;
}

export function jobChoices(job: ImportJob): CommitChoices {
  return commitChoicesSchema.parse(jobPreview(job)?.choices ?? {});
}

export function presentJobProgress(job: ImportJob) {
  return { id: job.id, state: job.state, stage: job.stage, fraction: job.fraction, error: job.error ?? null, surveyId: job.surveyId ?? null };
}
