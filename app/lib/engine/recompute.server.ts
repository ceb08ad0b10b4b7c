import { QueryTypes, type Transaction } from "sequelize";
import type { ProgressCallback } from "../../../shared/pipeline";
import { CellResult, Survey, SurveySnapshot, getSequelize } from "../db.server";
import { appEnginePool, type EngineWorkerPool } from "./engine-worker.server";
import { getEnv } from "../env.server";
import { computeProjectFigures, type ComputationSurvey, type ProjectComputation, type ProjectComputationInput } from "./project-figures";
import { loadProjectGeometry } from "./project-geometry.server";

/**
 * Rewrites a project's statistics from its active surveys, inside the caller's transaction:
 * every CellResult and SurveySnapshot of the project is replaced. `extra` carries soundings not
 * yet readable from the database (the survey being committed, still in memory). The computation
 * runs in the server's engine pool so other requests are served meanwhile.
 */
export interface RecomputeOutcome {
  computation: ProjectComputation | null;
  /** Why there are no statistics, when there are none. */
  reason: string | null;
}

export async function loadSurveyPoints(surveyIds: number[], transaction: Transaction): Promise<Map<number, Omit<ComputationSurvey, "id" | "kind" | "surveyedOn">>> {
  const result = new Map<number, Omit<ComputationSurvey, "id" | "kind" | "surveyedOn">>();
  for (const surveyId of surveyIds) {
    const rows = await getSequelize().query<{ easting: number; northing: number; elevation: number; refusalElevation: number | null }>(
      "SELECT easting, northing, elevation, refusalElevation FROM soundings WHERE surveyId = ? ORDER BY id",
      { replacements: [surveyId], type: QueryTypes.SELECT, transaction },
    );
    const count = rows.length;
    const easting = new Float64Array(count);
    const northing = new Float64Array(count);
    const elevation = new Float64Array(count);
    const refusal = new Float64Array(count);
    let anyRefusal = false;
    for (let index = 0; index < count; index++) {
      const row = rows[index];
      easting[index] = row.easting;
      northing[index] = row.northing;
      elevation[index] = row.elevation;
      refusal[index] = row.refusalElevation ?? Number.NaN;
      if (row.refusalElevation !== null) anyRefusal = true;
    }
    result.set(surveyId, { easting, northing, elevation, refusalElevation: anyRefusal ? refusal : null });
  }
  return result;
}

const CELL_ROWS_PER_INSERT = 500;

function toBlob(values: Float32Array | Uint8Array): Buffer {
  return Buffer.from(values.buffer, values.byteOffset, values.byteLength);
}

/** The server's engine pool, or null when ENGINE_THREADS=0 turns it off. */
export function serverEnginePool(): EngineWorkerPool | null {
  return appEnginePool(getEnv().ENGINE_THREADS);
}

/**
 * The figures in `pool`'s thread (the surveys read from the database are handed over, not copied;
 * the caller's `extra` is copied), or on this thread when `pool` is null.
 */
export function computeFigures(input: ProjectComputationInput, pool: EngineWorkerPool | null, options: { onProgress?: ProgressCallback; transferSurveys?: ReadonlySet<number> } = {}) {
  if (pool === null) return Promise.resolve(computeProjectFigures(input, options.onProgress));
  return pool.computeProjectFigures(input, options);
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
  const geometry = await loadProjectGeometry(projectId, transaction);
  const active = await Survey.findAll({ where: { projectId, status: "active" }, order: [["surveyedOn", "ASC"], ["id", "ASC"]], transaction });
  const fromDatabase = active.filter((survey) => survey.id !== options.extra?.id).map((survey) => survey.id);
  const points = await loadSurveyPoints(fromDatabase, transaction);
  const surveys: ComputationSurvey[] = active.map((survey) => {
    if (options.extra && survey.id === options.extra.id) return options.extra;
    return { id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, ...points.get(survey.id)! };
  });

  await CellResult.destroy({ where: { projectId }, transaction });
  await SurveySnapshot.destroy({ where: { projectId }, transaction });
  if (!surveys.some((survey) => survey.kind === "baseline")) return { computation: null, reason: "There is no active baseline survey yet, so there are no cell statistics." };
  if (!geometry.workLimit) return { computation: null, reason: "The project has no work limit yet, so there are no cell statistics." };

  const computation = await computeFigures(
    { surveys, workLimit: geometry.workLimit, zones: geometry.zones, settings: geometry.settings, lengthUnit: geometry.lengthUnit },
    options.pool === undefined ? serverEnginePool() : options.pool,
    { onProgress: options.onProgress, transferSurveys: new Set(options.extra && options.transferExtra ? [...fromDatabase, options.extra.id] : fromDatabase) },
  );
  if (!computation) return { computation: null, reason: "There is no active baseline survey yet." };

  const computedAt = new Date();
  const cellRows = computation.cells.map((cell) => ({ projectId, ...cell, computedAt }));
  // Building a batch's models and SQL holds the event loop (about 50 µs a row): batches of 500
  // keep each hold short, so requests are served between them.
  for (let start = 0; start < cellRows.length; start += CELL_ROWS_PER_INSERT) {
    await CellResult.bulkCreate(cellRows.slice(start, start + CELL_ROWS_PER_INSERT), { transaction });
  }
  for (const snapshot of computation.snapshots) {
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
      },
      { transaction },
    );
  }
  return { computation, reason: null };
}
