import { createWriteStream, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import proj4 from "proj4";
import { syntheticSurveys, type Basin } from "../synthetic";

/**
 * The two scenarios of the end-to-end engine bench (`npm run bench -- --only engine-files`), written
 * as the files a survey crew hands over: a baseline CSV with depth and probe columns, a progress CSV
 * with depth only (water surface 0), and the work limit as GeoJSON in lon/lat. Seeded, so every run
 * and every checkout gets the same bytes; written once into `.data/engine-files/` (git-ignored) and
 * rewritten only when the generator's version changes. Invented basins, no real site.
 */
export interface FileScenario {
  name: "spring" | "bay";
  basin: Basin;
  soundings: number;
  crs: string;
  units: "us-ft" | "m";
  /** Command-line options beyond the files (the engine settings of the scenario). */
  settings: { cellSize: number; resolution: number; maxEdge: number; tolerance: number };
}

// The basins of tests/bench/run.ts: a 2-acre spring basin in state-plane feet, a 600-acre bay in UTM metres.
export const fileScenarios: FileScenario[] = [
  {
    name: "spring",
    basin: { name: "spring basin", centreX: 640_000, centreY: 1_520_000, radiusX: 200, radiusY: 140, waterDepth: 8, muckThickness: 3 },
    soundings: 20_000,
    crs: "EPSG:2237",
    units: "us-ft",
    settings: { cellSize: 15, resolution: 1, maxEdge: 50, tolerance: 0.25 },
  },
  {
    name: "bay",
    basin: { name: "large bay", centreX: 420_000, centreY: 3_150_000, radiusX: 1000, radiusY: 773, waterDepth: 3, muckThickness: 1 },
    soundings: 1_000_000,
    crs: "EPSG:32617",
    units: "m",
    settings: { cellSize: 5, resolution: 1, maxEdge: 15, tolerance: 0.08 },
  },
];

const SEED = 20310402;
/** Bump when the files' content changes, so stale copies are rewritten. */
const GENERATOR_VERSION = "1";

export const scenarioDirectory = join(import.meta.dirname, "..", "..", "..", ".data", "engine-files");

export interface ScenarioFiles {
  before: string;
  after: string;
  limit: string;
}

export function scenarioFiles(scenario: FileScenario): ScenarioFiles {
  const base = join(scenarioDirectory, scenario.name);
  return { before: `${base}-before.csv`, after: `${base}-after.csv`, limit: `${base}-limit.geojson` };
}

/** The proj4 definition of an EPSG code, from the epsg-index package (one small file per code). */
export function proj4Definition(crs: string): string {
  const code = /^EPSG:(\d+)$/.exec(crs)?.[1];
  if (!code) throw new Error(`not an EPSG code: ${crs}`);
  const require = createRequire(import.meta.url);
  const file = join(dirname(require.resolve("epsg-index/package.json")), "s", `${code}.json`);
  return (JSON.parse(readFileSync(file, "utf8")) as { proj4: string }).proj4;
}

async function writeCsv(file: string, header: string, rows: number, line: (index: number) => string) {
  const partial = `${file}.partial`;
  const stream = createWriteStream(partial);
  const write = (text: string) => (stream.write(text) ? Promise.resolve() : new Promise<void>((done) => stream.once("drain", () => done())));
  await write(`${header}\n`);
  let batch = "";
  for (let index = 0; index < rows; index++) {
    batch += line(index);
    if (batch.length > 1 << 20) {
      await write(batch);
      batch = "";
    }
  }
  await write(batch);
  await new Promise<void>((done, fail) => stream.end((error?: Error | null) => (error ? fail(error) : done())));
  renameSync(partial, file);
}

/** Writes the scenario's files unless this version of them is there already. */
export async function ensureScenarioFiles(scenario: FileScenario): Promise<ScenarioFiles> {
  const files = scenarioFiles(scenario);
  const stamp = join(scenarioDirectory, `${scenario.name}.version`);
  if (existsSync(stamp) && readFileSync(stamp, "utf8") === GENERATOR_VERSION && Object.values(files).every((file) => existsSync(file))) return files;
  mkdirSync(scenarioDirectory, { recursive: true });
  const { before, firm, after } = syntheticSurveys(scenario.basin, scenario.soundings, SEED);
  // Water surface at 0: depth = −elevation, probe = −refusal elevation, to 0.001 of the unit as crews export them.
  const fixed = (value: number) => value.toFixed(3);
  await writeCsv(files.before, "easting,northing,depth,probe", scenario.soundings, (index) =>
    `${fixed(before.easting[index])},${fixed(before.northing[index])},${fixed(-before.elevation[index])},${fixed(-firm.elevation[index])}\n`,
  );
  await writeCsv(files.after, "easting,northing,depth", scenario.soundings, (index) =>
    `${fixed(after.easting[index])},${fixed(after.northing[index])},${fixed(-after.elevation[index])}\n`,
  );
  // The elliptical work limit (256 vertices) in lon/lat, as the app and the command line take it.
  const toLonLat = proj4(proj4Definition(scenario.crs), "EPSG:4326");
  const { basin } = scenario;
  const ring: number[][] = [];
  for (let index = 0; index < 256; index++) {
    const angle = (2 * Math.PI * index) / 256;
    const [lon, lat] = toLonLat.forward([basin.centreX + basin.radiusX * Math.cos(angle), basin.centreY + basin.radiusY * Math.sin(angle)]);
    ring.push([Number(lon.toFixed(9)), Number(lat.toFixed(9))]);
  }
  ring.push(ring[0]);
  writeFileSync(files.limit, JSON.stringify({ type: "Feature", properties: { name: basin.name }, geometry: { type: "Polygon", coordinates: [ring] } }));
  writeFileSync(stamp, GENERATOR_VERSION);
  return files;
}

/** The command line's arguments for a scenario (after `volumes`). */
export function cliArguments(scenario: FileScenario, files: ScenarioFiles): string[] {
  const { settings } = scenario;
  return [
    "--crs", scenario.crs, "--units", scenario.units, "--before", files.before, "--after", files.after, "--limit", files.limit,
    "--cell-size", String(settings.cellSize), "--resolution", String(settings.resolution), "--max-edge", String(settings.maxEdge), "--tolerance", String(settings.tolerance),
  ];
}

// `tsx tests/bench/engine-files/scenarios.ts` writes the files alone.
if (process.argv[1] && import.meta.filename === process.argv[1]) {
  for (const scenario of fileScenarios) {
    const files = await ensureScenarioFiles(scenario);
    console.log(`${scenario.name}: ${files.before}, ${files.after}, ${files.limit}`);
  }
}
