import { cellIndexAt } from "../../../shared/grid/cell-grid";
import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import { computeVolumesFromSurfaces, triangulateSurveys, type EngineResult, type EngineSettings } from "../../../shared/pipeline";
import { createRasterValues, type Raster } from "../../../shared/surface/raster";
import { firmPoints, type ComputationSurvey } from "./project-figures";

/**
 * The project's latest surfaces for the map, from its active surveys: the engine's final state,
 * the bottom-depth raster below the newest water-surface reading, and per cell the deepest
 * latest-bottom depth (the planned working depth) and the number of soundings. Pure: typed arrays
 * in, typed arrays out, so it runs in an engine thread unchanged (see engine-worker.thread.ts).
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

export interface LatestSurfacesInput {
  /** Active surveys, oldest first (date, then id). */
  surveys: ComputationSurvey[];
  workLimit: ProjectedMultiPolygon;
  settings: EngineSettings;
  /** The newest water-surface elevation among the active surveys; null when none gave one. */
  waterSurfaceElevation: number | null;
}

export function computeLatestSurfaces(input: LatestSurfacesInput): ProjectSurfaces | null {
  const { surveys, workLimit, settings, waterSurfaceElevation } = input;
  // The same choice as the import's computation: the newest active baseline is the one in force.
  const baseline = surveys.filter((survey) => survey.kind === "baseline").at(-1);
  if (!baseline) return null;
  const later = surveys.filter((survey) => survey.kind !== "baseline");
  const tins = triangulateSurveys({ baseline, progress: later, firm: firmPoints(baseline) }, settings.maxEdge);
  const result = computeVolumesFromSurfaces(tins, workLimit, settings);

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
