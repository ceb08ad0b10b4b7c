import { convertLength, FEET_PER_METRE, METRES_PER_FOOT, unitLabel, type LengthUnit } from "../units";

/**
 * Finds the usual depth-unit mistakes before anything is stored, by comparing the file with what
 * the project already knows about the same ground: metres declared as feet (the depths come out
 * 3.2808 times too small), feet declared as metres (3.2808 times too large), and depths written in
 * tenths or hundredths of the unit (decimetres or centimetres for a metre file): 10 or 100 times.
 *
 * The soundings of both are gathered into square bins; over the bins both cover, the file's median
 * value is set against what the earlier surveys lead one to expect there: for a depth file the
 * water-surface elevation minus the previous bottom elevation (the depth the bottom would have if
 * it had not moved), for an elevation file the previous bottom elevation itself. A unit mistake
 * scales every bin by the same factor; dredging moves bins by different amounts, never by one
 * factor everywhere. So a candidate factor is reported only when dividing by it brings most bins
 * into agreement while the values as given agree in few. It stays a warning the technician must
 * acknowledge: a real change of the bottom can, rarely, look like one.
 *
 * Pure: binned values in, a plain message out.
 */

// The US survey foot differs from the international foot by 2 parts per million, far below
// anything this check can see, so both feet are "feet" here.

export type DepthUnitMistakeKind = "metres-as-feet" | "feet-as-metres" | "tenths" | "hundredths";

export interface DepthUnitMistake {
  kind: DepthUnitMistakeKind;
  /** The file's values (in project units, after the declared conversion) are this many times what was expected. */
  factor: number;
  /** Median of given ÷ expected over the bins compared. */
  typicalRatio: number;
  /** Bins both cover, compared. */
  cellsCompared: number;
  /** Share of the bins whose ratio a real change of the bottom can explain, as given and after dividing by the factor. */
  agreeingAsGiven: number;
  agreeingCorrected: number;
  message: string;
}

export interface BinnedValues {
  /** Bin key → median value in that bin. */
  get(key: string): number | undefined;
  keys(): Iterable<string>;
  readonly size: number;
}

interface Candidate {
  kind: DepthUnitMistakeKind;
  factor: number;
  looksLike: string;
  fix: string;
}


/** The mistakes a file declared in `declared` can plausibly carry. */
function candidatesFor(declared: LengthUnit): Candidate[] {
  if (declared === "m") {
    return [
      { kind: "feet-as-metres", factor: FEET_PER_METRE, looksLike: "feet", fix: "Choose feet (or US survey feet) as the file's unit" },
      { kind: "tenths", factor: 10, looksLike: "decimetres (tenths of a metre)", fix: "Export the depths in metres, or divide them by 10" },
      { kind: "hundredths", factor: 100, looksLike: "centimetres", fix: "Export the depths in metres, or divide them by 100" },
    ];
  }
  return [
    { kind: "metres-as-feet", factor: METRES_PER_FOOT, looksLike: "metres", fix: "Choose metres as the file's unit" },
    { kind: "tenths", factor: 10, looksLike: "tenths of a foot", fix: "Export the depths in feet, or divide them by 10" },
    { kind: "hundredths", factor: 100, looksLike: "hundredths of a foot", fix: "Export the depths in feet, or divide them by 100" },
  ];
}

/** Square bins of `size` project units from the origin; the same binning on both sides pairs nearby soundings. */
export function binKey(x: number, y: number, size: number, originX = 0, originY = 0): string {
  return `${Math.floor((x - originX) / size)},${Math.floor((y - originY) / size)}`;
}

