/**
 * The import benchmarks' synthetic survey: an elliptical basin 1,200 ft × 800 ft in EPSG:2237
 * (a fictional place), a seeded baseline with probe of about `rows` soundings on a regular pattern,
 * and the project it belongs to. Shared by the in-process and the over-HTTP import benchmarks.
 */
import { closeSync, openSync, writeSync } from "node:fs";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "../../app/lib/geo/epsg.server";
import { Project } from "../../app/lib/db.server";

// Seeded generator (mulberry32) so every run reads the same file.
export function random(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = Math.imul(state ^ (state >>> 15), 1 | state);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), 61 | mixed);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

const centre = { x: 640_000, y: 1_520_000 };
const radius = { x: 600, y: 400 };

export function rowsArgument(fallback = 1_000_000): number {
  const index = process.argv.indexOf("--rows");
  const rows = index > 0 ? Number(process.argv[index + 1]) : fallback;
  if (!Number.isInteger(rows) || rows < 1) throw new Error(`--rows wants a positive whole number, not ${process.argv[index + 1]}`);
  return rows;
}

/** One synthetic baseline sounding: position in EPSG:2237 us-ft, water depth and probe depth below the surface. */
export type BaselinePoint = (easting: number, northing: number, depth: number, probe: number) => void;

/** Visits about `rows` seeded soundings of the baseline (always the same ones) and returns how many. */
export function baselinePoints(rows: number, visit: BaselinePoint): number {
  const next = random(20261201);
  const spacing = Math.sqrt((Math.PI * radius.x * radius.y) / rows);
  let written = 0;
  for (let y = centre.y - radius.y; y <= centre.y + radius.y && written < rows; y += spacing) {
    for (let x = centre.x - radius.x; x <= centre.x + radius.x && written < rows; x += spacing) {
      const u = (x - centre.x) / radius.x;
      const v = (y - centre.y) / radius.y;
      if (u * u + v * v > 1) continue;
      const depth = 6 + 2 * (1 - u * u - v * v) + (next() - 0.5) * 0.1;
      const probe = depth + 1 + 2 * (1 - u * u) + (next() - 0.5) * 0.1;
      visit(x + (next() - 0.5) * 0.2, y + (next() - 0.5) * 0.2, depth, probe);
      written++;
    }
  }
  return written;
}

/** Writes the baseline CSV in batches (the generator itself holds little) and returns its row count. */
export function writeBaselineCsv(path: string, rows: number): number {
  const descriptor = openSync(path, "w");
  let parts: string[] = ["point_id,easting,northing,depth,probe"];
  let pointId = 0;
  const written = baselinePoints(rows, (easting, northing, depth, probe) => {
    parts.push(`P${++pointId},${easting.toFixed(2)},${northing.toFixed(2)},${depth.toFixed(2)},${probe.toFixed(2)}`);
    if (parts.length >= 10_000) {
      writeSync(descriptor, `${parts.join("\n")}\n`);
      parts = [];
    }
  });
  if (parts.length > 0) writeSync(descriptor, `${parts.join("\n")}\n`);
  closeSync(descriptor);
  return written;
}

export function createBenchProject(name = "Import benchmark basin (synthetic)", slugPrefix = "bench-import"): Promise<Project> {
  const crs = createCrs(resolveCrsDefinition("EPSG:2237").definition);
  const ring: Array<[number, number]> = [];
  for (let step = 0; step <= 128; step++) {
    const angle = (step / 128) * 2 * Math.PI;
    ring.push(crs.toLonLat(centre.x + radius.x * Math.cos(angle), centre.y + radius.y * Math.sin(angle)));
  }
  ring[ring.length - 1] = ring[0];
  return Project.create({
    name,
    slug: `${slugPrefix}-${Date.now()}`,
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
}

export const mb = (bytes: number) => Math.round(bytes / 1024 / 1024);
