import { Op } from "sequelize";
import type { ImportPreview } from "../../../shared/soundings/prepare";
import { ColumnMapping, ImportJob } from "../db.server";
import { EXPIRED_STAGE, startCommitHeartbeat } from "./abandoned-uploads.server";
import { analyseStagedFile } from "./analyse.server";
import { commitSurvey, type CommitSurveyInput, type CommittedSurvey } from "./commit.server";
import type { CommitChoices, ImportOptions } from "./import-options";
import { loadProjectGeometry } from "../engine/project-geometry.server";
import { discardStagedFile, type StagedFile } from "./stage-upload.server";

/**
 * The one import path (pages, API and the demo seed all use it): analyse the staged file with
 * the technician's choices, refuse while anything blocks, else commit in one transaction and
 * remember the column mapping for the project's next upload.
 */
export type ImportOutcome = { ok: true; committed: CommittedSurvey; preview: ImportPreview } | { ok: false; preview: ImportPreview };

export interface ImportInput {
  projectId: number;
  userId: number | null;
  ip?: string | null;
  staged: StagedFile;
  options: ImportOptions;
  choices: CommitChoices;
  onProgress?: (stage: string, fraction: number) => void;
  afterSoundings?: CommitSurveyInput["afterSoundings"];
}

/** Overall progress: reading the file is the first 30 %, storing soundings the next 30 %, computing the rest. */
const STAGE_SPANS: Array<[RegExp, number, number]> = [
  [/^reading/, 0, 0.3],
  [/^storing/, 0.3, 0.6],
  [/^computing/, 0.6, 1],
];

export function overallFraction(stage: string, fraction: number): number {
  const span = STAGE_SPANS.find(([pattern]) => pattern.test(stage));
  if (!span) return fraction;
  return span[1] + (span[2] - span[1]) * Math.min(1, Math.max(0, fraction));
}

export async function rememberColumnMapping(projectId: number, userId: number | null, choice: Record<string, string | null>) {
  // Only headers are remembered. "Not in the file" is this file's answer: the form sends it for
  // every field the file lacks (a progress file has no probe), and a remembered one would make the
  // next baseline's probe column unread.
  const mapping = Object.fromEntries(Object.entries(choice).filter((entry): entry is [string, string] => typeof entry[1] === "string"));
  const existing = await ColumnMapping.findOne({ where: { projectId } });
  if (existing) await existing.update({ mapping, updatedById: userId });
  else await ColumnMapping.create({ projectId, mapping, updatedById: userId });
}

export async function importSurveyFile(input: ImportInput): Promise<ImportOutcome> {
  const geometry = await loadProjectGeometry(input.projectId);
  const analysis = await analyseStagedFile({
    path: input.staged.path,
    sha256: input.staged.sha256,
    fileName: input.staged.fileName,
    options: input.options,
    choices: input.choices,
    geometry,
    onProgress: (fraction) => input.onProgress?.("reading the file", fraction),
  });
  if (analysis.preview.blockers.length > 0 || !analysis.prepared) return { ok: false, preview: analysis.preview };
  const committed = await commitSurvey({
    projectId: input.projectId,
    userId: input.userId,
    ip: input.ip,
    fileName: input.staged.fileName,
    sha256: input.staged.sha256,
    options: input.options,
    prepared: analysis.prepared,
    rowCount: analysis.preview.rowCount,
    qa: analysis.preview.qa,
    warnings: analysis.preview.warnings,
    onProgress: input.onProgress,
    afterSoundings: input.afterSoundings,
  });
  await rememberColumnMapping(input.projectId, input.userId, analysis.preview.mapping as Record<string, string | null>);
  return { ok: true, committed, preview: analysis.preview };
}

// ——— Import jobs: the pages' path, where the upload, the preview and the commit are separate requests.

export async function createImportJob(projectId: number, userId: number, staged: StagedFile, options: ImportOptions): Promise<ImportJob> {
  return ImportJob.create({
    projectId,
    userId,
    state: "staged",
    stage: "uploaded",
    fraction: 0,
    surveyId: null,
    fileName: staged.fileName,
    filePath: staged.path,
    fileSize: staged.size,
    contentSha256: staged.sha256,
    options: options as unknown as Record<string, unknown>,
  });
}

function stagedOf(job: ImportJob): StagedFile {
  return { path: job.filePath, fileName: job.fileName, size: Number(job.fileSize), sha256: job.contentSha256 };
}

/** A job that may still be previewed or committed: not importing, not done, not expired. */
const OPEN_JOB = { state: { [Op.notIn]: ["committing", "done"] }, stage: { [Op.ne]: EXPIRED_STAGE } };

export class ImportJobClosed extends Error {
  constructor() {
    super("This upload is no longer open: it is importing, imported, or expired.");
  }
}

/**
 * Moves an open job into a new state in one conditional UPDATE, so it cannot race the sweep of
 * abandoned uploads (which expires only jobs in their old state). False when the job was not open.
 */
