import { cellIndexAt } from "../../../shared/grid/cell-grid";
import { computeVolumesFromSurfaces, triangulateSurveys, type EngineResult } from "../../../shared/pipeline";
import { createRasterValues, type Raster } from "../../../shared/surface/raster";
import { CellResult, Survey, getSequelize } from "../db.server";
import { firmPoints, type ComputationSurvey } from "../import/project-computation";
import { loadProjectGeometry } from "../import/project-geometry.server";
import { loadSurveyPoints } from "../import/recompute.server";
import { BoundedCache } from "./bounded-cache";

/**
 * The project's latest surfaces for the map: the engine's final state (every active survey), the
 * bottom-depth raster below the newest water-surface reading, and per cell the deepest
 * latest-bottom depth (the planned working depth) and the number of soundings. The import stores
 * per-cell figures only, so this is computed on request and cached until the next recompute.
 */
export interface ProjectSurfaces {
  result: EngineResult;
  /** Water-surface elevation the depths are read below; null when no survey gave one. */
  waterSurfaceElevation: number | null;
  depth: Raster | null;
  /** Per grid cell (engine order): deepest latest-bottom depth, NaN where none. */
  cellMaxDepth: Float64Array;
  /** Per grid cell: soundings of all active surveys. */
  soundingsPerCell: Uint32Array;
}

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
  return cache.getOrCompute(key, () => computeSurfaces(projectId));
}

async function computeSurfaces(projectId: number): Promise<ProjectSurfaces | null> {
  const geometry = await loadProjectGeometry(projectId);
  const active = await Survey.findAll({ where: { projectId, status: "active" }, order: [["surveyedOn", "ASC"], ["id", "ASC"]] });
  const baselines = active.filter((survey) => survey.kind === "baseline");
  if (baselines.length === 0 || !geometry.workLimit) return null;
  const points = await getSequelize().transaction((transaction) => loadSurveyPoints(active.map((survey) => survey.id), transaction));
  const surveys: ComputationSurvey[] = active.map((survey) => ({ id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, ...points.get(survey.id)! }));
  // The same choice as the import's computation: the newest active baseline is the one in force.
  const baseline = surveys.filter((survey) => survey.kind === "baseline").at(-1)!;
  const later = surveys.filter((survey) => survey.kind !== "baseline");
  const tins = triangulateSurveys({ baseline, progress: later, firm: firmPoints(baseline) }, geometry.settings.maxEdge);
  const result = computeVolumesFromSurfaces(tins, geometry.workLimit, geometry.settings);

  const withWater = active.filter((survey) => survey.waterSurfaceElevation !== null);
  const waterSurfaceElevation = withWater.length > 0 ? withWater[withWater.length - 1].waterSurfaceElevation : null;
  const cellCount = result.cellGrid.cols * result.cellGrid.rows;
  const cellMaxDepth = new Float64Array(cellCount).fill(Number.NaN);
  let depth: Raster | null = null;
  if (waterSurfaceElevation !== null) {
    const latest = result.rasters.latestBottom;
    const values = createRasterValues(latest, "float32");
    for (let node = 0; node < values.length; node++) {
      const nodeDepth = waterSurfaceElevation - latest.values[node]; // NaN where there is no bottom
      values[node] = nodeDepth;
      const cell = result.nodeCell[node];
      if (cell >= 0 && Number.isFinite(nodeDepth) && !(nodeDepth <= cellMaxDepth[cell])) cellMaxDepth[cell] = nodeDepth;
    }
    depth = { ...latest, values };
  }
  const soundingsPerCell = new Uint32Array(cellCount);
  for (const survey of surveys) {
    for (let index = 0; index < survey.easting.length; index++) {
      const cell = cellIndexAt(result.cellGrid, survey.easting[index], survey.northing[index]);
      if (cell >= 0) soundingsPerCell[cell]++;
    }
  }
  return { result, waterSurfaceElevation, depth, cellMaxDepth, soundingsPerCell };
}
