import { convertLength, unitLabel, type LengthUnit } from "../units";
import type { BinnedValues } from "./depth-unit-mistakes";

/**
 * A whole bottom moved at once: the file's bottom elevations against the earlier surveys of the
 * same cells. Suction dredging of muck lowers the bottom cell by cell, by different amounts, and
 * never much below firm sand (where the baseline's probe stopped); sediment settling back raises it
 * a little. A wrong water-surface elevation (0 typed for 32.1, a gauge read on another staff) or
 * elevations on another vertical datum shift every cell by one amount, often by far more. So the
 * file is held when most cells it shares with the earlier surveys lie below firm sand by more than
 * a foot (or, where no probe reached them, lower than any dredge pass cuts), or higher than
 * settling can raise them, and the median shift is more than two feet. Then the median shift and
 * the water-surface elevation that would agree with the earlier surveys are told.
 *
 * Thresholds (common practice, not a standard): 1 ft below firm sand is beyond any probe's and
 * survey's error together; 10 ft is more muck than one pass removes where no probe reading says
 * how much there was; 2 ft is more than settles back between passes.
 *
 * Pure: binned values in, a plain message out.
 */
export interface BottomShiftInput {
  /** The file's bottom elevation per bin (project units). */
  given: BinnedValues;
  /** The earlier surveys' bottom elevation per bin. */
  previousBottom: BinnedValues;
  /** The earlier surveys' firm-sand (refusal) elevation per bin, where a probe reached it. */
  previousRefusal: BinnedValues;
  unit: LengthUnit;
  /** "depth": bottom = water surface − depth (the upload's water-surface elevation); "elevation": the file's own elevations. */
  measure: "depth" | "elevation";
  waterSurfaceElevation: number | null;
  datum: string;
  /** Bins both must cover before anything is said; default 5. */
  minCells?: number;
}

export interface BottomShift {
  direction: "down" | "up";
  /** Median of (file − earlier) over the cells compared, project units. */
  medianShift: number;
  cellsCompared: number;
  /** Share of the cells compared that no dredging or settling explains. */
  impossibleShare: number;
  /** The water-surface elevation with which the median shift would be zero (depth files only). */
  likelyWaterSurface: number | null;
  message: string;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

export function findBottomShift(input: BottomShiftInput): BottomShift | null {
  const feet = (value: number) => convertLength(value, "ft", input.unit);
  const belowFirm = feet(1);
  const deepestCut = feet(10);
  const mostSettling = feet(2);
  const least = feet(2);
  const diffs: number[] = [];
  let impossibleDown = 0;
  let impossibleUp = 0;
  for (const key of input.given.keys()) {
    const given = input.given.get(key);
    const previous = input.previousBottom.get(key);
    if (given === undefined || previous === undefined || !Number.isFinite(given) || !Number.isFinite(previous)) continue;
    diffs.push(given - previous);
    const refusal = input.previousRefusal.get(key);
    const floor = refusal !== undefined && Number.isFinite(refusal) ? Math.min(refusal, previous) - belowFirm : previous - deepestCut;
    if (given < floor) impossibleDown++;
    if (given > previous + mostSettling) impossibleUp++;
  }
  if (diffs.length < (input.minCells ?? 5)) return null;
  const shift = median(diffs);
  const direction = shift < 0 ? "down" : "up";
  const impossible = (direction === "down" ? impossibleDown : impossibleUp) / diffs.length;
  if (Math.abs(shift) < least || impossible < 0.8) return null;

  const label = unitLabel(input.unit);
  const amount = `${Math.abs(shift).toFixed(1)} ${label}`;
  const where = direction === "down"
    ? `lower than the earlier surveys of the same ${diffs.length} cells, and ${input.previousRefusal.size > 0 ? "below firm sand (where the probe stopped)" : "lower than any dredge pass cuts"} in ${Math.round(impossible * 100)} % of them: far more than dredging could remove`
    : `higher than the earlier surveys of the same ${diffs.length} cells in ${Math.round(impossible * 100)} % of them: far more than sediment settles back between passes`;
  let cause: string;
  let likelyWaterSurface: number | null = null;
  if (input.measure === "depth" && input.waterSurfaceElevation !== null) {
    likelyWaterSurface = input.waterSurfaceElevation - shift;
    cause =
      `A whole bottom moving at once is what a wrong water-surface elevation does: ${input.waterSurfaceElevation.toFixed(2)} ${label} was entered, and about ${likelyWaterSurface.toFixed(1)} ${label} would put the bottom where the earlier surveys found it. ` +
      `Check the staff-gauge reading for the survey day (and that it is on the project's datum, ${input.datum}), correct it and check again, or confirm that the bottom really moved.`;
  } else {
    cause =
      `A whole bottom moving at once is what elevations on another vertical datum do (or a datum offset left out of the export). ` +
      `Check the datum the file's elevations are on (the upload says ${input.datum}), correct the file and check again, or confirm that the bottom really moved.`;
  }
  return {
    direction,
    medianShift: shift,
    cellsCompared: diffs.length,
    impossibleShare: impossible,
    likelyWaterSurface,
    message: `The bottom in this file lies a median ${amount} ${where}. ${cause}`,
  };
}
