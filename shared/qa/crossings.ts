import type { LengthUnit } from "../units";
import { buildPointGrid, forEachWithin } from "./point-grid";
import { allowedTvu, type SurveyOrder } from "./tvu";

export interface LineDetectionOptions {
  /** A turn sharper than this between consecutive legs starts a new line (default 30°). */
  maxTurnDeg?: number;
  /** A gap longer than this between consecutive soundings starts a new line. */
  maxGap: number;
}

/**
 * Line ids for soundings logged in order along survey lines, found from the heading: a new line
 * begins where the track turns sharply or jumps. Soundings on the same spot keep the line.
 */
export function linesByHeading(xs: Float64Array, ys: Float64Array, options: LineDetectionOptions): Uint32Array<ArrayBuffer> {
  const maxTurn = ((options.maxTurnDeg ?? 30) * Math.PI) / 180;
  const lineIds = new Uint32Array(xs.length);
  let line = 0;
  let heading = Number.NaN;
  for (let i = 1; i < xs.length; i++) {
    const dx = xs[i] - xs[i - 1];
    const dy = ys[i] - ys[i - 1];
    const step = Math.hypot(dx, dy);
    if (step > options.maxGap) {
      line++;
      heading = Number.NaN;
    } else if (step > 0) {
      const legHeading = Math.atan2(dy, dx);
      if (!Number.isNaN(heading)) {
        let turn = Math.abs(legHeading - heading);
        if (turn > Math.PI) turn = 2 * Math.PI - turn;
        // The sounding that ends the sharp leg starts the new line.
        if (turn > maxTurn) line++;
      }
      heading = legHeading;
    }
    lineIds[i] = line;
  }
  return lineIds;
}

export interface CrossingOptions {
  /** Soundings of different lines closer than this are compared (project units). */
  radius: number;
  order: SurveyOrder;
  unit: LengthUnit;
  /** When given, only check-line soundings are compared against main-line soundings. */
  isCheckLine?: (lineId: number) => boolean;
}

export interface CrossingResult {
  /** Each comparison: sounding `first` against its nearest sounding `second` on another line. */
  first: Uint32Array<ArrayBuffer>;
  second: Uint32Array<ArrayBuffer>;
  /** depth[first] − depth[second], project units. */
  differences: Float64Array<ArrayBuffer>;
  /** TVU allowance at the pair's mean depth, project units. */
  allowances: Float64Array<ArrayBuffer>;
  /** Share of comparisons with |difference| ≤ allowance (NaN when there are none). */
  withinAllowanceShare: number;
  meanDifference: number;
  /** Root mean square of the differences. */
  rmsDifference: number;
}

/**
 * Vertical differences where lines cross: each sounding is paired with the nearest sounding of
 * another line within `radius` (each pair once), and the depth difference is compared with the
 * IHO S-44 ed. 6.0.0 TVU allowance of the chosen order at the pair's mean depth. Comparing the
 * difference with the allowance itself (not √2 times it) is the stricter reading used in practice.
 */
export function crossingDifferences(
  xs: Float64Array,
  ys: Float64Array,
  depths: Float64Array,
  lineIds: Uint32Array | Int32Array,
  options: CrossingOptions,
): CrossingResult {
  if (depths.length !== xs.length || lineIds.length !== xs.length) throw new Error("Each sounding needs a depth and a line");
  const grid = buildPointGrid(xs, ys, options.radius);
  const isCheck = options.isCheckLine;
  // Each sounding's nearest sounding of another line (−1 when none): one typed array, and one
  // visitor for the whole loop (a closure per sounding, lists grown by pushes and a set of pair
  // keys were most of a 1,000,000-row import's garbage).
  const nearestOf = new Int32Array(xs.length).fill(-1);
  let i = 0;
  let nearest = -1;
  let nearestDistance = Infinity;
  const visit = (j: number, distanceSquared: number) => {
    if (lineIds[j] === lineIds[i] || Number.isNaN(depths[j])) return;
    if (isCheck ? isCheck(lineIds[j]) : false) return;
    if (distanceSquared < nearestDistance || (distanceSquared === nearestDistance && j < nearest)) {
      nearest = j;
      nearestDistance = distanceSquared;
    }
  };
  for (i = 0; i < xs.length; i++) {
    if (Number.isNaN(depths[i])) continue;
    if (isCheck && !isCheck(lineIds[i])) continue; // pairs are taken from the check line's side
    nearest = -1;
    nearestDistance = Infinity;
    forEachWithin(grid, xs[i], ys[i], options.radius, visit);
    nearestOf[i] = nearest;
  }
  // Each pair once: (i, j) and its mirror (j, i) when j's nearest is i, kept where it comes first.
  // A sounding has one nearest, so the mirror is the only way a pair can come twice.
  const kept = (a: number) => nearestOf[a] >= 0 && !(nearestOf[a] < a && nearestOf[nearestOf[a]] === a);
  let count = 0;
  for (let a = 0; a < xs.length; a++) if (kept(a)) count++;
  const keptFirst = new Uint32Array(count);
  const keptSecond = new Uint32Array(count);
  for (let a = 0, k = 0; a < xs.length; a++) {
    if (!kept(a)) continue;
    keptFirst[k] = a;
    keptSecond[k] = nearestOf[a];
    k++;
  }
  const differences = new Float64Array(count);
  const allowances = new Float64Array(count);
  let within = 0;
  let sum = 0;
  let sumSquares = 0;
  for (let k = 0; k < count; k++) {
    const a = keptFirst[k];
    const b = keptSecond[k];
    const difference = depths[a] - depths[b];
    const allowance = allowedTvu(options.order, (depths[a] + depths[b]) / 2, options.unit);
    differences[k] = difference;
    allowances[k] = allowance;
    if (Math.abs(difference) <= allowance) within++;
    sum += difference;
    sumSquares += difference * difference;
  }
  return {
    first: keptFirst,
    second: keptSecond,
    differences,
    allowances,
    withinAllowanceShare: count === 0 ? Number.NaN : within / count,
    meanDifference: count === 0 ? Number.NaN : sum / count,
    rmsDifference: count === 0 ? Number.NaN : Math.sqrt(sumSquares / count),
  };
}
