import type { FeatureCollection, MultiPolygon } from "geojson";
import { contourBands, type BandProperties, type BandRaster } from "../../../shared/bands";
import { createCrs } from "../../../shared/crs";

/**
 * Filled contour bands of one of the state's surfaces (remaining thickness, bottom depth) turned
 * to lon/lat: seconds for a large bay, so they are drawn in an engine thread. Pure.
 */
export type Bands = FeatureCollection<MultiPolygon, BandProperties>;

export interface BandsInput {
  raster: BandRaster;
  thresholds: number[];
  /** The project's CRS as a proj4 definition (a CRS object does not cross to a thread). */
  crsDefinition: string;
  /** Slivers under this area (square project units) are dropped. */
  minArea: number;
}

export function computeProjectBands(input: BandsInput): Bands {
  return contourBands(input.raster, input.thresholds, { crs: createCrs(input.crsDefinition), minArea: input.minArea });
}
