import { lstat, readdir, rm } from "node:fs/promises";
import { join, resolve } from "node:path";
import { Op } from "sequelize";
import { ImportJob, getSequelize } from "../db.server";
import { uploadSettings } from "./settings.server";
import { stagingDirectory } from "./stage-upload.server";

/**
 * Abandoned uploads: a file staged for review but never imported (the technician closed the tab)
 * would otherwise sit in UPLOAD_DIR, and its import job wait, forever.
 *
 * The sweep expires every job that is not done and not importing and has been untouched for longer
 * than the retention (UPLOAD_RETENTION_HOURS, 24 by default): its staged file is deleted and the job
 * is kept as a small marker (state "failed", stage "expired", preview dropped) so its page can say
 * plainly what happened instead of "no such import". Markers go after a further 30 days. Staging
 * files that no unfinished job refers to and that are older than the retention are deleted too.
 *
 * A job that is committing is never expired: each expiry is one conditional UPDATE whose WHERE
 * repeats the state and age test, and the commit's start is conditional the other way round, so
 * the two cannot both win. A live commit touches its job at least every COMMIT_HEARTBEAT_MS (its
 * progress, or a heartbeat while a step runs long), so a job still "committing" with nothing
 * written for CUT_OFF_COMMIT_MS was cut off (the server stopped or lost its database mid-import):
 * the next request that looks at it (or the sweep) marks it failed with that said plainly, keeping
 * its file, so the technician can commit it again at once (a commit is one transaction, so nothing
 * of the cut-off one was stored); the expiry above then applies to it like any other failed job.
 */
export const EXPIRED_STAGE = "expired";
export const SWEPT_STATES = ["staged", "validating", "ready", "failed"] as const;
/** How often a live commit touches its job, at the least. */
export const COMMIT_HEARTBEAT_MS = 10_000;
/** A "committing" job untouched this long (six missed heartbeats) was cut off. */
export const CUT_OFF_COMMIT_MS = 60_000;
export const CUT_OFF_MESSAGE = "Nothing was stored: the server stopped while this import was being committed (a commit is one transaction, so none of it was kept). Commit it again, or upload the file again.";
/** Expired markers are removed this long after they expired. */
export const EXPIRED_MARKER_KEEP_MS = 30 * 24 * 3600 * 1000;
/** The names stageUpload gives staged files (`<ms>-<16 hex>.csv`); nothing else in UPLOAD_DIR is ever deleted. */
const STAGED_NAME = /^\d+-[0-9a-f]{16}\.csv$/;

export function retentionHours(): number {
  return uploadSettings().UPLOAD_RETENTION_HOURS;
}

export function expiredMessage(hours: number): string {
  const span = hours % 24 === 0 ? `${hours / 24} day${hours === 24 ? "" : "s"}` : `${hours} hour${hours === 1 ? "" : "s"}`;
  return `This upload waited more than ${span} without being imported, so Firmsand removed the staged file. Nothing was stored. Upload the file again to import it.`;
}

export function isExpiredJob(job: Pick<ImportJob, "state" | "stage">): boolean {
  return job.state === "failed" && job.stage === EXPIRED_STAGE;
}

export interface SweepOptions {
  /** Defaults to UPLOAD_RETENTION_HOURS. */
  retentionMs?: number;
  now?: Date;
  /** The directory of staged files; defaults to UPLOAD_DIR/staging. */
  stagingDir?: string;
}

export interface SweepResult {
  /** Jobs left "committing" by a server that stopped, now marked failed. */
  cutOffCommits: number;
  expiredJobs: number;
  removedMarkers: number;
  orphanFiles: number;
}

export async function sweepAbandonedUploads(options: SweepOptions = {}): Promise<SweepResult> {
  const retentionMs = options.retentionMs ?? retentionHours() * 3600 * 1000;
  if (!(retentionMs > 0)) throw new Error("The upload retention must be a positive duration.");
  const now = options.now ?? new Date();
  const cutoff = new Date(now.getTime() - retentionMs);
  const message = expiredMessage(Math.max(1, Math.round(retentionMs / 3600_000)));
  const stale = { state: [...SWEPT_STATES], stage: { [Op.ne]: EXPIRED_STAGE }, updatedAt: { [Op.lt]: cutoff } };

  const cutOffCommits = await markCutOffCommits({}, now);

  let expiredJobs = 0;
  const candidates = await ImportJob.findAll({ where: stale, attributes: ["id", "filePath"] });
  for (const job of candidates) {
    const [changed] = await ImportJob.update(
      { state: "failed", stage: EXPIRED_STAGE, fraction: 0, error: message, preview: null },
      { where: { id: job.id, ...stale } },
    );
    if (changed !== 1) continue; // touched or started meanwhile
    await rm(job.filePath, { force: true });
    expiredJobs++;
  }

  const removedMarkers = await ImportJob.destroy({
    where: { state: "failed", stage: EXPIRED_STAGE, updatedAt: { [Op.lt]: new Date(now.getTime() - EXPIRED_MARKER_KEEP_MS) } },
  });

  const orphanFiles = await removeOrphanFiles(options.stagingDir ?? stagingDirectory(), cutoff);
  return { cutOffCommits, expiredJobs, removedMarkers, orphanFiles };
}

