import { buildPointGrid, forEachWithin } from "./point-grid";

export interface SpikeOptions {
  /** Neighbours are the soundings within this distance (project units). */
  radius: number;
  /** A sounding is a spike when it differs from its neighbours' median by more than this. */
  threshold: number;
  /** Soundings with fewer neighbours than this are not judged (default 3). */
  minimumNeighbours?: number;
}

export interface SpikeResult {
  /** Indices of the flagged soundings, in input order. */
  indices: Uint32Array;
  /** value − median of neighbours, for each flagged sounding. */
  differences: Float64Array;
  /** Soundings that had too few neighbours to judge. */
  unjudged: number;
}

/**
 * Flags soundings that stand out from their neighbours. The median of the neighbours, not their
 * mean, is the reference so that one spike does not drag its neighbours' reference with it.
 * `values` are depths or elevations (either works: only differences matter).
 */
export function findSpikes(xs: Float64Array, ys: Float64Array, values: Float64Array, options: SpikeOptions): SpikeResult {
  if (values.length !== xs.length) throw new Error("Each sounding needs one value");
  const minimumNeighbours = options.minimumNeighbours ?? 3;
  const grid = buildPointGrid(xs, ys, options.radius);
  let scratch = new Float64Array(64);
  let count = 0;
  const flagged: number[] = [];
  const differences: number[] = [];
  let unjudged = 0;
  for (let i = 0; i < xs.length; i++) {
    count = 0;
    forEachWithin(grid, xs[i], ys[i], options.radius, (j) => {
      if (j === i || Number.isNaN(values[j])) return;
      if (count === scratch.length) {
        const bigger = new Float64Array(scratch.length * 2);
        bigger.set(scratch);
        scratch = bigger;
      }
      scratch[count++] = values[j];
    });
    if (count < minimumNeighbours || Number.isNaN(values[i])) {
      unjudged++;
      continue;
    }
    const neighbours = scratch.subarray(0, count).sort();
    const median = count % 2 === 1 ? neighbours[(count - 1) / 2] : (neighbours[count / 2 - 1] + neighbours[count / 2]) / 2;
    const difference = values[i] - median;
    if (Math.abs(difference) > options.threshold) {
      flagged.push(i);
      differences.push(difference);
    }
  }
  return { indices: Uint32Array.from(flagged), differences: Float64Array.from(differences), unjudged };
}
