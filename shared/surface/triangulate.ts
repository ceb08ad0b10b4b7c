import Delaunator from "delaunator";
import { spatialOrder } from "./spatial-order";

/**
 * A survey's surface: the Delaunay triangulation (TIN) of its soundings.
 *
 * Coordinates are kept relative to an offset (the soundings' centroid). State-plane eastings and
 * northings run to millions of feet; subtracting them in the geometric predicates and plane
 * equations near the origin keeps about six more significant digits, so a survey gives the same
 * triangles and the same interpolated values wherever it sits on the map.
 *
 * Vertices are stored in Z order (neighbours on the ground are neighbours in memory) and their
 * coordinates interleaved [x0, y0, x1, y1, …], the layout Delaunator itself works on, so the
 * positions are held once.
 */
export interface Tin {
  /** Interleaved vertex coordinates relative to (offsetX, offsetY), project length unit. */
  xy: Float64Array;
  /** Vertex elevation (duplicates averaged). */
  z: Float64Array;
  offsetX: number;
  offsetY: number;
  /** Kept triangles, three vertex indices each, counter-clockwise. */
  triangles: Uint32Array;
  /** Convex hull of all vertices, counter-clockwise vertex indices (before any long edge is dropped). */
  hull: Uint32Array;
  /** Soundings that fell on an earlier sounding's exact position and were averaged into it. */
  duplicatesMerged: number;
  /** Soundings left out because a coordinate or the elevation was not a finite number. */
  invalidSkipped: number;
  /** Triangles removed because an edge was longer than the maximum edge. */
  longTrianglesDropped: number;
}

export interface TriangulateOptions {
  /** Triangles with any edge longer than this (project length unit) are dropped: no surface is invented across a data gap. */
  maxEdge: number;
}

/** Number of vertices of a TIN. */
export function vertexCount(tin: Tin): number {
  return tin.xy.length / 2;
}

const hashScratch = new Float64Array(2);
const hashWords = new Uint32Array(hashScratch.buffer);

function hashPosition(x: number, y: number): number {
  hashScratch[0] = x;
  hashScratch[1] = y;
  // Multiplicative mixing of the four 32-bit words (the constants are odd, well-spread primes).
  let hash = Math.imul(hashWords[0] ^ 0x9e3779b9, 0x85ebca6b);
  hash = Math.imul(hash ^ hashWords[1] ^ (hash >>> 15), 0xc2b2ae35);
  hash = Math.imul(hash ^ hashWords[2] ^ (hash >>> 13), 0x27d4eb2f);
  hash = Math.imul(hash ^ hashWords[3] ^ (hash >>> 16), 0x165667b1);
  return (hash ^ (hash >>> 15)) >>> 0;
}

/**
 * Soundings at exactly the same position (a repeated fix, a file appended to itself) cannot both be
 * triangle corners; they become one vertex with the mean of each value layer. An open-addressing
 * hash keeps this O(n) for a million soundings. Works in place on the interleaved coordinates and
 * keeps the first occurrence's place, so the Z order survives.
 */
function mergeDuplicates(xy: Float64Array, layers: Float64Array[], count: number) {
  let tableSize = 16;
  while (tableSize < count * 2) tableSize *= 2;
  const mask = tableSize - 1;
  const table = new Int32Array(tableSize).fill(-1);
  let hits: Uint32Array | null = null; // allocated at the first duplicate: most surveys have none
  const layerCount = layers.length;
  let unique = 0;
  for (let index = 0; index < count; index++) {
    const px = xy[2 * index] + 0; // +0 folds −0 into 0 so both hash alike
    const py = xy[2 * index + 1] + 0;
    let slot = hashPosition(px, py) & mask;
    for (;;) {
      const found = table[slot];
      if (found < 0) {
        table[slot] = unique;
        xy[2 * unique] = px;
        xy[2 * unique + 1] = py;
        for (let layer = 0; layer < layerCount; layer++) layers[layer][unique] = layers[layer][index];
        if (hits !== null) hits[unique] = 1;
        unique++;
        break;
      }
      if (xy[2 * found] === px && xy[2 * found + 1] === py) {
        if (hits === null) {
          hits = new Uint32Array(count).fill(1);
        }
        for (let layer = 0; layer < layerCount; layer++) layers[layer][found] += layers[layer][index];
        hits[found]++;
        break;
      }
      slot = (slot + 1) & mask;
    }
  }
  const duplicatesMerged = count - unique;
  if (duplicatesMerged === 0 || hits === null) return { xy, layers, duplicatesMerged };
  const counts = hits;
  const merged = layers.map((layer) => {
    const mean = layer.slice(0, unique);
    for (let index = 0; index < unique; index++) mean[index] /= counts[index];
    return mean;
  });
  return { xy: xy.slice(0, 2 * unique), layers: merged, duplicatesMerged };
}

