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
 * A systematic bias of a survey's vertical reference (a water-level reading, the datum), recorded
 * per survey as the most its whole surface may be off (95 %), shifts every cell that survey's
 * surface carries by the same amount: it enters as area × bias, added over the cells before it is
 * squared, so it does not shrink with more soundings or more cells. Removed is the bottom at the
 * start less the bottom at the end, so a survey's bias counts with the area it carries at the start
 * less the area it carries at the end (a cell on the same survey at both ends has not changed and
 * adds nothing). The surveys' biases are independent of each other and of the random part, so
 * their terms add in quadrature with it. `changedArea` is given so that the volume per unit of
 * bias can be stated beside the band.
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
  /** The most the survey's vertical reference may be off (95 %), project length unit; 0 when none was recorded. */
  bias: number;
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
  /** Per survey in force: the area its bias moves removed by (length²), start ends less end ends. */
  biasArea: Float64Array;
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
  /** The survey a cell's surface rests on at `end`: the newest up to it that sounded the cell; the end's own when none did (the surface was carried across a gap). */
  const restsOn = (end: number, cell: number) => {
    for (let position = end; position >= 0; position--) if (surveys[position].soundingsPerCell[cell] > 0) return position;
    return end;
  };
  /** Variance (95 % scale) one end adds to a cell from its survey's random error, averaged over the cell's soundings. */
  const endVariance = (position: number, bottom: CellElevations, cell: number, area: number) =>
    (area * area * meanTvuSquared(surveys[position], bottom, cell)) / Math.max(1, surveys[position].soundingsPerCell[cell]);
  const rows = rollUpByZone<Accumulator>(
    zoneOfCell, zoneCount, (cell) => stats.areaInLimit[cell] > 0, () => ({ variance: 0, changedArea: 0, biasArea: new Float64Array(surveys.length) }),
    (totals, cell) => {
      const area = stats.surveyedArea[cell];
      if (!(area > 0) || stats.removedVolumeCubicLength[cell] + stats.depositedVolumeCubicLength[cell] === 0) return;
      const start = restsOn(from, cell);
      const end = restsOn(to, cell);
      totals.variance += endVariance(start, bottoms.from, cell, area) + endVariance(end, bottoms.to, cell, area);
      totals.changedArea += area;
      totals.biasArea[start] += area;
      totals.biasArea[end] -= area;
    },
  );
  const band = (totals: Accumulator): RemovedBand => {
    let biasVariance = 0;
    totals.biasArea.forEach((area, position) => { biasVariance += (area * surveys[position].bias) ** 2; });
    return { bandCubicLength: Math.sqrt(totals.variance + biasVariance), changedArea: totals.changedArea };
  };
  return { project: band(rows.project), zones: rows.zones.map(band), unzoned: rows.unzoned && band(rows.unzoned) };
}
