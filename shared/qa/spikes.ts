import { buildPointGrid } from "./point-grid";

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
  indices: Uint32Array<ArrayBuffer>;
  /** value − median of neighbours, for each flagged sounding. */
  differences: Float64Array<ArrayBuffer>;
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
  const { minX, minY, bucketSize, bucketCols, bucketRows, start, order } = grid;
  const radiusSquared = options.radius * options.radius;
  // Copies in bucket order: consecutive soundings then have their neighbours in the same few
  // buckets, so the scan reads memory in sequence (several times faster at a million soundings).
  const n = xs.length;
  const sortedX = new Float64Array(n);
  const sortedY = new Float64Array(n);
  const sortedValue = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    sortedX[k] = xs[order[k]];
    sortedY[k] = ys[order[k]];
    sortedValue[k] = values[order[k]];
  }
  let scratch = new Float64Array(64);
  const flaggedMask = new Uint8Array(n);
  const differenceOf = new Float64Array(n);
  let unjudged = 0;
  for (let k = 0; k < n; k++) {
    const x = sortedX[k];
    const y = sortedY[k];
    const value = sortedValue[k];
    if (Number.isNaN(value)) {
      unjudged++;
      continue;
    }
    const colFrom = Math.max(0, Math.floor((x - options.radius - minX) / bucketSize));
    const colTo = Math.min(bucketCols - 1, Math.floor((x + options.radius - minX) / bucketSize));
    const rowFrom = Math.max(0, Math.floor((y - options.radius - minY) / bucketSize));
    const rowTo = Math.min(bucketRows - 1, Math.floor((y + options.radius - minY) / bucketSize));
    let count = 0;
    for (let row = rowFrom; row <= rowTo; row++) {
      // Buckets of one row are contiguous in the bucket order.
      const from = start[row * bucketCols + colFrom];
      const to = start[row * bucketCols + colTo + 1];
      for (let m = from; m < to; m++) {
        if (m === k) continue;
        const dx = sortedX[m] - x;
        const dy = sortedY[m] - y;
        if (dx * dx + dy * dy > radiusSquared || Number.isNaN(sortedValue[m])) continue;
        if (count === scratch.length) {
          const bigger = new Float64Array(scratch.length * 2);
          bigger.set(scratch);
          scratch = bigger;
        }
        scratch[count++] = sortedValue[m];
      }
    }
    if (count < minimumNeighbours) {
      unjudged++;
      continue;
    }
    const difference = value - medianOfFirst(scratch, count);
    if (Math.abs(difference) > options.threshold) {
      flaggedMask[order[k]] = 1;
      differenceOf[order[k]] = difference;
    }
  }
  const flagged: number[] = [];
  const differences: number[] = [];
  for (let i = 0; i < n; i++) {
    if (flaggedMask[i]) {
      flagged.push(i);
      differences.push(differenceOf[i]);
    }
  }
  return { indices: Uint32Array.from(flagged), differences: Float64Array.from(differences), unjudged };
}

/** Median of values[0 … count − 1] (reorders them): insertion sort, as neighbour counts are small. */
function medianOfFirst(values: Float64Array, count: number): number {
  for (let i = 1; i < count; i++) {
    const value = values[i];
    let j = i - 1;
    while (j >= 0 && values[j] > value) {
      values[j + 1] = values[j];
      j--;
    }
    values[j + 1] = value;
  }
  return count % 2 === 1 ? values[(count - 1) / 2] : (values[count / 2 - 1] + values[count / 2]) / 2;
}