/**
 * True when `layer` is a finite number exactly where `reference` is: the two can then share one
 * `triangulateLayers` call without either losing soundings to the other's gaps.
 */
export function finiteAlike(reference: ArrayLike<number>, layer: ArrayLike<number>): boolean {
  if (reference.length !== layer.length) return false;
  for (let index = 0; index < reference.length; index++) {
    if (Number.isFinite(reference[index]) !== Number.isFinite(layer[index])) return false;
  }
  return true;
}

/** One survey, one elevation per sounding. */
export function triangulate(
  easting: ArrayLike<number>,
  northing: ArrayLike<number>,
  elevation: ArrayLike<number>,
  options: TriangulateOptions,
): Tin {
  return triangulateLayers(easting, northing, [elevation], options)[0];
}

/**
 * Several value layers on the same soundings (a baseline's bottom and its probe refusal) share one
 * triangulation: the positions decide the triangles, so it is built once. A sounding is used only
 * where its position and every layer are finite numbers.
 */
export function triangulateLayers(
  easting: ArrayLike<number>,
  northing: ArrayLike<number>,
  layers: ReadonlyArray<ArrayLike<number>>,
  options: TriangulateOptions,
): Tin[] {
  return triangulateVertices(prepareVertices(easting, northing, layers), options);
}

/**
 * The soundings made ready for triangulation: usable ones only, offset to their centroid, in Z
 * order, duplicates merged. Split from `triangulateVertices` so a caller short of memory (a worker
 * thread holding a million soundings) can let the input columns go before Delaunator allocates.
 */
export interface PreparedVertices {
  xy: Float64Array;
  layers: Float64Array[];
  offsetX: number;
  offsetY: number;
  duplicatesMerged: number;
  invalidSkipped: number;
}

/**
 * From this many usable soundings in a survey, its soundings and triangles are put in Z order.
 * Below it everything the triangulation and the raster fill touch fits in the processor's cache,
 * and the ordering costs more than it saves. Measured with the command line on parts of the
 * engine-files bay (one thread, median of 8, 2026-12-03, load average about 1): at 20,000
 * soundings a survey the spring basin took 308 ms unordered against 337 ms ordered, at 50,000
 * 759 against 805 ms, at 100,000 1,017 against 953 ms, at 1,000,000 3.2 against 2.6 s. The
 * figures are the same either way: Delaunay triangles depend on positions only.
 */
export const spatialOrderFrom = 64_000;

export function prepareVertices(
  easting: ArrayLike<number>,
  northing: ArrayLike<number>,
  layers: ReadonlyArray<ArrayLike<number>>,
): PreparedVertices {
  const total = easting.length;
  if (northing.length !== total || layers.some((layer) => layer.length !== total)) {
    throw new Error("easting, northing and every value layer must have the same length");
  }
  let sumX = 0;
  let sumY = 0;
  const usable = new Uint32Array(total);
  let valid = 0;
  const layerCount = layers.length;
  for (let index = 0; index < total; index++) {
    const x = easting[index];
    const y = northing[index];
    // Usable: the position and every layer finite (x − x is 0 only for a finite x).
    let usableHere = x - x === 0 && y - y === 0;
    for (let layer = 0; usableHere && layer < layerCount; layer++) {
      const value = layers[layer][index];
      usableHere = value - value === 0;
    }
    if (usableHere) {
      sumX += x;
      sumY += y;
      usable[valid++] = index;
    }
  }
  const offsetX = valid > 0 ? sumX / valid : 0;
  const offsetY = valid > 0 ? sumY / valid : 0;
  // Copy the usable soundings straight into Z order (merging duplicates keeps that order); a
  // small survey is copied as it came (see `spatialOrderFrom`).
  const order = valid >= spatialOrderFrom ? spatialOrder(easting, northing, usable.subarray(0, valid)) : usable.subarray(0, valid);
  const localXY = new Float64Array(2 * valid);
  const localLayers = layers.map(() => new Float64Array(valid));
  for (let kept = 0; kept < valid; kept++) {
    const index = order[kept];
    localXY[2 * kept] = easting[index] - offsetX;
    localXY[2 * kept + 1] = northing[index] - offsetY;
  }
  for (let layer = 0; layer < layerCount; layer++) {
    const from = layers[layer];
    const to = localLayers[layer];
    for (let kept = 0; kept < valid; kept++) to[kept] = from[order[kept]];
  }
  const merged = mergeDuplicates(localXY, localLayers, valid);
  return { xy: merged.xy, layers: merged.layers, offsetX, offsetY, duplicatesMerged: merged.duplicatesMerged, invalidSkipped: total - valid };
}

