import { Op, type Transaction } from "sequelize";
import { compareFigures, describeFiguresChange, type FiguresSide } from "../../../shared/volumes/figures-change";
import { unitLabel, type LengthUnit } from "../../../shared/units";
import { CellResult, ProjectSettingsVersion, Project, RecomputeJob, SurveySnapshot, getSequelize } from "../db.server";
import { withProjectLock } from "../import/project-lock.server";
import { currentSettingsVersion, recomputeProjectStatistics } from "./recompute.server";
import type { ProjectFigures } from "./project-figures";

/**
 * Recomputes after a settings change, in the background: the settings are saved at once (the
 * request answers 202 with the job's address), and the job rewrites every survey's figures and
 * snapshots through the one recompute (`recomputeProjectStatistics`, in the engine pool) under the
 * project's lock, as an import does. Before it rewrites, it reads the figures as stored; after, it
 * compares them with the new ones (`compareFigures`), and keeps that summary on the job.
 *
 * The job follows the import job's pattern: a row with state, stage and 0–1 fraction written as
 * the work goes (at most four times a second), a heartbeat every RECOMPUTE_HEARTBEAT_MS while it
 * waits or runs, and a job silent for RECOMPUTE_CUT_OFF_MS is marked failed by whoever looks at it
 * next (the server stopped: the recompute is one transaction, so the stored figures are still the
 * earlier ones) and can be started again.
 */
export const RECOMPUTE_HEARTBEAT_MS = 10_000;
export const RECOMPUTE_CUT_OFF_MS = 60_000;
export const RECOMPUTE_CUT_OFF_MESSAGE = "The server stopped before this recompute finished. Nothing of it was stored (a recompute is one transaction): the figures are still those computed before the change. Recompute again.";

/** A job waiting for the project's lock, for the settings version that asked for it; started once the caller's transaction commits. */
export async function queueRecompute(projectId: number, userId: number | null, settingsVersionId: number, transaction: Transaction): Promise<RecomputeJob> {
  const job = await RecomputeJob.create({ projectId, userId, settingsVersionId, state: "queued", stage: "waiting to start", fraction: 0 }, { transaction });
  transaction.afterCommit(() => void runRecomputeJob(job.id));
  return job;
}

