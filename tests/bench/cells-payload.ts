/**
 * npx tsx tests/bench/cells-payload.ts — the size and server time of GET /api/projects/<id>/cells
 * for a synthetic 100,000-cell bay, built by the same presenter as the route (app/models/cells-presenter.ts).
 * Prints raw and gzip bytes (zlib's default level, as the app's compression middleware) and the
 * milliseconds to present and serialise (best of N after a warm-up). Figures, not a pass/fail test.
 */
import { performance } from "node:perf_hooks";
import { gzipSync } from "node:zlib";
import { cellCentroid, createCellGrid } from "../../shared/grid/cell-grid";
import { isInsideWorkLimit } from "../../shared/grid/work-limit";
import { CELL_STATUSES } from "../../shared/cell-status";
import { presentCellsPayload, type CellFigures } from "../../app/models/cells-presenter";
import { ellipseLimit, seededRandom, type Basin } from "./synthetic";

// The bench's large bay: π · 1000 · 773 m² = 2.43 km² in 5 m cells ≈ 97,000 cells; the radii
// here are scaled so the limit holds just over 100,000 (invented site).
const bay: Basin = { name: "100,000-cell bay", centreX: 420_000, centreY: 3_150_000, radiusX: 1020, radiusY: 788, waterDepth: 3, muckThickness: 1 };
const CELL_SIZE_M = 5;
const RUNS = 5;

const workLimit = ellipseLimit(bay);
const grid = createCellGrid(workLimit, { cellSize: CELL_SIZE_M, originX: bay.centreX - 2000, originY: bay.centreY - 2000, rotationDegrees: 0 });
const random = seededRandom(20261201);
const zones = [{ id: 1, name: "North lobe" }, { id: 2, name: "South lobe" }, { id: 3, name: "Vent" }];
const cells: CellFigures[] = [];
const computedAt = new Date("2026-11-24T18:00:00Z");
for (let localRow = 0; localRow < grid.rows; localRow++) {
  for (let localCol = 0; localCol < grid.cols; localCol++) {
    const row = grid.firstRow + localRow, col = grid.firstCol + localCol;
    const [easting, northing] = cellCentroid(grid, row, col);
    if (!isInsideWorkLimit(workLimit, easting, northing)) continue;
    const plannedVolume = 20 + random() * 15; // m³ in a 25 m² cell, about 1 m of muck
    const removedShare = random() < 0.4 ? random() : 0;
    cells.push({
      row, col,
      status: CELL_STATUSES[Math.floor(random() * CELL_STATUSES.length)],
      meanRemainingThickness: random() < 0.05 ? null : random() * 1.4,
      removedVolume: plannedVolume * removedShare,
      remainingVolume: plannedVolume * (1 - removedShare),
      plannedVolume,
      coverage: random(),
      zoneId: northing > bay.centreY ? 1 : random() < 0.1 ? 3 : 2,
      computedAt,
    });
  }
}

function present(): string {
  return JSON.stringify(presentCellsPayload({
    projectId: 1,
    crs: { code: "EPSG:32617", definition: "+proj=utm +zone=17 +datum=WGS84 +units=m +no_defs +type=crs" },
    lengthUnit: "m",
    grid,
    zones,
    cells,
  }));
}

present(); // warm-up
let best = Infinity;
let json = "";
for (let run = 0; run < RUNS; run++) {
  const started = performance.now();
  json = present();
  best = Math.min(best, performance.now() - started);
}
const started = performance.now();
const gzipped = gzipSync(json);
const gzipMs = performance.now() - started;
const raw = Buffer.byteLength(json);
console.log(`${bay.name}: ${cells.length} cells in the limit, grid ${grid.cols} × ${grid.rows} = ${grid.cols * grid.rows} entries`);
console.log(`present + JSON.stringify: ${best.toFixed(1)} ms (best of ${RUNS})`);
console.log(`payload: ${raw} bytes raw (${(raw / 1e6).toFixed(2)} MB, ${(raw / cells.length).toFixed(1)} B/cell), ${gzipped.length} bytes gzip (${(gzipped.length / 1e6).toFixed(2)} MB), gzip ${gzipMs.toFixed(1)} ms`);
