// Cost of drawing the cells along the work limit clipped to it, for a bay of about 100,000 cells.
// npx tsx tests/bench/clip-cells.ts — prints the in-limit, edge and clipped cell counts, the time
// of buildCellFeatures without the limit, and of the clip alone (medians of 7 runs). Not part of npm test.
import { performance } from "node:perf_hooks";
import type { Polygon } from "geojson";
import { buildCellFeatures, type CellsData } from "../../app/components/map/cell-features";
import { clipEdgeCells, edgeCellMask } from "../../app/components/map/clip-cells";
import { createCrs } from "../../shared/crs";
import { cellCentroid, createCellGrid } from "../../shared/grid/cell-grid";
import { isInsideWorkLimit } from "../../shared/grid/work-limit";

const UTM17 = "+proj=utm +zone=17 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs";
const crs = createCrs(UTM17);
const E0 = 343_000, N0 = 3_198_000;
// An invented lake: a 400-vertex wavy outline of radius about 1.8 km, 10 m cells.
const outer: Array<[number, number]> = [];
for (let index = 0; index < 400; index++) {
  const angle = (2 * Math.PI * index) / 400;
  const radius = 1_800 + 150 * Math.sin(7 * angle);
  outer.push([E0 + radius * Math.cos(angle), N0 + radius * Math.sin(angle)]);
}
outer.push(outer[0]);
const grid = createCellGrid([[outer]], { cellSize: 10, rotationDegrees: 12 });
const count = grid.cols * grid.rows;
const status = new Array<number>(count).fill(-1);
for (let row = 0; row < grid.rows; row++) for (let col = 0; col < grid.cols; col++) {
  const [x, y] = cellCentroid(grid, grid.firstRow + row, grid.firstCol + col);
  if (isInsideWorkLimit([[outer]], x, y)) status[row * grid.cols + col] = 1;
}
const data = {
  crs: { code: "EPSG:26917", definition: UTM17 }, grid, status,
  remainingThickness: new Array(count).fill(null), removedVolume: new Array(count).fill(0), zone: new Array(count).fill(-1),
} as unknown as CellsData;
const workLimit: Polygon = { type: "Polygon", coordinates: [outer.map(([x, y]) => crs.toLonLat(x, y))] };

const median = (values: number[]) => values.sort((a, b) => a - b)[Math.floor(values.length / 2)];
function time(run: () => unknown, prepare: () => void = () => undefined): number {
  const runs: number[] = [];
  for (let index = 0; index < 7; index++) {
    prepare();
    const start = performance.now();
    run();
    runs.push(performance.now() - start);
  }
  return median(runs);
}
const inLimit = status.filter((code) => code >= 0).length;
const mask = edgeCellMask(grid, crs, workLimit);
let edge = 0;
for (let index = 0; index < count; index++) if (mask[index] && status[index] >= 0) edge++;
const squares = time(() => buildCellFeatures(data));
let features = buildCellFeatures(data).features;
let clippedCount = 0;
const clip = time(() => (clippedCount = clipEdgeCells(features, grid, crs, workLimit)), () => (features = buildCellFeatures(data).features));
const maskMs = time(() => edgeCellMask(grid, crs, workLimit));
console.log(JSON.stringify({ inLimitCells: inLimit, edgeCells: edge, clippedCells: clippedCount, squaresMs: Math.round(squares), clipMs: Math.round(clip), edgeMaskMs: Math.round(maskMs * 10) / 10 }));
