/**
 * Import benchmark: rows per second from upload to committed statistics for a synthetic
 * 1,000,000-row baseline (seeded), and peak resident memory. Goal on this machine kind: under
 * 60 s and under 600 MB. `npm run bench -- --only import` brings up the database and runs it;
 * by hand it needs a migrated database (the DB_* environment, as for the app):
 *   DB_PORT=3308 DB_NAME=firmsand_bench npx tsx tests/bench/import.ts [--rows N]
 * BENCH_TRACE=1 prints memory every half second.
 */
import { closeSync, createReadStream, mkdtempSync, openSync, rmSync, statSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "../../app/lib/epsg.server";
import { Project, Survey } from "../../app/lib/db.server";
import { importSurveyFile } from "../../app/lib/import/import-service.server";
import { writeStagedFile } from "../../app/lib/import/stage-upload.server";
import { closeSequelize } from "../../db/connection.server";

const rowsArgument = process.argv.indexOf("--rows");
const rows = rowsArgument > 0 ? Number(process.argv[rowsArgument + 1]) : 1_000_000;

// Seeded generator (mulberry32) so every run reads the same file.
function random(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = Math.imul(state ^ (state >>> 15), 1 | state);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), 61 | mixed);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

// An elliptical basin 1,200 ft × 800 ft in EPSG:2237 (fictional place), soundings on lines 1 ft apart.
const centre = { x: 640_000, y: 1_520_000 };
const radius = { x: 600, y: 400 };
const crs = createCrs(resolveCrsDefinition("EPSG:2237").definition);
const ring: Array<[number, number]> = [];
for (let step = 0; step <= 128; step++) {
  const angle = (step / 128) * 2 * Math.PI;
  ring.push(crs.toLonLat(centre.x + radius.x * Math.cos(angle), centre.y + radius.y * Math.sin(angle)));
}
ring[ring.length - 1] = ring[0];

function writeFile(path: string) {
  const next = random(20261201);
  const area = Math.PI * radius.x * radius.y;
  const spacing = Math.sqrt(area / rows);
  // Written in batches so the generator itself holds little: the peak measured is the import's.
  const descriptor = openSync(path, "w");
  let parts: string[] = ["point_id,easting,northing,depth,probe"];
  let written = 0;
  for (let y = centre.y - radius.y; y <= centre.y + radius.y && written < rows; y += spacing) {
    for (let x = centre.x - radius.x; x <= centre.x + radius.x && written < rows; x += spacing) {
      const u = (x - centre.x) / radius.x;
      const v = (y - centre.y) / radius.y;
      if (u * u + v * v > 1) continue;
      const depth = 6 + 2 * (1 - u * u - v * v) + (next() - 0.5) * 0.1;
      const probe = depth + 1 + 2 * (1 - u * u) + (next() - 0.5) * 0.1;
      parts.push(`P${written + 1},${(x + (next() - 0.5) * 0.2).toFixed(2)},${(y + (next() - 0.5) * 0.2).toFixed(2)},${depth.toFixed(2)},${probe.toFixed(2)}`);
      written++;
      if (parts.length >= 10_000) {
        writeSync(descriptor, `${parts.join("\n")}\n`);
        parts = [];
      }
    }
  }
  if (parts.length > 0) writeSync(descriptor, `${parts.join("\n")}\n`);
  closeSync(descriptor);
  return written;
}

const directory = mkdtempSync(join(tmpdir(), "firmsand-bench-import-"));
process.env.UPLOAD_DIR = directory;
const file = join(directory, "bench.csv");
const written = writeFile(file);
const project = await Project.create({
  name: "Import benchmark basin (synthetic)",
  slug: `bench-import-${Date.now()}`,
  crs: "EPSG:2237",
  lengthUnit: "us-ft",
  gridOriginE: centre.x - radius.x,
  gridOriginN: centre.y - radius.y,
  cellSize: 20,
  rasterResolution: 1,
  maxEdge: 30,
  tolerance: 0.25,
  firmShare: 0.95,
  minCoverage: 0.8,
  workLimitGeoJson: JSON.stringify({ type: "Polygon", coordinates: [ring] }),
});

let peakRss = process.memoryUsage().rss;
const trace = process.env.BENCH_TRACE === "1";
let lastTrace = 0;
const sampler = setInterval(() => {
  const { rss, heapUsed, external, arrayBuffers } = process.memoryUsage();
  peakRss = Math.max(peakRss, rss);
  if (trace && performance.now() - lastTrace > 500) {
    lastTrace = performance.now();
    console.log(`  trace ${((lastTrace - started) / 1000).toFixed(1)} s rss ${Math.round(rss / 1048576)} heap ${Math.round(heapUsed / 1048576)} external ${Math.round(external / 1048576)} buffers ${Math.round(arrayBuffers / 1048576)} MB (${lastStage})`);
  }
}, 50);
const stages: Array<[string, number, number]> = [];
console.log(`RSS before the import: ${Math.round(process.memoryUsage().rss / 1024 / 1024)} MB`);
let lastStage = "";
const started = performance.now();
try {
  const staged = await writeStagedFile(Readable.toWeb(createReadStream(file)) as ReadableStream<Uint8Array>, "bench.csv");
  const outcome = await importSurveyFile({
    projectId: project.id,
    userId: null,
    staged,
    options: { kind: "baseline", surveyedOn: "2026-12-01", timeZone: "UTC", waterSurfaceElevation: 30, fileHasElevations: false, datum: "NAVD88", crs: "EPSG:2237", lengthUnit: "us-ft", surveyOrder: "1a" },
    choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: true },
    onProgress: (stage) => {
      const name = stage.replace(/\s*\(.*$/, "");
      if (name !== lastStage) {
        stages.push([name, performance.now() - started, process.memoryUsage().rss]);
        lastStage = name;
      }
    },
  });
  const seconds = (performance.now() - started) / 1000;
  clearInterval(sampler);
  peakRss = Math.max(peakRss, process.memoryUsage().rss);
  if (!outcome.ok) throw new Error(`refused: ${outcome.preview.blockers.join(" ")}`);
  console.log(`import of ${written.toLocaleString("en-US")} rows (${(statSync(file).size / 1e6).toFixed(1)} MB): ${seconds.toFixed(1)} s, ${Math.round(written / seconds).toLocaleString("en-US")} rows/s, peak RSS ${Math.round(peakRss / 1024 / 1024)} MB; ratio to the goal (60 s, 600 MB): time ${(seconds / 60).toFixed(2)}, memory ${(peakRss / 1024 / 1024 / 600).toFixed(2)}`);
  for (const [name, at, rss] of stages) console.log(`  ${(at / 1000).toFixed(1).padStart(6)} s  ${String(Math.round(rss / 1024 / 1024)).padStart(5)} MB  ${name}`);
} finally {
  clearInterval(sampler);
  await Survey.destroy({ where: { projectId: project.id } });
  await project.destroy();
  rmSync(directory, { recursive: true, force: true });
  await closeSequelize();
}