async function claimOpenJob(job: ImportJob, values: Partial<Pick<ImportJob, "state" | "stage" | "fraction" | "error" | "options">>): Promise<boolean> {
  const [changed] = await ImportJob.update(values, { where: { id: job.id, ...OPEN_JOB } });
  if (changed === 1) job.set(values);
  return changed === 1;
}

/** States a job may be discarded from: no commit and no preview is reading its staged file. */
const DISCARDABLE_STATES = ["staged", "ready", "failed", "done"] as const;

/** "in use": a commit or a preview holds the job, so its file stays; the job is unchanged. */
export type DiscardOutcome = "discarded" | "in use";

/**
 * Throws an upload away: the job row goes in one conditional DELETE that repeats the state test,
 * so a discard cannot race a commit (whose start is conditional the other way round, see
 * claimOpenJob) or a preview; only once the row is gone is the staged file removed. A file left
 * behind by a failed removal is no job's any more, and the sweep of abandoned uploads takes it.
 */
export async function discardImportJob(job: ImportJob): Promise<DiscardOutcome> {
  const removed = await ImportJob.destroy({ where: { id: job.id, state: [...DISCARDABLE_STATES] } });
  if (removed === 0) return (await ImportJob.count({ where: { id: job.id } })) > 0 ? "in use" : "discarded";
  await discardStagedFile(job.filePath);
  return "discarded";
}

/** Re-reads the staged file with the current options and choices and keeps the preview on the job. */
export async function previewImportJob(job: ImportJob, options: ImportOptions, choices: CommitChoices): Promise<ImportPreview> {
  if (!(await claimOpenJob(job, { state: "validating", stage: "reading the file", fraction: 0, options: options as unknown as Record<string, unknown> }))) throw new ImportJobClosed();
  try {
    const geometry = await loadProjectGeometry(job.projectId);
    const analysis = await analyseStagedFile({ path: job.filePath, sha256: job.contentSha256, fileName: job.fileName, options, choices, geometry });
    await job.update({ state: "ready", stage: "preview", fraction: 0, error: null, preview: { ...analysis.preview, choices } as unknown as Record<string, unknown> });
    return analysis.preview;
  } catch (error) {
    await job.update({ state: "failed", stage: "preview", error: (error as Error).message });
    throw error;
  }
}

/**
 * Starts the commit and returns at once: the import finishes on the server whether or not the
 * page stays open; the page polls the job for stage and fraction and picks the result up.
 */
export function startImportJobCommit(job: ImportJob, options: ImportOptions, choices: CommitChoices, ip: string | null, onClaimed?: (claimed: boolean) => void): Promise<void> {
  let lastWrite = 0;
  const progress = (stage: string, fraction: number) => {
    const now = Date.now();
    if (now - lastWrite < 250) return; // at most four progress writes a second
    lastWrite = now;
    void ImportJob.update({ stage: stage.slice(0, 40), fraction: overallFraction(stage, fraction) }, { where: { id: job.id } }).catch(() => undefined);
  };
  const run = async () => {
    const claimed = await claimOpenJob(job, { state: "committing", stage: "reading the file", fraction: 0, error: null });
    onClaimed?.(claimed);
    if (!claimed) return;
    const stopHeartbeat = startCommitHeartbeat(job.id);
    try {
      const outcome = await importSurveyFile({ projectId: job.projectId, userId: job.userId, ip, staged: stagedOf(job), options, choices, onProgress: progress });
      if (!outcome.ok) {
        await ImportJob.update({ state: "ready", stage: "preview", fraction: 0, preview: { ...outcome.preview, choices } as unknown as Record<string, unknown>, error: outcome.preview.blockers.join(" ") }, { where: { id: job.id } });
        return;
      }
      lastWrite = Number.POSITIVE_INFINITY; // no late progress write after the final state
      await ImportJob.update({ state: "done", stage: "done", fraction: 1, surveyId: outcome.committed.surveyId }, { where: { id: job.id } });
      await discardStagedFile(job.filePath);
    } catch (error) {
      lastWrite = Number.POSITIVE_INFINITY;
      await ImportJob.update({ state: "failed", stage: "failed", error: `Nothing was stored: ${(error as Error).message}` }, { where: { id: job.id } }).catch(() => undefined);
    } finally {
      stopHeartbeat();
    }
  };
  return run();
}

/**
 * Starts the commit (startImportJobCommit) and resolves once the job is claimed as committing, or
 * was not open: a page read after it shows the import's progress. Before, the page could be read
 * between the redirect and the claim and show the check again with no progress, for good.
 */
export function beginImportJobCommit(job: ImportJob, options: ImportOptions, choices: CommitChoices, ip: string | null): Promise<boolean> {
  return new Promise((resolve, reject) => {
    let claimed = false;
    const onClaimed = (value: boolean) => {
      claimed = true;
      resolve(value);
    };
    // A failure before the claim (the database gone) is the request's; after it, the job records it.
    startImportJobCommit(job, options, choices, ip, onClaimed).then(() => resolve(false), (error: unknown) => {
      if (!claimed) reject(error);
    });
  });
}
