import { depthThresholds, remainingThicknessThresholds } from "../../shared/bands";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { BoundedCache } from "~/lib/cache/bounded-cache";
import { getProjectSurfaces, projectRecomputeStamp, serverEnginePool } from "~/lib/engine/engine-state.server";
import { computeProjectBands, type Bands, type BandsInput } from "~/lib/engine/project-bands";
import type { ProjectView } from "~/lib/auth/project-view.server";

export type BandSurface = "remaining" | "depth";

// Contouring a surface and converting every ring to lon/lat costs most of a second for the demo
// (seconds for a large bay, in an engine thread); the result only changes with a recompute, so it
// is kept per project, stamp and surface.
const BAND_SETS_HELD = 16;
const cache = new BoundedCache<Bands>(BAND_SETS_HELD);

/** Filled contour bands of remaining thickness or bottom depth, lon/lat GeoJSON; empty before the first computation. */
export async function getProjectBands(project: ProjectView, surface: BandSurface): Promise<Bands> {
  const stamp = await projectRecomputeStamp(project.id);
  // The unit and CRS are in the key: changing either changes the thresholds or the coordinates.
  const key = `${project.id}:${stamp}:${surface}:${project.lengthUnit}:${project.crs}`;
  return cache.getOrCompute(key, () => computeBands(project, surface, stamp));
}

async function computeBands(project: ProjectView, surface: BandSurface, stamp: string): Promise<Bands> {
  const surfaces = await getProjectSurfaces(project.id, stamp);
  const empty: Bands = { type: "FeatureCollection", features: [] };
  if (!surfaces) return empty;
  const raster = surface === "remaining" ? surfaces.result.rasters.remainingThickness : surfaces.depth;
  if (!raster) return empty;
  const input: BandsInput = {
    raster,
    thresholds: surface === "remaining" ? remainingThicknessThresholds(project.lengthUnit) : depthThresholds(project.lengthUnit),
    crsDefinition: resolveCrsDefinition(project.crs).definition,
    // Slivers under a quarter of a cell are noise at map scale.
    minArea: surfaces.result.cellGrid.cellSize ** 2 / 4,
  };
  const pool = serverEnginePool();
  return pool ? pool.computeProjectBands(input) : computeProjectBands(input);
}
