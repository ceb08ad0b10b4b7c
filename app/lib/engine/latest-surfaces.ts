import type { EngineResult } from "../../../shared/pipeline";
import { createRasterValues, type Raster } from "../../../shared/surface/raster";

/**
 * The project's latest surfaces for the map: the engine's latest state, the bottom-depth raster
 * below the newest water-surface reading, and per cell the deepest latest-bottom depth (the
 * planned working depth) and the number of soundings. Pure: typed arrays in, typed arrays out.
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

/**
 * @param latest the engine's state after every survey in force
 * @param waterSurfaceElevation the newest among the active surveys; null when none gave one
 * @param soundingsPerCell per grid cell, one array per active survey (summed here)
 */
export function latestSurfaces(latest: EngineResult, waterSurfaceElevation: number | null, soundingsPerCell: readonly Uint32Array[]): ProjectSurfaces {
  const cellCount = latest.cellGrid.cols * latest.cellGrid.rows;
  const cellMaxDepth = new Float64Array(cellCount).fill(Number.NaN);
  let depth: Raster | null = null;
  if (waterSurfaceElevation !== null) {
    const bottom = latest.rasters.latestBottom;
    const values = createRasterValues(bottom, "float32");
    for (let node = 0; node < values.length; node++) {
      const nodeDepth = waterSurfaceElevation - bottom.values[node]; // NaN where there is no bottom
      values[node] = nodeDepth;
      const cell = latest.nodeCell[node];
      if (cell >= 0 && Number.isFinite(nodeDepth) && !(nodeDepth <= cellMaxDepth[cell])) cellMaxDepth[cell] = nodeDepth;
    }
    depth = { ...bottom, values };
  }
  const total = new Uint32Array(cellCount);
  for (const counts of soundingsPerCell) for (let cell = 0; cell < cellCount; cell++) total[cell] += counts[cell];
  return { result: latest, waterSurfaceElevation, depth, cellMaxDepth, soundingsPerCell: total };
}