export function triangulateVertices(prepared: PreparedVertices, options: TriangulateOptions): Tin[] {
  const { xy, offsetX, offsetY } = prepared;
  const count = xy.length / 2;
  let triangles: Uint32Array = new Uint32Array(0);
  let hull: Uint32Array = Uint32Array.from({ length: count }, (_, index) => index);
  let longTrianglesDropped = 0;

  if (count >= 3) {
    const delaunay = new Delaunator(xy);
    const all = delaunay.triangles;
    const maxEdgeSquared = options.maxEdge * options.maxEdge;
    let keptLength = 0;
    for (let corner = 0; corner < all.length; corner += 3) {
      const a = all[corner];
      const b = all[corner + 1];
      const c = all[corner + 2];
      const ax = xy[2 * a], ay = xy[2 * a + 1];
      const bx = xy[2 * b], by = xy[2 * b + 1];
      const cx = xy[2 * c], cy = xy[2 * c + 1];
      const ab = (bx - ax) ** 2 + (by - ay) ** 2;
      const bc = (cx - bx) ** 2 + (cy - by) ** 2;
      const ca = (ax - cx) ** 2 + (ay - cy) ** 2;
      if (ab <= maxEdgeSquared && bc <= maxEdgeSquared && ca <= maxEdgeSquared) {
        // Filtered in place (the write position never passes the read position). Delaunator winds
        // counter-clockwise on screen (y down); with northing up that is clockwise, so b and c
        // swap to give counter-clockwise triangles in the project's frame.
        all[keptLength++] = a;
        all[keptLength++] = c;
        all[keptLength++] = b;
      }
    }
    // Delaunator's half-edge array is not needed; its buffer (as large as the triangles) receives the sorted copy.
    const spare = new Uint32Array(delaunay.halfedges.buffer, delaunay.halfedges.byteOffset, keptLength);
    triangles = count >= spatialOrderFrom ? inSpatialOrder(all.subarray(0, keptLength), count, spare) : all.subarray(0, keptLength);
    hull = Uint32Array.from(delaunay.hull).reverse(); // counter-clockwise with northing up, as above
    longTrianglesDropped = (all.length - keptLength) / 3;
  }
  return prepared.layers.map((z) => ({
    xy,
    z,
    offsetX,
    offsetY,
    triangles,
    hull,
    duplicatesMerged: prepared.duplicatesMerged,
    invalidSkipped: prepared.invalidSkipped,
    longTrianglesDropped,
  }));
}

/**
 * Delaunator emits triangles in the order it built them, spiralling out from a seed. Ordering them
 * by their lowest vertex (vertices are already in Z order) lets the raster fill write nearby
 * raster rows instead of jumping across the raster. A counting sort: linear time, written into
 * `output` (same length), which is returned.
 */
function inSpatialOrder(triangles: Uint32Array, vertexTotal: number, output: Uint32Array): Uint32Array {
  const triangleCount = triangles.length / 3;
  const starts = new Uint32Array(vertexTotal + 1);
  for (let corner = 0; corner < triangles.length; corner += 3) {
    starts[Math.min(triangles[corner], triangles[corner + 1], triangles[corner + 2]) + 1]++;
  }
  for (let vertex = 0; vertex < vertexTotal; vertex++) starts[vertex + 1] += starts[vertex];
  for (let triangle = 0; triangle < triangleCount; triangle++) {
    const corner = 3 * triangle;
    const a = triangles[corner], b = triangles[corner + 1], c = triangles[corner + 2];
    const target = 3 * starts[Math.min(a, b, c)]++;
    output[target] = a;
    output[target + 1] = b;
    output[target + 2] = c;
  }
  return output;
}

/** The hull as a closed ring in project coordinates (the default work limit when none is drawn). */
export function hullRing(tin: Tin): Array<[number, number]> {
  const ring: Array<[number, number]> = [];
  for (const vertex of tin.hull) ring.push([tin.xy[2 * vertex] + tin.offsetX, tin.xy[2 * vertex + 1] + tin.offsetY]);
  if (ring.length > 0) ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Plan area of the kept triangles (project length unit squared). */
export function tinArea(tin: Tin): number {
  let twiceArea = 0;
  const { xy, triangles } = tin;
  for (let corner = 0; corner < triangles.length; corner += 3) {
    const a = 2 * triangles[corner];
    const b = 2 * triangles[corner + 1];
    const c = 2 * triangles[corner + 2];
    twiceArea += (xy[b] - xy[a]) * (xy[c + 1] - xy[a + 1]) - (xy[c] - xy[a]) * (xy[b + 1] - xy[a + 1]);
  }
  return twiceArea / 2;
}
