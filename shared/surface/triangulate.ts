import Delaunator from "delaunator";
import { permute, spatialOrder } from "./spatial-order";

/**
 * A survey's surface: the Delaunay triangulation (TIN) of its soundings.
 *
 * Coordinates are kept relative to an offset (the soundings' centroid). State-plane eastings and
 * northings run to millions of feet; subtracting them in the geometric predicates and plane
 * equations near the origin keeps about six more significant digits, so a survey gives the same
 * triangles and the same interpolated values wherever it sits on the map.
 */
export interface Tin {
  /** Vertex coordinates relative to (offsetX, offsetY), project length unit. */
  x: Float64Array;
  y: Float64Array;
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
 * hash keeps this O(n) for a million soundings.
 */
function mergeDuplicates(x: Float64Array, y: Float64Array, layers: Float64Array[], count: number) {
  let tableSize = 16;
  while (tableSize < count * 2) tableSize *= 2;
  const mask = tableSize - 1;
  const table = new Int32Array(tableSize).fill(-1);
  const hits = new Uint32Array(count);
  let unique = 0;
  for (let index = 0; index < count; index++) {
    const px = x[index] + 0; // +0 folds −0 into 0 so both hash alike
    const py = y[index] + 0;
    let slot = hashPosition(px, py) & mask;
    for (;;) {
      const found = table[slot];
      if (found < 0) {
        table[slot] = unique;
        x[unique] = px;
        y[unique] = py;
        for (const layer of layers) layer[unique] = layer[index];
        hits[unique] = 1;
        unique++;
        break;
      }
      if (x[found] === px && y[found] === py) {
        for (const layer of layers) layer[found] += layer[index];
        hits[found]++;
        break;
      }
      slot = (slot + 1) & mask;
    }
  }
  const duplicatesMerged = count - unique;
  if (duplicatesMerged === 0) return { x, y, layers, duplicatesMerged };
  const merged = layers.map((layer) => {
    const mean = layer.slice(0, unique);
    for (let index = 0; index < unique; index++) mean[index] /= hits[index];
    return mean;
  });
  return { x: x.slice(0, unique), y: y.slice(0, unique), layers: merged, duplicatesMerged };
}

function isUsable(easting: ArrayLike<number>, northing: ArrayLike<number>, layers: ReadonlyArray<ArrayLike<number>>, index: number) {
  if (!Number.isFinite(easting[index]) || !Number.isFinite(northing[index])) return false;
  for (const layer of layers) if (!Number.isFinite(layer[index])) return false;
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
  const total = easting.length;
  if (northing.length !== total || layers.some((layer) => layer.length !== total)) {
    throw new Error("easting, northing and every value layer must have the same length");
  }
  let sumX = 0;
  let sumY = 0;
  let valid = 0;
  for (let index = 0; index < total; index++) {
    if (isUsable(easting, northing, layers, index)) {
      sumX += easting[index];
      sumY += northing[index];
      valid++;
    }
  }
  const offsetX = valid > 0 ? sumX / valid : 0;
  const offsetY = valid > 0 ? sumY / valid : 0;
  const localX = new Float64Array(valid);
  const localY = new Float64Array(valid);
  const localLayers = layers.map(() => new Float64Array(valid));
  let kept = 0;
  for (let index = 0; index < total; index++) {
    if (isUsable(easting, northing, layers, index)) {
      localX[kept] = easting[index] - offsetX;
      localY[kept] = northing[index] - offsetY;
      for (let layer = 0; layer < layers.length; layer++) localLayers[layer][kept] = layers[layer][index];
      kept++;
    }
  }
  const deduplicated = mergeDuplicates(localX, localY, localLayers, valid);
  const order = spatialOrder(deduplicated.x, deduplicated.y);
  const merged = {
    x: permute(deduplicated.x, order),
    y: permute(deduplicated.y, order),
    layers: deduplicated.layers.map((layer) => permute(layer, order)),
    duplicatesMerged: deduplicated.duplicatesMerged,
  };
  const vertexCount = merged.x.length;
  const { x, y } = merged;
  let triangles: Uint32Array = new Uint32Array(0);
  let hull: Uint32Array = Uint32Array.from({ length: vertexCount }, (_, index) => index);
  let longTrianglesDropped = 0;

  if (vertexCount >= 3) {
    const coords = new Float64Array(vertexCount * 2);
    for (let index = 0; index < vertexCount; index++) {
      coords[2 * index] = x[index];
      coords[2 * index + 1] = y[index];
    }
    const delaunay = new Delaunator(coords);
    const all = delaunay.triangles;
    const maxEdgeSquared = options.maxEdge * options.maxEdge;
    const keptTriangles = all; // filtered in place: kept triangles never overtake the one being read
    let keptLength = 0;
    for (let corner = 0; corner < all.length; corner += 3) {
      const a = all[corner];
      const b = all[corner + 1];
      const c = all[corner + 2];
      const ab = (x[b] - x[a]) ** 2 + (y[b] - y[a]) ** 2;
      const bc = (x[c] - x[b]) ** 2 + (y[c] - y[b]) ** 2;
      const ca = (x[a] - x[c]) ** 2 + (y[a] - y[c]) ** 2;
      if (ab <= maxEdgeSquared && bc <= maxEdgeSquared && ca <= maxEdgeSquared) {
        // Delaunator winds counter-clockwise on screen (y down); with northing up that is clockwise,
        // so b and c swap to give counter-clockwise triangles in the project's frame.
        keptTriangles[keptLength++] = a;
        keptTriangles[keptLength++] = c;
        keptTriangles[keptLength++] = b;
      }
    }
    triangles = inSpatialOrder(keptTriangles.subarray(0, keptLength), vertexCount);
    hull = Uint32Array.from(delaunay.hull).reverse(); // counter-clockwise with northing up, as above
    longTrianglesDropped = (all.length - keptLength) / 3;
  }
  return merged.layers.map((z) => ({
    x,
    y,
    z,
    offsetX,
    offsetY,
    triangles,
    hull,
    duplicatesMerged: merged.duplicatesMerged,
    invalidSkipped: total - valid,
    longTrianglesDropped,
  }));
}

/**
 * Delaunator emits triangles in the order it built them, spiralling out from a seed. Ordering them
 * by their lowest vertex (vertices are already in Z order) lets the raster fill write the raster
 * row by row nearby instead of jumping across it. A counting sort: linear time.
 */
function inSpatialOrder(triangles: Uint32Array, vertexCount: number): Uint32Array {
  const triangleCount = triangles.length / 3;
  const starts = new Uint32Array(vertexCount + 1);
  const lowest = new Uint32Array(triangleCount);
  for (let triangle = 0; triangle < triangleCount; triangle++) {
    const corner = 3 * triangle;
    const vertex = Math.min(triangles[corner], triangles[corner + 1], triangles[corner + 2]);
    lowest[triangle] = vertex;
    starts[vertex + 1]++;
  }
  for (let vertex = 0; vertex < vertexCount; vertex++) starts[vertex + 1] += starts[vertex];
  const sorted = new Uint32Array(triangles.length);
  for (let triangle = 0; triangle < triangleCount; triangle++) {
    const target = 3 * starts[lowest[triangle]]++;
    sorted[target] = triangles[3 * triangle];
    sorted[target + 1] = triangles[3 * triangle + 1];
    sorted[target + 2] = triangles[3 * triangle + 2];
  }
  return sorted;
}

/** The hull as a closed ring in project coordinates (the default work limit when none is drawn). */
export function hullRing(tin: Tin): Array<[number, number]> {
  const ring: Array<[number, number]> = [];
  for (const vertex of tin.hull) ring.push([tin.x[vertex] + tin.offsetX, tin.y[vertex] + tin.offsetY]);
  if (ring.length > 0) ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Plan area of the kept triangles (project length unit squared). */
export function tinArea(tin: Tin): number {
  let twiceArea = 0;
  const { x, y, triangles } = tin;
  for (let corner = 0; corner < triangles.length; corner += 3) {
    const a = triangles[corner];
    const b = triangles[corner + 1];
    const c = triangles[corner + 2];
    twiceArea += (x[b] - x[a]) * (y[c] - y[a]) - (x[c] - x[a]) * (y[b] - y[a]);
  }
  return twiceArea / 2;
}