/**
 * Marks failed every "committing" job among `where` whose heartbeat is older than the cut-off, in
 * one conditional UPDATE (a live commit that touches its job meanwhile is left alone).
 */
export async function markCutOffCommits(where: { id?: number }, now = new Date()): Promise<number> {
  const [changed] = await ImportJob.update(
    { state: "failed", stage: "failed", fraction: 0, error: CUT_OFF_MESSAGE },
    { where: { ...where, state: "committing", updatedAt: { [Op.lt]: new Date(now.getTime() - CUT_OFF_COMMIT_MS) } } },
  );
  return changed;
}

/**
 * Touches a committing job every `intervalMs` until stopped, so a commit whose step runs long
 * (a large recompute) is not taken for a cut-off one. Only a job still "committing" is touched:
 * a heartbeat never overwrites the commit's final state.
 */
export function startCommitHeartbeat(jobId: number, intervalMs = COMMIT_HEARTBEAT_MS): () => void {
  const timer = setInterval(() => {
    // Sequelize will not write updatedAt alone; writing fraction as it is lets it stamp updatedAt.
    void ImportJob.update({ fraction: getSequelize().literal("fraction") as unknown as number }, { where: { id: jobId, state: "committing" } }).catch(() => undefined);
  }, intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}

async function removeOrphanFiles(directory: string, cutoff: Date): Promise<number> {
  let names: string[];
  try {
    names = await readdir(directory);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return 0;
    throw error;
  }
  const candidates: string[] = [];
  for (const name of names) {
    if (!STAGED_NAME.test(name)) continue;
    const path = resolve(join(directory, name));
    const info = await lstat(path).catch(() => null);
    if (info?.isFile() && info.mtime < cutoff) candidates.push(path);
  }
  if (candidates.length === 0) return 0;
  // Read the references after the listing: a job created meanwhile for an old file still counts.
  const referenced = await ImportJob.findAll({
    where: { state: { [Op.ne]: "done" }, stage: { [Op.ne]: EXPIRED_STAGE } },
    attributes: ["filePath"],
  });
  const kept = new Set(referenced.map((job) => resolve(job.filePath)));
  let removed = 0;
  for (const path of candidates) {
    if (kept.has(path)) continue;
    await rm(path, { force: true });
    removed++;
  }
  return removed;
}

let timer: NodeJS.Timeout | null = null;
let running = false;

async function sweepAndLog() {
  if (running) return;
  running = true;
  try {
    const result = await sweepAbandonedUploads();
    if (result.cutOffCommits + result.expiredJobs + result.orphanFiles + result.removedMarkers > 0) {
      process.stdout.write(`Firmsand: abandoned uploads swept (${result.cutOffCommits} cut-off commits marked failed, ${result.expiredJobs} expired, ${result.orphanFiles} stray files, ${result.removedMarkers} old markers)\n`);
    }
  } catch (error) {
    process.stderr.write(`Firmsand: the sweep of abandoned uploads failed: ${(error as Error).message}\n`);
  } finally {
    running = false;
  }
}

/**
 * Sweeps now and then every hour (or every quarter of the retention when that is shorter). The
 * timer is unref'd so it never keeps a process alive. Started by the production server.
 */
export function startAbandonedUploadSweeper(): void {
  if (timer) return;
  const every = Math.min(3600_000, (retentionHours() * 3600_000) / 4);
  void sweepAndLog();
  timer = setInterval(() => void sweepAndLog(), every);
  timer.unref();
}

// The production server (app/serve.mjs) starts the background tasks the app registers on load,
// once it listens; tests and scripts that import this module start nothing.
const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
(registry.firmsandBackgroundTasks ??= []).push(startAbandonedUploadSweeper);
