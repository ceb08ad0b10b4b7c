// The reference pipeline of the end-to-end engine bench (tests/bench/engine-files.ts): the same
// job as `firmsand volumes` on the same files, written only from general-purpose packages and
// plain loops, as lean as we know how, so the bench can say how far Firmsand's own path is from it.
// Plain JavaScript (nothing to compile at start). It does at least the work of the command line:
//   parse     the two sounding CSVs, byte by byte (no strings per cell)
//   project   the lon/lat work limit into the CRS with one reused proj4 converter (and the bands back)
//   triangulate  each survey with delaunator; triangles with an edge over --max-edge dropped
//   rasterise  each surface (baseline bottom, firm sand from the probe, progress bottom) by scanline,
//             node at each pixel's centre, clipped to the limit by a scanline fill of the polygon
//   aggregate  per cell of --cell-size: planned, removed, deposited, remaining, coverage, status
//   bands     remaining-thickness bands with d3-contour, as GeoJSON in lon/lat, gzipped
//   output    the per-cell figures as JSON on stdout (the bands to --bands-out, default discarded)
// Stage times (ms) go to stderr as one JSON line, for the bench to print.
//
//   node tests/bench/engine-files/reference.mjs --crs EPSG:2237 --units us-ft --before b.csv --after a.csv --limit l.geojson
//     --cell-size 15 --resolution 1 --max-edge 50 --tolerance 0.25 [--bands-out FILE]
import { readFileSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { gzipSync } from "node:zlib";
import Delaunator from "delaunator";
import { contours } from "d3-contour";
import proj4 from "proj4";

const stages = {};
let last = performance.now();
const stage = (name) => {
  const now = performance.now();
  stages[name] = (stages[name] ?? 0) + now - last;
  last = now;
};

const options = {};
const argv = process.argv.slice(2);
for (let index = 0; index < argv.length; index += 2) options[argv[index].replace(/^--/, "")] = argv[index + 1];
const cellSize = Number(options["cell-size"]);
const resolution = Number(options.resolution);
const maxEdge = Number(options["max-edge"]);
const tolerance = Number(options.tolerance);
const feet = options.units !== "m";
// Cubic yards for feet (27 ft³; a US survey foot is 1200/3937 m against 0.3048 m for the international foot), m³ for metres.
const usFoot = 1200 / 3937;
const toVolume = options.units === "m" ? 1 : options.units === "us-ft" ? (usFoot / 0.3048) ** 3 / 27 : 1 / 27;

// ---- parse: bytes → Float64Array columns -------------------------------------------------------
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

function parseCsv(file, wanted) {
  const bytes = readFileSync(file);
  let position = 0;
  while (position < bytes.length && bytes[position] !== 10) position++;
  const header = bytes.toString("latin1", 0, position).replace(/\r$/, "").split(",").map((name) => name.trim().toLowerCase());
  const columnOf = wanted.map((name) => header.indexOf(name));
  const slotOf = new Int32Array(header.length).fill(-1);
  columnOf.forEach((column, slot) => column >= 0 && (slotOf[column] = slot));
  let capacity = 1 << 16;
  let columns = wanted.map(() => new Float64Array(capacity));
  let rows = 0;
  position++;
  while (position < bytes.length) {
    if (rows === capacity) {
      capacity *= 2;
      columns = columns.map((column) => {
        const grown = new Float64Array(capacity);
        grown.set(column);
        return grown;
      });
    }
    let column = 0;
    let blank = true;
    for (;;) {
      // One field: sign, digits, point, digits; anything else goes through Number().
      const start = position;
      let negative = false;
      let mantissa = 0;
      let digits = 0;
      let fraction = 0;
      let afterPoint = false;
      let plain = true;
      let byte = bytes[position];
      if (byte === 45 || byte === 43) {
        negative = byte === 45;
        byte = bytes[++position];
      }
      while (position < bytes.length && byte !== 44 && byte !== 10 && byte !== 13) {
        if (byte >= 48 && byte <= 57) {
          mantissa = mantissa * 10 + (byte - 48);
          digits++;
          if (afterPoint) fraction++;
        } else if (byte === 46 && !afterPoint) afterPoint = true;
        else plain = false;
        byte = bytes[++position];
      }
      let value;
      if (position === start) value = Number.NaN;
      else if (plain && digits > 0 && digits <= 15 && fraction <= 22) value = (negative ? -mantissa : mantissa) / POW10[fraction];
      else value = Number(bytes.toString("latin1", start, position).trim() || "x");
      if (position > start) blank = false;
      const slot = column < slotOf.length ? slotOf[column] : -1;
      if (slot >= 0) columns[slot][rows] = value;
      column++;
      if (byte === 44) {
        position++;
        continue;
      }
      if (byte === 13) position++;
      position++;
      break;
    }
    if (!blank) {
      for (let slot = 0; slot < columns.length; slot++) if (columnOf[slot] >= column) columns[slot][rows] = Number.NaN;
      rows++;
    }
  }
  return { rows, columns: columns.map((column) => column.subarray(0, rows)) };
}

const before = parseCsv(options.before, ["easting", "northing", "depth", "probe"]);
const after = parseCsv(options.after, ["easting", "northing", "depth"]);
stage("parse");

// ---- project: the work limit into the CRS ------------------------------------------------------
const code = /^EPSG:(\d+)$/i.exec(options.crs)[1];
const require = createRequire(import.meta.url);
const definition = JSON.parse(readFileSync(join(dirname(require.resolve("epsg-index/package.json")), "s", `${code}.json`), "utf8")).proj4;
const converter = proj4("+proj=longlat +datum=WGS84 +no_defs", definition);
const limitJson = JSON.parse(readFileSync(options.limit, "utf8"));
const limitGeometry = limitJson.type === "Feature" ? limitJson.geometry : limitJson;
const limitPolygons = (limitGeometry.type === "Polygon" ? [limitGeometry.coordinates] : limitGeometry.coordinates).map((polygon) =>
  polygon.map((ring) => ring.map((position) => converter.forward([position[0], position[1]]))),
);
let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
for (const polygon of limitPolygons) for (const [x, y] of polygon[0]) {
  if (x < minX) minX = x;
  if (y < minY) minY = y;
  if (x > maxX) maxX = x;
  if (y > maxY) maxY = y;
}
stage("project");

// ---- grids: cells from the limit's south-west corner, the raster aligned with them ---------------
const cellCols = Math.ceil((maxX - minX) / cellSize - 1e-9);
const cellRows = Math.ceil((maxY - minY) / cellSize - 1e-9);
const cols = Math.ceil((maxX - minX) / resolution - 1e-9);
const rows = Math.ceil((maxY - minY) / resolution - 1e-9);
const nodes = cols * rows;
// Mask by scanline: each node row's crossings with every ring's edges, filled even-odd.
const mask = new Uint8Array(nodes);
{
  const edges = [];
  for (const polygon of limitPolygons) for (const ring of polygon) for (let index = 0; index + 1 < ring.length; index++) edges.push(ring[index], ring[index + 1]);
  const crossings = [];
  for (let row = 0; row < rows; row++) {
    const y = minY + (row + 0.5) * resolution;
    crossings.length = 0;
    for (let index = 0; index < edges.length; index += 2) {
      const [ax, ay] = edges[index];
      const [bx, by] = edges[index + 1];
      if ((ay > y) !== (by > y)) crossings.push(ax + ((y - ay) * (bx - ax)) / (by - ay));
    }
    crossings.sort((a, b) => a - b);
    for (let index = 0; index + 1 < crossings.length; index += 2) {
      const from = Math.max(0, Math.ceil((crossings[index] - minX) / resolution - 0.5));
      const to = Math.min(cols - 1, Math.floor((crossings[index + 1] - minX) / resolution - 0.5));
      mask.fill(1, row * cols + from, row * cols + to + 1);
    }
  }
}
stage("grids");

// ---- triangulate + rasterise ------------------------------------------------------------------
function triangulate(easting, northing) {
  const count = easting.length;
  const coords = new Float64Array(2 * count);
  for (let index = 0; index < count; index++) {
    coords[2 * index] = easting[index] - minX;
    coords[2 * index + 1] = northing[index] - minY;
  }
  const { triangles } = new Delaunator(coords);
  // Drop triangles with an edge longer than maxEdge (gaps in coverage stay gaps).
  const kept = new Uint32Array(triangles.length);
  let length = 0;
  const limit = maxEdge * maxEdge;
  for (let corner = 0; corner < triangles.length; corner += 3) {
    const a = triangles[corner], b = triangles[corner + 1], c = triangles[corner + 2];
    const abx = coords[2 * b] - coords[2 * a], aby = coords[2 * b + 1] - coords[2 * a + 1];
    const bcx = coords[2 * c] - coords[2 * b], bcy = coords[2 * c + 1] - coords[2 * b + 1];
    const cax = coords[2 * a] - coords[2 * c], cay = coords[2 * a + 1] - coords[2 * c + 1];
    if (abx * abx + aby * aby > limit || bcx * bcx + bcy * bcy > limit || cax * cax + cay * cay > limit) continue;
    kept[length++] = a;
    kept[length++] = b;
    kept[length++] = c;
  }
  return { coords, triangles: kept.subarray(0, length) };
}

function rasterise(tin, z) {
  const { coords, triangles } = tin;
  const values = new Float64Array(nodes).fill(Number.NaN);
  for (let corner = 0; corner < triangles.length; corner += 3) {
    const a = triangles[corner], b = triangles[corner + 1], c = triangles[corner + 2];
    const ax = coords[2 * a], ay = coords[2 * a + 1], az = z[a];
    const bx = coords[2 * b], by = coords[2 * b + 1], bz = z[b];
    const cx = coords[2 * c], cy = coords[2 * c + 1], cz = z[c];
    const det = (bx - ax) * (cy - ay) - (cx - ax) * (by - ay);
    if (det === 0) continue;
    const gx = ((bz - az) * (cy - ay) - (cz - az) * (by - ay)) / det;
    const gy = ((bx - ax) * (cz - az) - (cx - ax) * (bz - az)) / det;
    const rowFrom = Math.max(0, Math.ceil(Math.min(ay, by, cy) / resolution - 0.5 - 1e-9));
    const rowTo = Math.min(rows - 1, Math.floor(Math.max(ay, by, cy) / resolution - 0.5 + 1e-9));
    for (let row = rowFrom; row <= rowTo; row++) {
      const y = (row + 0.5) * resolution;
      let left = Infinity, right = -Infinity;
      if ((ay - y) * (by - y) <= 0 && ay !== by) { const x = ax + ((y - ay) * (bx - ax)) / (by - ay); if (x < left) left = x; if (x > right) right = x; }
      if ((by - y) * (cy - y) <= 0 && by !== cy) { const x = bx + ((y - by) * (cx - bx)) / (cy - by); if (x < left) left = x; if (x > right) right = x; }
      if ((cy - y) * (ay - y) <= 0 && cy !== ay) { const x = cx + ((y - cy) * (ax - cx)) / (ay - cy); if (x < left) left = x; if (x > right) right = x; }
      if (left > right) continue;
      const colFrom = Math.max(0, Math.ceil(left / resolution - 0.5 - 1e-9));
      const colTo = Math.min(cols - 1, Math.floor(right / resolution - 0.5 + 1e-9));
      const base = az + gy * (y - ay) - gx * ax;
      const offset = row * cols;
      for (let col = colFrom; col <= colTo; col++) if (mask[offset + col] === 1) values[offset + col] = base + gx * (col + 0.5) * resolution;
    }
  }
  return values;
}

const negate = (column) => {
  const out = new Float64Array(column.length);
  for (let index = 0; index < column.length; index++) out[index] = -column[index];
  return out;
};
const [beforeEasting, beforeNorthing, beforeDepth, beforeProbe] = before.columns;
const [afterEasting, afterNorthing, afterDepth] = after.columns;
const beforeTin = triangulate(beforeEasting, beforeNorthing);
stage("triangulate");
const muckTop = rasterise(beforeTin, negate(beforeDepth));
const firm = rasterise(beforeTin, negate(beforeProbe));
stage("rasterise");
const afterTin = triangulate(afterEasting, afterNorthing);
stage("triangulate");
const latest = rasterise(afterTin, negate(afterDepth));
stage("rasterise");

// ---- aggregate per cell -----------------------------------------------------------------------
const cellCount = cellCols * cellRows;
const inLimit = new Uint32Array(cellCount), surveyed = new Uint32Array(cellCount), atFirm = new Uint32Array(cellCount);
const planned = new Float64Array(cellCount), removed = new Float64Array(cellCount), deposited = new Float64Array(cellCount), remaining = new Float64Array(cellCount);
const thickness = new Float64Array(nodes).fill(-1); // for the bands: −1 where nothing is known
const nodesPerCell = cellSize / resolution;
for (let row = 0; row < rows; row++) {
  const cellRowBase = Math.min(cellRows - 1, Math.floor((row + 0.5) / nodesPerCell)) * cellCols;
  for (let col = 0; col < cols; col++) {
    const node = row * cols + col;
    if (mask[node] === 0) continue;
    const cell = cellRowBase + Math.min(cellCols - 1, Math.floor((col + 0.5) / nodesPerCell));
    inLimit[cell]++;
    const top = muckTop[node], sand = firm[node], to = latest[node];
    if (top !== top || sand !== sand || to !== to) continue;
    surveyed[cell]++;
    if (top > sand) planned[cell] += top - sand;
    if (top > to) removed[cell] += top - to;
    else deposited[cell] += to - top;
    const left = to - sand;
    if (left > 0) remaining[cell] += left;
    if (left <= tolerance) atFirm[cell]++;
    thickness[node] = left > 0 ? left : 0;
  }
}
const pixel = resolution * resolution;
const parts = [];
const totals = { plannedVolume: 0, removedVolume: 0, depositedVolume: 0, remainingVolume: 0, cells: 0, cellsAtFirmSand: 0 };
for (let cell = 0; cell < cellCount; cell++) {
  if (inLimit[cell] === 0) continue;
  const coverage = surveyed[cell] / inLimit[cell];
  const firmShare = surveyed[cell] > 0 ? atFirm[cell] / surveyed[cell] : Number.NaN;
  const meanRemoved = surveyed[cell] > 0 ? removed[cell] / surveyed[cell] : 0;
  const status = !(coverage >= 0.8) || coverage === 0 ? "no-data" : firmShare >= 0.95 ? "at-firm-sand" : meanRemoved <= tolerance ? "untouched" : "in-work";
  const p = planned[cell] * pixel * toVolume, r = removed[cell] * pixel * toVolume, d = deposited[cell] * pixel * toVolume, left = remaining[cell] * pixel * toVolume;
  totals.plannedVolume += p;
  totals.removedVolume += r;
  totals.depositedVolume += d;
  totals.remainingVolume += left;
  totals.cells++;
  if (status === "at-firm-sand") totals.cellsAtFirmSand++;
  const mean = surveyed[cell] > 0 ? (remaining[cell] / surveyed[cell]) : null;
  parts.push(`{"row":${Math.floor(cell / cellCols)},"col":${cell % cellCols},"plannedVolume":${p},"removedVolume":${r},"depositedVolume":${d},"remainingVolume":${left},"meanRemainingThickness":${mean},"coverage":${coverage},"status":"${status}"}`);
}
stage("aggregate");

// ---- bands: d3-contour isobands of remaining thickness, in lon/lat, gzipped -----------------------
const thresholds = feet ? [tolerance, 0.5, 1, 2, 3, 4, 6] : [tolerance, 0.15, 0.3, 0.6, 0.9, 1.2, 1.8];
const features = contours().size([cols, rows]).thresholds(thresholds)(thickness).map((band) => ({
  type: "Feature",
  properties: { lower: band.value },
  geometry: {
    type: "MultiPolygon",
    coordinates: band.coordinates.map((polygon) =>
      polygon.map((ring) => ring.map(([x, y]) => {
        const [lon, lat] = converter.inverse([minX + x * resolution, minY + y * resolution]);
        return [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7];
      })),
    ),
  },
}));
const bands = gzipSync(JSON.stringify({ type: "FeatureCollection", features }));
if (options["bands-out"]) writeFileSync(options["bands-out"], bands);
stage("bands");

process.stdout.write(`{"units":{"length":${JSON.stringify(options.units)},"volume":"${feet ? "yd3" : "m3"}"},"totals":${JSON.stringify(totals)},"cells":[${parts.join(",")}]}\n`);
stage("output");
process.stderr.write(`${JSON.stringify({ stages, bandsBytes: bands.length })}\n`);