function startHeartbeat(jobId: number, intervalMs = RECOMPUTE_HEARTBEAT_MS): () => void {
  const timer = setInterval(() => {
    // Sequelize will not write updatedAt alone; writing fraction as it is lets it stamp updatedAt.
    void RecomputeJob.update({ fraction: getSequelize().literal("fraction") as unknown as number }, { where: { id: jobId, state: { [Op.in]: ["queued", "running"] } } }).catch(() => undefined);
  }, intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}

/** The figures as stored now: the latest snapshot's totals and zone rows, each cell's status. */
async function storedSide(projectId: number, transaction: Transaction): Promise<{ side: FiguresSide; settingsVersionId: number | null }> {
  const [latest, cells] = await Promise.all([
    SurveySnapshot.findOne({ where: { projectId }, order: [["surveyedOn", "DESC"]], attributes: ["totals", "zones", "settingsVersionId"], transaction }),
    CellResult.findAll({ where: { projectId, areaInLimit: { [Op.gt]: 0 } }, attributes: ["label", "status"], transaction }),
  ]);
  return {
    side: { totals: latest?.totals ?? null, zones: latest?.zones ?? [], cells: cells.map((cell) => ({ label: cell.label, status: cell.status })) },
    settingsVersionId: latest?.settingsVersionId ?? null,
  };
}

function computedSide(figures: ProjectFigures | null): FiguresSide {
  if (!figures) return { totals: null, zones: [], cells: [] };
  const latest = figures.snapshots[figures.snapshots.length - 1];
  return { totals: latest.totals, zones: latest.zones, cells: figures.cells.filter((cell) => cell.areaInLimit > 0).map((cell) => ({ label: cell.label, status: cell.status })) };
}

/** True when two versions lay the same cells (cell size, rotation, origin): labels then name the same ground. */
function sameGrid(before: ProjectSettingsVersion | null, after: ProjectSettingsVersion | null): boolean {
  if (!before || !after) return false;
  const [a, b] = [before.settings.grid, after.settings.grid];
  return a.cellSize === b.cellSize && a.rotationDegrees === b.rotationDegrees && a.originX === b.originX && a.originY === b.originY;
}

/**
 * Runs a queued job to its end (done or failed); resolves when it has. A job that is not queued
 * (already taken, or marked failed) is left alone. Routes do not wait for it; tests may.
 */
export async function runRecomputeJob(jobId: number): Promise<void> {
  const job = await RecomputeJob.findByPk(jobId);
  if (!job || job.state !== "queued") return;
  const stopHeartbeat = startHeartbeat(job.id);
  let lastWrite = 0;
  const progress = (stage: string, fraction: number) => {
    const now = Date.now();
    if (now - lastWrite < 250) return; // at most four progress writes a second
    lastWrite = now;
    void RecomputeJob.update({ stage: stage.slice(0, 60), fraction: Math.min(1, Math.max(0, fraction)) }, { where: { id: job.id, state: "running" } }).catch(() => undefined);
  };
  try {
    const summary = await withProjectLock(job.projectId, async () => {
      // Taken under the lock, in one conditional UPDATE: a job marked failed meanwhile stays so.
      const [claimed] = await RecomputeJob.update({ state: "running", stage: "reading the figures", fraction: 0 }, { where: { id: job.id, state: "queued" } });
      if (claimed !== 1) return null;
      return getSequelize().transaction(async (transaction) => {
        await Project.findByPk(job.projectId, { transaction, lock: transaction.LOCK.UPDATE });
        const before = await storedSide(job.projectId, transaction);
        const outcome = await recomputeProjectStatistics(job.projectId, transaction, { onProgress: progress });
        const [fromVersion, toVersion] = await Promise.all([
          before.settingsVersionId === null ? null : ProjectSettingsVersion.findByPk(before.settingsVersionId, { transaction }),
          currentSettingsVersion(job.projectId, transaction),
        ]);
        const change = compareFigures(before.side, computedSide(outcome.figures), sameGrid(fromVersion, toVersion));
        return { ...change, fromVersion: fromVersion?.version ?? null, toVersion: toVersion?.version ?? null };
      });
    });
    lastWrite = Number.POSITIVE_INFINITY; // no late progress write after the final state
    if (summary) await RecomputeJob.update({ state: "done", stage: "done", fraction: 1, summary, finishedAt: new Date() }, { where: { id: job.id, state: "running" } });
  } catch (error) {
    lastWrite = Number.POSITIVE_INFINITY;
    await RecomputeJob.update(
      { state: "failed", stage: "failed", error: `Nothing was changed: the figures are still those computed before. ${(error as Error).message}`, finishedAt: new Date() },
      { where: { id: job.id } },
    ).catch(() => undefined);
  } finally {
    stopHeartbeat();
  }
}

/** Marks the project's waiting or running jobs that stopped touching their row failed; returns how many. */
async function markCutOffJobs(where: { projectId: number; id?: number }): Promise<number> {
  const [changed] = await RecomputeJob.update(
    { state: "failed", stage: "failed", error: RECOMPUTE_CUT_OFF_MESSAGE, finishedAt: new Date() },
    { where: { ...where, state: { [Op.in]: ["queued", "running"] }, updatedAt: { [Op.lt]: new Date(Date.now() - RECOMPUTE_CUT_OFF_MS) } } },
  );
  return changed;
}

/** One of the project's jobs (null when it has no such job), cut-off ones marked failed first. */
export async function findRecomputeJob(projectId: number, jobId: number): Promise<RecomputeJob | null> {
  await markCutOffJobs({ projectId, id: jobId });
  return RecomputeJob.findOne({ where: { id: jobId, projectId } });
}

/** The project's latest job, if any (cut-off ones marked failed first). */
export async function latestRecomputeJob(projectId: number): Promise<RecomputeJob | null> {
  await markCutOffJobs({ projectId });
  return RecomputeJob.findOne({ where: { projectId }, order: [["id", "DESC"]] });
}

export interface RecomputeJobView {
  id: number;
  /** Where a client polls it. */
  url: string;
  state: RecomputeJob["state"];
  stage: string;
  fraction: number;
  error: string | null;
  /** The settings version that asked for it. */
  settingsVersion: number | null;
  /** Done: what changed, in figures (volumes in the project's volume unit), and in one line. */
  summary: RecomputeJob["summary"];
  summaryText: string | null;
  createdAt: string;
  finishedAt: string | null;
}

export async function presentRecomputeJob(job: RecomputeJob, lengthUnit: LengthUnit): Promise<RecomputeJobView> {
  const version = await ProjectSettingsVersion.findByPk(job.settingsVersionId, { attributes: ["id", "version"] });
  const summary = job.summary ?? null;
  return {
    id: job.id,
    url: `/api/projects/${job.projectId}/recomputes/${job.id}`,
    state: job.state,
    stage: job.stage,
    fraction: job.fraction,
    error: job.error ?? null,
    settingsVersion: version?.version ?? null,
    summary,
    summaryText: summary ? describeFiguresChange(summary, unitLabel(lengthUnit, "volume")) : null,
    createdAt: job.createdAt.toISOString(),
    finishedAt: job.finishedAt ? job.finishedAt.toISOString() : null,
  };
}
