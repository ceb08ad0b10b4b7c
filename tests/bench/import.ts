/**
 * Import benchmark: rows per second from upload to committed statistics for a synthetic
 * 1,000,000-row baseline (seeded), and peak resident memory. Goal on this machine kind: under
 * 60 s and under 600 MB. `npm run bench -- --only import` brings up the database and runs it;
 * by hand it needs a migrated database (the DB_* environment, as for the app):
 *   DB_PORT=3308 DB_NAME=firmsand_bench npx tsx tests/bench/import.ts [--rows N]
 * BENCH_TRACE=1 prints memory every half second.
 */
import { createReadStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { Survey } from "../../app/lib/db.server";
import { importSurveyFile } from "../../app/lib/import/import-service.server";
import { writeStagedFile } from "../../app/lib/import/stage-upload.server";
import { closeSequelize } from "../../db/connection.server";
import { createBenchProject, rowsArgument, writeBaselineCsv } from "./import-fixture";

const rows = rowsArgument();

const directory = mkdtempSync(join(tmpdir(), "firmsand-bench-import-"));
process.env.UPLOAD_DIR = directory;
const file = join(directory, "bench.csv");
const written = writeBaselineCsv(file, rows);
const project = await createBenchProject();

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
  console.log(`import in process (staged file → committed statistics) of ${written.toLocaleString("en-US")} rows (${(statSync(file).size / 1e6).toFixed(1)} MB): ${seconds.toFixed(1)} s, ${Math.round(written / seconds).toLocaleString("en-US")} rows/s, peak RSS ${Math.round(peakRss / 1024 / 1024)} MB; ratio to the goal (60 s, 600 MB): time ${(seconds / 60).toFixed(2)}, memory ${(peakRss / 1024 / 1024 / 600).toFixed(2)}`);
  for (const [name, at, rss] of stages) console.log(`  ${(at / 1000).toFixed(1).padStart(6)} s  ${String(Math.round(rss / 1024 / 1024)).padStart(5)} MB  ${name}`);
} finally {
  clearInterval(sampler);
  await Survey.destroy({ where: { projectId: project.id } });
  await project.destroy();
  rmSync(directory, { recursive: true, force: true });
  await closeSequelize();
}
