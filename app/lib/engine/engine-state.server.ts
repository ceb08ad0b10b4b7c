import type { Transaction } from "sequelize";
import type { ProgressCallback } from "../../../shared/pipeline";
import { selectSurveysInForce } from "../../../shared/surveys-in-force";
import { BoundedCache } from "../cache/bounded-cache";
import { CellResult, Survey, getSequelize } from "../db.server";
import { appEnginePool, type EngineWorkerPool } from "./engine-worker.server";
import type { ComputationSurvey } from "./engine-surveys";
import { getEnv } from "../settings/env.server";
import type { ProjectSurfaces } from "./latest-surfaces";
import { loadProjectGeometry } from "./project-geometry.server";
import { computeProjectState, type ProjectState, type ProjectStateInput } from "./project-state";
import { loadSurveySoundings } from "./soundings.server";

export type { ProjectSurfaces } from "./latest-surfaces";

/**
 * Each project's engine state (project-state.ts), computed in the server's engine pool and kept
 * per project and version of its surveys (`projectRecomputeStamp`). A recompute computes it while
 * it rewrites the stored figures and hands it over here once its transaction commits, so the map,
 * the bands, the cell inspector and the end-area check read that state rather than computing
 * their own; after a restart the first of them computes it once from the stored soundings.
 */

/** The server's engine pool, or null when ENGINE_THREADS=0 turns it off. */
export function serverEnginePool(): EngineWorkerPool | null {
  return appEnginePool(getEnv().ENGINE_THREADS);
}

/**
 * The project's recompute stamp: the time of the latest cell computation and the number of active
 * surveys (a retract or restore recomputes; a project with no baseline has no cells but can still
 * change its surveys). Two small indexed queries, cheap enough to read on every map request.
 */
export async function projectRecomputeStamp(projectId: number, transaction?: Transaction): Promise<string> {
  const [latest, surveys] = await Promise.all([
    CellResult.max<Date | string | null, CellResult>("computedAt", { where: { projectId }, transaction }),
    Survey.count({ where: { projectId, status: "active" }, transaction }),
  ]);
  return `${latest ? new Date(latest).toISOString() : "none"}:${surveys}`;
}

/**
 * What the engine needs of a project, read from the database: its geometry, and every active
 * survey with its soundings (`extra`: a survey whose soundings are not stored yet, held in
 * memory by a commit). A reason instead when there can be no state.
 */
export async function loadStateInput(
  projectId: number,
  options: { transaction?: Transaction; extra?: ComputationSurvey; withFigures?: boolean } = {},
): Promise<{ input: ProjectStateInput; reason?: undefined } | { input?: undefined; reason: string }> {
  const { transaction, extra } = options;
  const geometry = await loadProjectGeometry(projectId, transaction);
  const active = await Survey.findAll({
    where: { projectId, status: "active" },
    order: [["surveyedOn", "ASC"], ["id", "ASC"]],
    attributes: ["id", "kind", "surveyedOn", "waterSurfaceElevation"],
    transaction,
  });
  if (selectSurveysInForce(active) === null) return { reason: "There is no active baseline survey yet, so there are no cell statistics." };
  if (!geometry.workLimit) return { reason: "The project has no work limit yet, so there are no cell statistics." };
  const stored = active.filter((survey) => survey.id !== extra?.id).map((survey) => survey.id);
  // One transaction for every survey's read, so they come from one consistent state of the database.
  const soundings = transaction ? await loadSurveySoundings(stored, transaction) : await getSequelize().transaction((reading) => loadSurveySoundings(stored, reading));
  const surveys: ComputationSurvey[] = active.map((survey) =>
    extra && survey.id === extra.id ? extra : { id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, ...soundings.get(survey.id)! },
  );
  const withWater = active.filter((survey) => survey.waterSurfaceElevation !== null);
  return {
    input: {
      surveys,
      workLimit: geometry.workLimit,
      zones: geometry.zones,
      settings: geometry.settings,
      lengthUnit: geometry.lengthUnit,
      waterSurfaceElevation: withWater.length > 0 ? withWater[withWater.length - 1].waterSurfaceElevation : null,
      withFigures: options.withFigures ?? false,
    },
  };
}

/**
 * The state in `pool`'s threads, or on this thread when `pool` is null (ENGINE_THREADS=0, for
 * debugging). `transferSurveys`: the surveys whose arrays the caller is done with.
 */
export function computeState(input: ProjectStateInput, pool: EngineWorkerPool | null, options: { onProgress?: ProgressCallback; transferSurveys?: ReadonlySet<number> } = {}): Promise<ProjectState | null> {
  if (pool === null) return Promise.resolve(computeProjectState(input, options.onProgress));
  return pool.computeProjectState(input, options);
}

/** The state as it is kept: the figures of each date are stored by the recompute, not held here. */
export type EngineState = Omit<ProjectState, "figures">;

// A project's state holds several rasters (megabytes for a large bay): a few projects at a time.
const STATE_PROJECTS_HELD = 4;
const cache = new BoundedCache<EngineState | null>(STATE_PROJECTS_HELD);

const keyOf = (projectId: number, stamp: string) => `${projectId}:${stamp}`;

/** The project's state for its current stamp (or `stamp`), computed once per stamp; null when there is none (no baseline, no work limit). */
export async function getEngineState(projectId: number, stamp?: string): Promise<EngineState | null> {
  const key = keyOf(projectId, stamp ?? (await projectRecomputeStamp(projectId)));
  // An older stamp's state is never read again: let it go now rather than when it ages out.
  if (!cache.has(key)) cache.dropPrefix(`${projectId}:`);
  return cache.getOrCompute(key, () => computeStoredState(projectId, serverEnginePool()));
}

/** A state a recompute computed, kept under the stamp its rows carry (once its transaction has committed). */
export function rememberEngineState(projectId: number, stamp: string, state: ProjectState | null): void {
  cache.dropPrefix(`${projectId}:`);
  cache.getOrCompute(keyOf(projectId, stamp), () => Promise.resolve(state && { surfaces: state.surfaces, endArea: state.endArea, periods: state.periods }));
}

/** The state from the stored soundings now, uncached: in `pool`'s threads, or on this thread with `pool` null. */
export async function computeStoredState(projectId: number, pool: EngineWorkerPool | null): Promise<EngineState | null> {
  const { input } = await loadStateInput(projectId);
  if (!input) return null;
  // The arrays were read for this computation alone: they move to the threads rather than being copied.
  const state = await computeState(input, pool, { transferSurveys: new Set(input.surveys.map((survey) => survey.id)) });
  return state && { surfaces: state.surfaces, endArea: state.endArea, periods: state.periods };
}

/** The map's surfaces for the project's current stamp (or `stamp`). */
export async function getProjectSurfaces(projectId: number, stamp?: string): Promise<ProjectSurfaces | null> {
  return (await getEngineState(projectId, stamp))?.surfaces ?? null;
}

/** The project's surfaces now, uncached: in the server's engine pool, or on this thread with `pool` null. */
export async function computeProjectSurfaces(projectId: number, pool: EngineWorkerPool | null = serverEnginePool()): Promise<ProjectSurfaces | null> {
  return (await computeStoredState(projectId, pool))?.surfaces ?? null;
}
