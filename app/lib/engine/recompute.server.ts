import type { Transaction } from "sequelize";
import type { ProgressCallback } from "../../../shared/pipeline";
import { CellResult, ProjectSettingsVersion, SurveySnapshot } from "../db.server";
import type { EngineWorkerPool } from "./engine-worker.server";
import type { ComputationSurvey } from "./engine-surveys";
import { computeState, loadStateInput, projectRecomputeStamp, rememberEngineState, serverEnginePool } from "./engine-state.server";
import type { ProjectFigures } from "./project-figures";

/**
 * Rewrites a project's statistics from its active surveys, inside the caller's transaction:
 * every CellResult and SurveySnapshot of the project is replaced. `extra` carries soundings not
 * yet readable from the database (the survey being committed, still in memory). The computation
 * runs in the server's engine pool so other requests are served meanwhile, and gives the
 * project's new engine state too, kept for the map once the transaction commits.
 */
export interface RecomputeOutcome {
  figures: ProjectFigures | null;
  /** Why there are no statistics, when there are none. */
  reason: string | null;
}

const CELL_ROWS_PER_INSERT = 500;

/** The project's latest settings version; null for a project that has none yet. */
export function currentSettingsVersion(projectId: number, transaction?: Transaction): Promise<ProjectSettingsVersion | null> {
  return ProjectSettingsVersion.findOne({ where: { projectId }, order: [["version", "DESC"]], transaction });
}

function toBlob(values: Float32Array | Uint8Array): Buffer {
  return Buffer.from(values.buffer, values.byteOffset, values.byteLength);
}

export async function recomputeProjectStatistics(
  projectId: number,
  transaction: Transaction,
  options: {
    extra?: ComputationSurvey;
    /** The caller is done with `extra`'s arrays: hand them to the engine thread instead of copying. */
    transferExtra?: boolean;
    onProgress?: ProgressCallback;
    /** Where to compute: the server's pool by default; null computes on this thread (see ENGINE_THREADS). */
    pool?: EngineWorkerPool | null;
  } = {},
): Promise<RecomputeOutcome> {
  const loaded = await loadStateInput(projectId, { transaction, extra: options.extra, withFigures: true });
  await CellResult.destroy({ where: { projectId }, transaction });
  await SurveySnapshot.destroy({ where: { projectId }, transaction });
  if (!loaded.input) return { figures: null, reason: loaded.reason };

  const stored = loaded.input.surveys.map((survey) => survey.id).filter((id) => id !== options.extra?.id);
  const state = await computeState(loaded.input, options.pool === undefined ? serverEnginePool() : options.pool, {
    onProgress: options.onProgress,
    transferSurveys: new Set(options.extra && options.transferExtra ? [...stored, options.extra.id] : stored),
  });
  const figures = state?.figures;
  if (!state || !figures) return { figures: null, reason: "There is no active baseline survey yet." };

  const computedAt = new Date();
  // The settings version the figures were computed with (the latest), named on every snapshot.
  const version = await currentSettingsVersion(projectId, transaction);
  const cellRows = figures.cells.map((cell) => ({ projectId, ...cell, computedAt }));
  // Building a batch's models and SQL holds the event loop (about 50 µs a row): batches of 500
  // keep each hold short, so requests are served between them.
  for (let start = 0; start < cellRows.length; start += CELL_ROWS_PER_INSERT) {
    await CellResult.bulkCreate(cellRows.slice(start, start + CELL_ROWS_PER_INSERT), { transaction });
  }
  for (const snapshot of figures.snapshots) {
    await SurveySnapshot.create(
      {
        projectId,
        surveyedOn: snapshot.surveyedOn,
        lastSurveyId: snapshot.lastSurveyId,
        totals: snapshot.totals,
        zones: snapshot.zones,
        cellCols: snapshot.cellCols,
        cellRows: snapshot.cellRows,
        firstCol: snapshot.firstCol,
        firstRow: snapshot.firstRow,
        remainingVolumes: toBlob(snapshot.remainingVolumes),
        removedVolumes: toBlob(snapshot.removedVolumes),
        statuses: toBlob(snapshot.statuses),
        computedAt,
        settingsVersionId: version?.id ?? null,
      },
      { transaction },
    );
  }
  // The stamp as the database now gives it (computedAt as stored), under which readers will ask.
  const stamp = await projectRecomputeStamp(projectId, transaction);
  transaction.afterCommit(() => rememberEngineState(projectId, stamp, state));
  return { figures, reason: null };
}
