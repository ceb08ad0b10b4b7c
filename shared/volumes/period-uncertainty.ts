import type { CellStats } from "./cell-stats";
import { rollUpByZone } from "./rollup";

/**
 * The ± band (95 %) on a pay period's removed volume from the surveys' vertical uncertainty.
 *
 * Each survey's allowed total vertical uncertainty (IHO S-44 ed. 6.0.0, table 1: TVU = √(a² + (b·d)²)
 * at 95 %, for the survey's order at its median depth) is taken as the random error of one
 * sounding. A cell's surface at each end of the period rests on the soundings of the newest survey
 * up to that end that sounded the cell; their errors average down over the cell as 1/√n, so the
 * cell's volume carries area × TVU/√n from each end. Cells and the two ends are independent, so the
 * terms add in quadrature; a cell whose bottom did not change in the period adds nothing.
 *
 * A systematic bias of the vertical reference (a water-level reading, the datum) shifts a whole
 * surface: it enters as the changed area × the bias, does not shrink with more soundings, and is
 * not in this band. `changedArea` is given so that it can be stated beside it.
 */
export interface BandSurvey {
  /** Allowed TVU at 95 % (project length unit). */
  tvu: number;
  /** Soundings of this survey per grid cell (engine order). */
  soundingsPerCell: Uint32Array;
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
 * whose result `stats` is.
 */
export function removedVolumeBand(stats: CellStats, surveys: readonly BandSurvey[], from: number, to: number, zoneOfCell: Int32Array, zoneCount: number) {
  /** Variance (95 % scale) one end adds to a cell: the newest survey up to `end` that sounded it; the end's own survey once when none did (the surface was carried across a gap). */
  const endVariance = (end: number, cell: number, area: number) => {
    for (let position = end; position >= 0; position--) {
      const soundings = surveys[position].soundingsPerCell[cell];
      if (soundings > 0) return (area * surveys[position].tvu) ** 2 / soundings;
    }
    return (area * surveys[end].tvu) ** 2;
  };
  const rows = rollUpByZone<Accumulator>(
    zoneOfCell, zoneCount, (cell) => stats.areaInLimit[cell] > 0, () => ({ variance: 0, changedArea: 0 }),
    (totals, cell) => {
      const area = stats.surveyedArea[cell];
      if (!(area > 0) || stats.removedVolumeCubicLength[cell] + stats.depositedVolumeCubicLength[cell] === 0) return;
      totals.variance += endVariance(from, cell, area) + endVariance(to, cell, area);
      totals.changedArea += area;
    },
  );
  const band = (totals: Accumulator): RemovedBand => ({ bandCubicLength: Math.sqrt(totals.variance), changedArea: totals.changedArea });
  return { project: band(rows.project), zones: rows.zones.map(band), unzoned: rows.unzoned && band(rows.unzoned) };
}
