import type { RasterValues } from "../surface/raster";
import type { CellStats } from "./cell-stats";
import { rollUpByZone } from "./rollup";

/**
 * The ± band (95 %) on a pay period's removed volume from the surveys' vertical uncertainty.
 *
 * Each sounding's random error is the total vertical uncertainty its survey's IHO S-44 order
 * allows at its own depth (ed. 6.0.0, table 1: TVU = √(a² + (b·d)²) at 95 %). The depth is read
 * node by node from the bottom at that end of the period: d = the survey's water-surface elevation
 * − the bottom there, so TVU² averaged over a cell is a² + b²·mean(d²) = a² + b²·((W − z̄)² + var z)
 * over the cell's raster nodes. A survey without a water-surface elevation (a file of elevations)
 * takes its median depth, or none (a alone) when it gave no depths either.
 *
 * A cell's surface at each end rests on the soundings of the newest survey up to that end that
 * sounded the cell; their errors are independent and average down over the cell as 1/√n, so the
 * cell's volume carries area² × mean(TVU²)/n from each end. Cells and the two ends are independent,
 * so the terms add in quadrature; a cell whose bottom did not change in the period adds nothing.
 *
 * A systematic bias of the vertical reference (a water-level reading, the datum) shifts a whole
 * surface: it enters as the changed area × the bias, does not shrink with more soundings, and is
 * not in this band. `changedArea` is given so that it can be stated beside it.
 */
export interface BandSurvey {
  /** IHO S-44 coefficients of the survey's order in the project length unit (`tvuCoefficients`): a, length; b, a ratio. */
  a: number;
  b: number;
  /** The water surface the survey's depths were measured from (project length unit); null when it gave none. */
  waterSurfaceElevation: number | null;
  /** Where there is no water surface: the survey's median depth (project length unit), or null (a alone). */
  fallbackDepth: number | null;
  /** Soundings of this survey per grid cell (engine order). */
  soundingsPerCell: Uint32Array;
}

/** The bottom's elevation over each cell's raster nodes with data: their count, mean and (population) variance. */
export interface CellElevations {
  nodes: Uint32Array;
  mean: Float64Array;
  variance: Float64Array;
}

/** `CellElevations` of a bottom raster (`nodeCell`: the cell of each node, −1 outside the limit). */
export function cellElevations(nodeCell: Int32Array, bottom: RasterValues, cellCount: number): CellElevations {
  const nodes = new Uint32Array(cellCount);
  const sum = new Float64Array(cellCount);
  for (let node = 0; node < nodeCell.length; node++) {
    const cell = nodeCell[node];
    const z = bottom[node];
    if (cell < 0 || !Number.isFinite(z)) continue;
    nodes[cell]++;
    sum[cell] += z;
  }
  const mean = new Float64Array(cellCount);
  for (let cell = 0; cell < cellCount; cell++) mean[cell] = nodes[cell] > 0 ? sum[cell] / nodes[cell] : Number.NaN;
  // Second pass about the mean: no cancellation at large elevations.
  const variance = new Float64Array(cellCount);
  for (let node = 0; node < nodeCell.length; node++) {
    const cell = nodeCell[node];
    const z = bottom[node];
    if (cell < 0 || !Number.isFinite(z)) continue;
    variance[cell] += (z - mean[cell]) ** 2;
  }
  for (let cell = 0; cell < cellCount; cell++) if (nodes[cell] > 0) variance[cell] /= nodes[cell];
  return { nodes, mean, variance };
}

/** TVU² (95 % scale, length²) of `survey` averaged over the nodes of `cell` of a bottom. */
export function meanTvuSquared(survey: BandSurvey, bottom: CellElevations, cell: number): number {
  let depthSquared: number;
  if (survey.waterSurfaceElevation !== null && bottom.nodes[cell] > 0) {
    depthSquared = (survey.waterSurfaceElevation - bottom.mean[cell]) ** 2 + bottom.variance[cell];
  } else {
    depthSquared = (survey.fallbackDepth ?? 0) ** 2;
  }
  return survey.a * survey.a + survey.b * survey.b * depthSquared;
}

export interface RemovedBand {
  /** Half-width of the 95 % band, project cubic length unit. */
  bandCubicLength: number;
  /** Surveyed area of the cells whose bottom changed in the period (length²): the volume per unit of reference bias. */
  changedArea: number;
}

interface Accumulator {
  variance: number;
  changedArea: number;
}

/**
 * The band per zone (by `zoneOfCell`, with Unzoned) and for the project. `surveys` in the order of
 * the surveys in force (0 = the baseline); `from` < `to` are positions in it, as for `computePeriodCells`,
 * whose result `stats` is; `bottoms` the elevations of the bottom as of each end (`computePeriod`'s before and after).
 */
export function removedVolumeBand(
  stats: CellStats,
  surveys: readonly BandSurvey[],
  from: number,
  to: number,
  zoneOfCell: Int32Array,
  zoneCount: number,
  bottoms: { from: CellElevations; to: CellElevations },
) {
  /** Variance (95 % scale) one end adds to a cell: the newest survey up to `end` that sounded it; the end's own survey once when none did (the surface was carried across a gap). */
  const endVariance = (end: number, bottom: CellElevations, cell: number, area: number) => {
    for (let position = end; position >= 0; position--) {
      const soundings = surveys[position].soundingsPerCell[cell];
      if (soundings > 0) return (area * area * meanTvuSquared(surveys[position], bottom, cell)) / soundings;
    }
    return area * area * meanTvuSquared(surveys[end], bottom, cell);
  };
  const rows = rollUpByZone<Accumulator>(
    zoneOfCell, zoneCount, (cell) => stats.areaInLimit[cell] > 0, () => ({ variance: 0, changedArea: 0 }),
    (totals, cell) => {
      const area = stats.surveyedArea[cell];
      if (!(area > 0) || stats.removedVolumeCubicLength[cell] + stats.depositedVolumeCubicLength[cell] === 0) return;
      totals.variance += endVariance(from, bottoms.from, cell, area) + endVariance(to, bottoms.to, cell, area);
      totals.changedArea += area;
    },
  );
  const band = (totals: Accumulator): RemovedBand => ({ bandCubicLength: Math.sqrt(totals.variance), changedArea: totals.changedArea });
  return { project: band(rows.project), zones: rows.zones.map(band), unzoned: rows.unzoned && band(rows.unzoned) };
}
