import type { UserView } from "~/models/user.server";
import type { ProjectView } from "~/models/project.server";
import { ImportJob, type Role } from "~/lib/db.server";
import type { ImportPreview } from "./analyse.server";
import { commitChoicesSchema, importOptionsSchema, type CommitChoices, type ImportOptions } from "./import-options";

/** An import job as its page and its progress poll see it; only its uploader or a manager may open it. */
export async function findImportJob(project: ProjectView, user: UserView, role: Role | null, jobId: number): Promise<ImportJob | null> {
  const job = await ImportJob.findOne({ where: { id: jobId, projectId: project.id } });
  if (!job) return null;
  if (job.userId !== user.id && role !== "manager" && !user.isSiteAdmin) return null;
  return job;
}

function parseJson<T>(value: unknown): T | null {
  if (value === null || value === undefined) return null;
  return (typeof value === "string" ? JSON.parse(value) : value) as T;
}

export function jobOptions(job: ImportJob): ImportOptions {
  return importOptionsSchema.parse(parseJson(job.options));
}

export function jobPreview(job: ImportJob): (ImportPreview & { choices?: CommitChoices }) | null {
  return parseJson(job.preview);
}

export function jobChoices(job: ImportJob): CommitChoices {
  return commitChoicesSchema.parse(jobPreview(job)?.choices ?? {});
}

export function presentJobProgress(job: ImportJob) {
  return { id: job.id, state: job.state, stage: job.stage, fraction: job.fraction, error: job.error ?? null, surveyId: job.surveyId ?? null };
}
