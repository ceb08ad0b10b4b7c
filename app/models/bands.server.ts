import type { FeatureCollection, MultiPolygon } from "geojson";
import { contourBands, depthThresholds, remainingThicknessThresholds, type BandProperties } from "../../shared/bands";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "~/lib/epsg.server";
import { getProjectSurfaces } from "~/lib/map/project-surfaces.server";
import type { ProjectView } from "./project.server";

export type BandSurface = "remaining" | "depth";

/** Filled contour bands of remaining thickness or bottom depth, lon/lat GeoJSON; empty before the first computation. */
export async function getProjectBands(project: ProjectView, surface: BandSurface): Promise<FeatureCollection<MultiPolygon, BandProperties>> {
  const surfaces = await getProjectSurfaces(project.id);
  const empty: FeatureCollection<MultiPolygon, BandProperties> = { type: "FeatureCollection", features: [] };
  if (!surfaces) return empty;
  const raster = surface === "remaining" ? surfaces.result.rasters.remainingThickness : surfaces.depth;
  if (!raster) return empty;
  const thresholds = surface === "remaining" ? remainingThicknessThresholds(project.lengthUnit) : depthThresholds(project.lengthUnit);
  const crs = createCrs(resolveCrsDefinition(project.crs).definition);
  // Slivers under a quarter of a cell are noise at map scale.
  return contourBands(raster, thresholds, { crs, minArea: (surfaces.result.cellGrid.cellSize ** 2) / 4 });
}
