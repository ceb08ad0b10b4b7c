import type { FeatureCollection, MultiPolygon } from "geojson";
import { contourBands, depthThresholds, remainingThicknessThresholds, type BandProperties } from "../../shared/bands";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "~/lib/epsg.server";
import { BoundedCache } from "~/lib/bounded-cache";
import { getProjectSurfaces, projectRecomputeStamp } from "~/lib/engine/engine-state.server";
import type { ProjectView } from "./project.server";

export type BandSurface = "remaining" | "depth";

type Bands = FeatureCollection<MultiPolygon, BandProperties>;

// Contouring a surface and converting every ring to lon/lat costs most of a second for the demo;
// the result only changes with a recompute, so it is kept per project, stamp and surface.
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
  const thresholds = surface === "remaining" ? remainingThicknessThresholds(project.lengthUnit) : depthThresholds(project.lengthUnit);
  const crs = createCrs(resolveCrsDefinition(project.crs).definition);
  // Slivers under a quarter of a cell are noise at map scale.
  return contourBands(raster, thresholds, { crs, minArea: (surfaces.result.cellGrid.cellSize ** 2) / 4 });
}
