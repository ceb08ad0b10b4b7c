import { createRasterValues, type RasterGrid, type RasterPrecision, type RasterValues } from "../surface/raster";

/** Marks a node no survey covers in `LatestBottom.source`. */
export const noSurvey = 255;

export interface LatestBottom {
  values: RasterValues;
  /** For each node, the index (into the newest-first list) of the survey that supplied it, or `noSurvey`. */
  source: Uint8Array;
}

/**
 * The bottom as it stands now: progress surveys often cover only the cells worked since the last
 * pass, so each raster node takes the newest survey that has data there and falls back to older
 * ones (ending with the baseline). Surveys are given newest first, all on the same raster grid.
 */
export function stackLatestBottom(
  grid: RasterGrid,
  surveysNewestFirst: ReadonlyArray<RasterValues>,
  precision: RasterPrecision = "float64",
): LatestBottom {
  if (surveysNewestFirst.length >= noSurvey) throw new Error(`at most ${noSurvey - 1} surveys can be stacked`);
  const count = grid.cols * grid.rows;
  const values = createRasterValues(grid, precision);
  const source = new Uint8Array(count).fill(noSurvey);
  for (const survey of surveysNewestFirst) {
    if (survey.length !== count) throw new Error("every survey must be sampled on the same raster grid");
  }
  for (let node = 0; node < count; node++) {
    for (let survey = 0; survey < surveysNewestFirst.length; survey++) {
      const value = surveysNewestFirst[survey][node];
      if (value === value) { // not NaN
        values[node] = value;
        source[node] = survey;
        break;
      }
    }
  }
  return { values, source };
}