function medianOf(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/** Median value per bin of the points (non-finite values skipped); at most `maxPoints` points are read, evenly spread. */
export function binMedians(x: ArrayLike<number>, y: ArrayLike<number>, value: ArrayLike<number>, size: number, origin: { x: number; y: number } = { x: 0, y: 0 }, maxPoints = 200_000): Map<string, number> {
  const step = Math.max(1, Math.ceil(value.length / maxPoints));
  const lists = new Map<string, number[]>();
  for (let index = 0; index < value.length; index += step) {
    const v = value[index];
    if (!Number.isFinite(v) || !Number.isFinite(x[index]) || !Number.isFinite(y[index])) continue;
    const key = binKey(x[index], y[index], size, origin.x, origin.y);
    const list = lists.get(key);
    if (list) list.push(v);
    else lists.set(key, [v]);
  }
  const medians = new Map<string, number>();
  for (const [key, list] of lists) medians.set(key, medianOf(list));
  return medians;
}

export interface DepthUnitCheckInput {
  measure: "depth" | "elevation";
  /** The file's per-bin medians, in project units after the declared conversion (depths, or bottom elevations). */
  given: BinnedValues;
  /** Per-bin expectation in project units: expected depth (water surface − previous bottom) or the previous bottom elevation. */
  expected: BinnedValues;
  declaredUnit: LengthUnit;
  projectUnit: LengthUnit;
  /** Bins both must cover before anything is said; default 5. */
  minCells?: number;
}

/**
 * What a real change of the bottom can do to the ratio of the file's value to the expected one in
 * a bin: a dredge pass deepens the water, often by half again and in shallow spring runs up to about
 * double; sediment settling in makes it shallower, rarely by more than a third of the water column.
 * Bottom elevations move little relative to their size unless the datum lies near the bottom (then
 * the ratio scatters and nothing is said). Common practice, not a standard.
 */
const PLAUSIBLE_RATIO = { depth: [0.6, 2.2], elevation: [0.8, 1.25] } as const;

export function findDepthUnitMistake(input: DepthUnitCheckInput): DepthUnitMistake | null {
  const minCells = input.minCells ?? 5;
  // Depths under half a foot make the ratio jumpy: only water that stands over the previous bottom is compared.
  const floor = convertLength(0.5, "ft", input.projectUnit);
  const ratios: number[] = [];
  for (const key of input.given.keys()) {
    const expected = input.expected.get(key);
    const given = input.given.get(key);
    if (expected === undefined || given === undefined || !Number.isFinite(expected) || !Number.isFinite(given)) continue;
    if (input.measure === "depth" ? !(expected > floor && given > 0) : !(Math.abs(expected) > floor)) continue;
    ratios.push(given / expected);
  }
  if (ratios.length < minCells) return null;
  const [low, high] = PLAUSIBLE_RATIO[input.measure];
  const agreeing = (factor: number) => ratios.filter((ratio) => ratio / factor >= low && ratio / factor <= high).length / ratios.length;
  const asGiven = agreeing(1);
  // Enough bins agree as given: the unit is right, whatever else changed.
  if (asGiven >= 0.3) return null;
  let best: { candidate: Candidate; share: number } | null = null;
  for (const candidate of candidatesFor(input.declaredUnit)) {
    const share = agreeing(candidate.factor);
    if (share >= 0.6 && (!best || share > best.share)) best = { candidate, share };
  }
  if (!best) return null;
  const { candidate } = best;
  const typicalRatio = medianOf(ratios);
  const what = input.measure === "depth" ? "depths" : "elevations";
  const times = typicalRatio >= 1 ? `about ${formatFactor(typicalRatio)} times larger than` : `about ${formatFactor(1 / typicalRatio)} times smaller than`;
  const compared = input.measure === "depth" ? "the depths the earlier surveys give there (water-surface elevation minus their bottom elevation)" : "the bottom elevations of the earlier surveys";
  const relation =
    candidate.kind === "metres-as-feet" || candidate.kind === "feet-as-metres" ? " A metre is 3.2808 feet (1 ft = 0.3048 m exactly)." : "";
  const message =
    `The ${what} look like ${candidate.looksLike}, not ${unitLabel(input.declaredUnit, "length-long")} as declared: over the ${ratios.length} cells surveyed before, they are ${times} ${compared}, ` +
    `and ${candidate.factor < 1 ? `multiplied by ${formatFactor(1 / candidate.factor)}` : `divided by ${formatFactor(candidate.factor)}`} they agree with the earlier surveys in ${Math.round(best.share * 100)} % of those cells, as far as a dredge pass can change them (as given, in ${Math.round(asGiven * 100)} %).${relation} ` +
    `${candidate.fix} and check again, or confirm that the ${what} are right as given.`;
  return { kind: candidate.kind, factor: candidate.factor, typicalRatio, cellsCompared: ratios.length, agreeingAsGiven: asGiven, agreeingCorrected: best.share, message };
}

function formatFactor(value: number): string {
  return value >= 9.5 ? value.toFixed(0) : value.toFixed(2);
}
