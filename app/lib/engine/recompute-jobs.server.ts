import { Op, type Transaction } from "sequelize";
import { compareFigures, describeFiguresChange, type FiguresSide } from "../../../shared/volumes/figures-change";
import { unitLabel, type LengthUnit } from "../../../shared/units";
import { CellResult, ProjectSettingsVersion, Project, RecomputeJob, SurveySnapshot, getSequelize } from "../db.server";
import { withProjectLock } from "../import/project-lock.server";
import { getTestHooksEnv } from "../settings/env.server";
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
 * the work goes (at most four times a second), and a heartbeat every RECOMPUTE_HEARTBEAT_MS while it
 * waits or runs. A job is never lost to a server stop: the recompute is one transaction, so a stop
 * leaves the earlier figures stored, and the job is taken up again (`takeUpRecomputeJobs`) by the
 * server at its start (every waiting job) and by whoever finds it silent for RECOMPUTE_CUT_OFF_MS
 * (the server's round every RECOMPUTE_ROUND_MS, and the readers of a job). A job taken up
 * RECOMPUTE_MAX_ATTEMPTS times that still went silent is given up, failed, with the reason.
 */
export const RECOMPUTE_HEARTBEAT_MS = 10_000;
export const RECOMPUTE_CUT_OFF_MS = 60_000;
export const RECOMPUTE_ROUND_MS = 20_000;
export const RECOMPUTE_MAX_ATTEMPTS = 3;
export const RECOMPUTE_GIVEN_UP_MESSAGE = `The server stopped during this recompute ${RECOMPUTE_MAX_ATTEMPTS} times, so it is not started again by itself. Nothing of it was stored (a recompute is one transaction): the figures are still those computed before the change. Recompute again; if it stops once more, tell whoever runs the server.`;
export const RECOMPUTE_RESUMED_STAGE = "waiting to start again";
/** The stage of a job held by the test setting RECOMPUTE_HOLD_MS (app/lib/settings/env.server.ts). */
export const RECOMPUTE_HELD_STAGE = "held before computing (test setting)";

/** A job waiting for the project's lock, for the settings version that asked for it; started once the caller's transaction commits. */
export async function queueRecompute(projectId: number, userId: number | null, settingsVersionId: number, transaction: Transaction): Promise<RecomputeJob> {
  const job = await RecomputeJob.create({ projectId, userId, settingsVersionId, state: "queued", stage: "waiting to start", fraction: 0 }, { transaction });
  transaction.afterCommit(() => void runRecomputeJob(job.id, projectId));
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
 * (already taken, here or by another server, or given up) is left alone. Jobs of one project run
 * one at a time, in the order they were handed in (the project lock, entered before anything is
 * awaited when the project is known). Routes do not wait for it; tests may.
 */
export async function runRecomputeJob(jobId: number, projectId?: number): Promise<void> {
  if (projectId === undefined) {
    const found = await RecomputeJob.findByPk(jobId, { attributes: ["id", "projectId"] });
    if (found) await runRecomputeJob(found.id, found.projectId);
    return;
  }
  // The heartbeat runs from now: a job waiting its turn in the lock's queue is alive, not silent.
  const stopHeartbeat = startHeartbeat(jobId);
  let lastWrite = 0;
  const progress = (stage: string, fraction: number) => {
    const now = Date.now();
    if (now - lastWrite < 250) return; // at most four progress writes a second
    lastWrite = now;
    void RecomputeJob.update({ stage: stage.slice(0, 60), fraction: Math.min(1, Math.max(0, fraction)) }, { where: { id: jobId, state: "running" } }).catch(() => undefined);
  };
  try {
    const summary = await withProjectLock(projectId, async () => {
      // Taken under the lock, in one conditional UPDATE: a job taken by another runner, or given up, stays so.
      const [claimed] = await RecomputeJob.update(
        { state: "running", stage: "reading the figures", fraction: 0, attempts: getSequelize().literal("attempts + 1") as unknown as number },
        { where: { id: jobId, projectId, state: "queued" } },
      );
      if (claimed !== 1) return null;
      // A test setting (never in production): the job shows as running for a while before it computes.
      const holdMs = getTestHooksEnv().recomputeHoldMs;
      if (holdMs > 0) {
        await RecomputeJob.update({ stage: RECOMPUTE_HELD_STAGE }, { where: { id: jobId, state: "running" } });
        await new Promise((resolve) => setTimeout(resolve, holdMs));
      }
      return getSequelize().transaction(async (transaction) => {
        await Project.findByPk(projectId, { transaction, lock: transaction.LOCK.UPDATE });
        const before = await storedSide(projectId, transaction);
        const outcome = await recomputeProjectStatistics(projectId, transaction, { onProgress: progress });
        const [fromVersion, toVersion] = await Promise.all([
          before.settingsVersionId === null ? null : ProjectSettingsVersion.findByPk(before.settingsVersionId, { transaction }),
          currentSettingsVersion(projectId, transaction),
        ]);
        const change = compareFigures(before.side, computedSide(outcome.figures), sameGrid(fromVersion, toVersion));
        return { ...change, fromVersion: fromVersion?.version ?? null, toVersion: toVersion?.version ?? null };
      });
    });
    lastWrite = Number.POSITIVE_INFINITY; // no late progress write after the final state
    if (summary) await RecomputeJob.update({ state: "done", stage: "done", fraction: 1, summary, finishedAt: new Date() }, { where: { id: jobId, state: "running" } });
  } catch (error) {
    lastWrite = Number.POSITIVE_INFINITY;
    await RecomputeJob.update(
      { state: "failed", stage: "failed", error: `Nothing was changed: the figures are still those computed before. ${(error as Error).message}`, finishedAt: new Date() },
      { where: { id: jobId, state: "running" } },
    ).catch(() => undefined);
  } finally {
    stopHeartbeat();
  }
}

export interface TakenUpJobs {
  /** The jobs handed to this process to run, oldest first. */
  jobIds: number[];
  /** How many silent jobs were given up (taken up RECOMPUTE_MAX_ATTEMPTS times already). */
  givenUp: number;
  /** Settles when every job handed over has ended (for tests and scripts; the server does not wait). */
  finished: Promise<void>;
}

/**
 * Takes up the jobs a stopped server left (of one project, or of all): a running job whose heartbeat
 * has been silent for RECOMPUTE_CUT_OFF_MS goes back to the queue (or is given up, failed, after
 * RECOMPUTE_MAX_ATTEMPTS), and queued jobs are run here under the project lock, one at a time per
 * project, oldest first. `waiting: "all"` (the server's start: nothing of this process waits yet)
 * takes every queued job; "silent" only those whose heartbeat stopped (another live server may be
 * running the rest). Two servers taking up the same job is harmless: the claim is conditional.
 */
export async function takeUpRecomputeJobs(options: { projectId?: number; jobId?: number; waiting: "all" | "silent" }): Promise<TakenUpJobs> {
  const scope = { ...(options.projectId === undefined ? {} : { projectId: options.projectId }), ...(options.jobId === undefined ? {} : { id: options.jobId }) };
  const silent = { [Op.lt]: new Date(Date.now() - RECOMPUTE_CUT_OFF_MS) };
  const [givenUp] = await RecomputeJob.update(
    { state: "failed", stage: "failed", error: RECOMPUTE_GIVEN_UP_MESSAGE, finishedAt: new Date() },
    { where: { ...scope, state: "running", updatedAt: silent, attempts: { [Op.gte]: RECOMPUTE_MAX_ATTEMPTS } } },
  );
  // Back to the queue, one conditional UPDATE each (the heartbeat of a live runner would have kept updatedAt fresh).
  const stopped = await RecomputeJob.findAll({ where: { ...scope, state: "running", updatedAt: silent }, attributes: ["id"] });
  for (const job of stopped) {
    await RecomputeJob.update({ state: "queued", stage: RECOMPUTE_RESUMED_STAGE, fraction: 0 }, { where: { id: job.id, state: "running", updatedAt: silent } });
  }
  const queued = await RecomputeJob.findAll({
    where: {
      ...scope, state: "queued",
      ...(options.waiting === "silent" ? { [Op.or]: [{ id: { [Op.in]: stopped.map((job) => job.id) } }, { updatedAt: silent }] } : {}),
    },
    attributes: ["id", "projectId"], order: [["id", "ASC"]],
  });
  // Handed to the lock in id order, synchronously: a project's jobs run in the order they were asked for.
  const runs = queued.map((job) => runRecomputeJob(job.id, job.projectId));
  return { jobIds: queued.map((job) => job.id), givenUp, finished: Promise.all(runs).then(() => undefined) };
}

let round: NodeJS.Timeout | null = null;

/**
 * At the server's start, runs every waiting job; then, every RECOMPUTE_ROUND_MS, takes up the jobs
 * whose heartbeat went silent (a server that stopped just before this one started: its jobs look
 * alive until the cut-off). The timer is unref'd. Started by the production server.
 */
export function startRecomputeJobRounds(): void {
  if (round) return;
  let busy = false;
  const takeUp = (waiting: "all" | "silent") => {
    if (busy) return;
    busy = true;
    takeUpRecomputeJobs({ waiting })
      .then(({ jobIds, givenUp }) => {
        if (jobIds.length + givenUp > 0) process.stdout.write(`Firmsand: recomputes taken up (${jobIds.length} run again, ${givenUp} given up after ${RECOMPUTE_MAX_ATTEMPTS} attempts)\n`);
      })
      .catch((error: unknown) => process.stderr.write(`Firmsand: the waiting recomputes could not be read: ${(error as Error).message}\n`))
      .finally(() => {
        busy = false;
      });
  };
  takeUp("all");
  round = setInterval(() => takeUp("silent"), RECOMPUTE_ROUND_MS);
  round.unref();
}

// The production server (app/serve.mjs) starts the background tasks the app registers on load,
// once it listens; tests and scripts that import this module start nothing.
const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
(registry.firmsandBackgroundTasks ??= []).push(startRecomputeJobRounds);

/** One of the project's jobs (null when it has no such job), a silent one taken up first. */
export async function findRecomputeJob(projectId: number, jobId: number): Promise<RecomputeJob | null> {
  await takeUpRecomputeJobs({ projectId, jobId, waiting: "silent" });
  return RecomputeJob.findOne({ where: { id: jobId, projectId } });
}

/** The project's latest job, if any (silent ones taken up first). */
export async function latestRecomputeJob(projectId: number): Promise<RecomputeJob | null> {
  await takeUpRecomputeJobs({ projectId, waiting: "silent" });
  return RecomputeJob.findOne({ where: { projectId }, order: [["id", "DESC"]] });
}

export interface RecomputeJobView {
  id: number;
  /** Where a client polls it. */
  url: string;
  state: RecomputeJob["state"];
  stage: string;
  fraction: number;
  /** How many times it was taken up to run: more than 1 once a server stop cut a run short. */
  attempts: number;
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
    attempts: job.attempts,
    error: job.error ?? null,
    settingsVersion: version?.version ?? null,
    summary,
    summaryText: summary ? describeFiguresChange(summary, unitLabel(lengthUnit, "volume")) : null,
    createdAt: job.createdAt.toISOString(),
    finishedAt: job.finishedAt ? job.finishedAt.toISOString() : null,
  };
}
