import { CellResult, Survey, getSequelize } from "../db.server";
import type { EngineWorkerPool } from "./engine-worker.server";
import type { ComputationSurvey } from "./project-figures";
import { loadProjectGeometry } from "./project-geometry.server";
import { loadSurveyPoints, serverEnginePool } from "./recompute.server";
import { BoundedCache } from "../bounded-cache";
import { computeLatestSurfaces, type LatestSurfacesInput, type ProjectSurfaces } from "./latest-surfaces";

export type { ProjectSurfaces } from "./latest-surfaces";

/**
 * The project's latest surfaces for the map (see latest-surfaces.ts). The import stores per-cell
 * figures only, so this is computed on request, in the server's engine pool so the request does
 * not hold up others, and cached until the next recompute.
 */

// A project's surfaces hold several rasters (megabytes for a large bay): a few projects at a time.
const SURFACE_PROJECTS_HELD = 4;
const cache = new BoundedCache<ProjectSurfaces | null>(SURFACE_PROJECTS_HELD);

/**
 * The project's recompute stamp: the time of the latest cell computation and the number of active
 * surveys (a retract or restore recomputes; a project with no baseline has no cells but can still
 * change its surveys). Two small indexed queries, cheap enough to read on every map request.
 */
export async function projectRecomputeStamp(projectId: number): Promise<string> {
  const [latest, surveys] = await Promise.all([
    CellResult.max<Date | string | null, CellResult>("computedAt", { where: { projectId } }),
    Survey.count({ where: { projectId, status: "active" } }),
  ]);
  return `${latest ? new Date(latest).toISOString() : "none"}:${surveys}`;
}

/** The surfaces for the project's current stamp, computed once per stamp. */
export async function getProjectSurfaces(projectId: number, stamp?: string): Promise<ProjectSurfaces | null> {
  const current = stamp ?? (await projectRecomputeStamp(projectId));
  const key = `${projectId}:${current}`;
  // An older stamp's surfaces are never read again: let them go now rather than when they age out.
  if (!cache.has(key)) cache.dropPrefix(`${projectId}:`);
  return cache.getOrCompute(key, () => computeProjectSurfaces(projectId));
}

/** The surfaces in `pool`'s thread (the loaded survey arrays are handed over), or on this thread when `pool` is null. */
export function computeSurfacesIn(input: LatestSurfacesInput, pool: EngineWorkerPool | null): Promise<ProjectSurfaces | null> {
  if (pool === null) return Promise.resolve(computeLatestSurfaces(input));
  return pool.computeLatestSurfaces(input, { transferSurveys: new Set(input.surveys.map((survey) => survey.id)) });
}

/** The project's surfaces now, uncached: in the server's engine pool, or on this thread with `pool` null. */
export async function computeProjectSurfaces(projectId: number, pool: EngineWorkerPool | null = serverEnginePool()): Promise<ProjectSurfaces | null> {
  const geometry = await loadProjectGeometry(projectId);
  const active = await Survey.findAll({ where: { projectId, status: "active" }, order: [["surveyedOn", "ASC"], ["id", "ASC"]] });
  if (!active.some((survey) => survey.kind === "baseline") || !geometry.workLimit) return null;
  const points = await getSequelize().transaction((transaction) => loadSurveyPoints(active.map((survey) => survey.id), transaction));
  const surveys: ComputationSurvey[] = active.map((survey) => ({ id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, ...points.get(survey.id)! }));
  const withWater = active.filter((survey) => survey.waterSurfaceElevation !== null);
  const waterSurfaceElevation = withWater.length > 0 ? withWater[withWater.length - 1].waterSurfaceElevation : null;
  return computeSurfacesIn({ surveys, workLimit: geometry.workLimit, settings: geometry.settings, waterSurfaceElevation }, pool);
}
