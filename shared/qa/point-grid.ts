/**
 * A uniform-grid spatial index over soundings held in flat arrays: each bucket lists the
 * soundings whose position falls in it (counting sort, so building is O(n) and the index is two
 * typed arrays). Good for radius queries when the radius is about one bucket.
 */
export interface PointGrid {
  xs: Float64Array;
  ys: Float64Array;
  minX: number;
  minY: number;
  bucketSize: number;
  bucketCols: number;
  bucketRows: number;
  /** Soundings of bucket b are order[start[b]] … order[start[b + 1] − 1]. */
  start: Uint32Array;
  order: Uint32Array;
}

export function buildPointGrid(xs: Float64Array, ys: Float64Array, bucketSize: number): PointGrid {
  if (xs.length !== ys.length) throw new Error("Eastings and northings differ in length");
  if (!(bucketSize > 0)) throw new Error("The index bucket size must be positive");
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < xs.length; i++) {
    if (xs[i] < minX) minX = xs[i];
    if (xs[i] > maxX) maxX = xs[i];
    if (ys[i] < minY) minY = ys[i];
    if (ys[i] > maxY) maxY = ys[i];
  }
  if (xs.length === 0) minX = minY = maxX = maxY = 0;
  // Cap the bucket count so a tiny radius over a wide survey cannot exhaust memory.
  let size = bucketSize;
  while (((maxX - minX) / size + 1) * ((maxY - minY) / size + 1) > 4 * xs.length + 1024) size *= 2;
  const bucketCols = Math.floor((maxX - minX) / size) + 1;
  const bucketRows = Math.floor((maxY - minY) / size) + 1;
  const bucketOf = new Uint32Array(xs.length);
  const start = new Uint32Array(bucketCols * bucketRows + 1);
  for (let i = 0; i < xs.length; i++) {
    const bucket = Math.floor((ys[i] - minY) / size) * bucketCols + Math.floor((xs[i] - minX) / size);
    bucketOf[i] = bucket;
    start[bucket + 1]++;
  }
  for (let b = 0; b < bucketCols * bucketRows; b++) start[b + 1] += start[b];
  const fill = start.slice(0, bucketCols * bucketRows);
  const order = new Uint32Array(xs.length);
  for (let i = 0; i < xs.length; i++) order[fill[bucketOf[i]]++] = i;
  return { xs, ys, minX, minY, bucketSize: size, bucketCols, bucketRows, start, order };
}

/** Calls `visit(j, distanceSquared)` for every sounding within `radius` of (x, y). */
export function forEachWithin(
  grid: PointGrid,
  x: number,
  y: number,
  radius: number,
  visit: (index: number, distanceSquared: number) => void,
): void {
  const { xs, ys, minX, minY, bucketSize, bucketCols, bucketRows, start, order } = grid;
  const colFrom = Math.max(0, Math.floor((x - radius - minX) / bucketSize));
  const colTo = Math.min(bucketCols - 1, Math.floor((x + radius - minX) / bucketSize));
  const rowFrom = Math.max(0, Math.floor((y - radius - minY) / bucketSize));
  const rowTo = Math.min(bucketRows - 1, Math.floor((y + radius - minY) / bucketSize));
  const radiusSquared = radius * radius;
  for (let row = rowFrom; row <= rowTo; row++) {
    for (let col = colFrom; col <= colTo; col++) {
      const bucket = row * bucketCols + col;
      for (let k = start[bucket]; k < start[bucket + 1]; k++) {
        const j = order[k];
        const dx = xs[j] - x;
        const dy = ys[j] - y;
        const distanceSquared = dx * dx + dy * dy;
        if (distanceSquared <= radiusSquared) visit(j, distanceSquared);
      }
    }
  }
}
