import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { createCrs } from "../../shared/crs";
import { computeSurveyVolumes, type EngineSettings } from "../../shared/pipeline";
import { soundingElevations } from "../../shared/soundings/elevations";
import { parseSoundingsCsv } from "../../shared/soundings/parse-csv";
import { defaultsFor } from "../../shared/units";
import { volumeReport, type VolumeReport } from "../../shared/volumes/report";
import { resolveCrsDefinition } from "../lib/geo/epsg.server";
import { firmPoints } from "../lib/engine/survey-work";

/**
 * computed: the command line's fast path (sounding files read from bytes, surveys handed to the
 * engine threads as each file is read, the report written without an object per cell) against the
 * path it replaced (the files' text through the zod row schema, the engine on one thread, the
 * report as objects then JSON.stringify), on the demo's surveys (sample-data/demo): every cell's
 * figures within 1e-9 relative, the same cells, labels and statuses, with and without a work
 * limit, on the main thread and in two threads.
 */
const root = join(import.meta.dirname, "..", "..");
const demo = join(root, "sample-data", "demo");
const built = join(root, "build", "cli", "firmsand.mjs");

beforeAll(() => {
  const build = spawnSync(process.execPath, [join(root, "app", "cli", "build.mjs")], { cwd: root, encoding: "utf8" });
  if (build.status !== 0) throw new Error(`the command line did not build: ${build.stderr}`);
});

// Water-surface elevations of the demo's surveys (sample-data/README.md), ft NAVD88.
const surveys = {
  baseline: { file: "baseline-2026-09-08.csv", wse: 32.4 },
  progress1: { file: "progress-1-2026-09-29.csv", wse: 32.1 },
  closeout: { file: "closeout-2026-11-24.csv", wse: 31.75 },
};

/** The previous path, as the command line ran it before. */
function previousReport(after: keyof typeof surveys, withLimit: boolean): VolumeReport {
  const read = (name: keyof typeof surveys) => {
    const parsed = parseSoundingsCsv(readFileSync(join(demo, surveys[name].file), "utf8"));
    expect(parsed.errors).toEqual([]);
    const { elevation, refusalElevation } = soundingElevations(parsed, surveys[name].wse);
    return { easting: parsed.easting, northing: parsed.northing, elevation, refusalElevation };
  };
  const baseline = read("baseline");
  const later = read(after);
  const defaults = defaultsFor("us-ft");
  const settings: EngineSettings = {
    cellSize: defaults.cellSize, resolution: defaults.resolution, maxEdge: defaults.maxEdge, tolerance: defaults.tolerance,
    firmShare: 0.95, minCoverage: 0.8, surveyNoise: defaults.tolerance, rotationDegrees: 0,
  };
  let workLimit = null;
  if (withLimit) {
    const crs = createCrs(resolveCrsDefinition("EPSG:2237").definition);
    const feature = JSON.parse(readFileSync(join(demo, "work-limit.geojson"), "utf8")) as { geometry: { coordinates: number[][][] } };
    workLimit = [feature.geometry.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat)))];
  }
  const result = computeSurveyVolumes({ baseline, progress: [later], firm: firmPoints(baseline) }, workLimit, settings);
  return JSON.parse(JSON.stringify(volumeReport(result, "us-ft"))) as VolumeReport;
}

function cliReport(after: keyof typeof surveys, withLimit: boolean, threads: 0 | 2): VolumeReport {
  const run = spawnSync(
    process.execPath,
    [
      built, "volumes", "--crs", "EPSG:2237", "--units", "us-ft",
      "--before", join(demo, surveys.baseline.file), "--before-wse", String(surveys.baseline.wse),
      "--after", join(demo, surveys[after].file), "--after-wse", String(surveys[after].wse),
      ...(withLimit ? ["--limit", join(demo, "work-limit.geojson")] : []),
      "--threads", String(threads),
    ],
    { cwd: root, encoding: "utf8", maxBuffer: 64 << 20 },
  );
  expect(run.stderr).toBe("");
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout) as VolumeReport;
}

function closeTo(actual: number | null, expected: number | null, where: string) {
  if (expected === null || actual === null) {
    expect(actual, where).toBe(expected);
    return;
  }
  const scale = Math.max(Math.abs(actual), Math.abs(expected));
  expect(Math.abs(actual - expected), where).toBeLessThanOrEqual(1e-9 * scale);
}

describe("the command line's fast path against the previous one, on the demo", () => {
  for (const after of ["closeout", "progress1"] as const) {
    for (const withLimit of [true, false]) {
      it(`baseline → ${after}, ${withLimit ? "inside the demo's work limit" : "over the baseline's hull"}, on one thread and in two`, () => {
        const previous = previousReport(after, withLimit);
        expect(previous.cells.length).toBeGreaterThan(100);
        expect(previous.totals.removedVolume).toBeGreaterThan(0);
        for (const threads of [0, 2] as const) {
          const report = cliReport(after, withLimit, threads);
          expect(report.units).toEqual(previous.units);
          expect(report.totals.cells).toBe(previous.totals.cells);
          expect(report.totals.cellsAtFirmSand).toBe(previous.totals.cellsAtFirmSand);
          for (const field of ["plannedVolume", "removedVolume", "depositedVolume", "remainingVolume"] as const) {
            closeTo(report.totals[field], previous.totals[field], `totals.${field} (${threads} threads)`);
          }
          expect(report.cells.map((cell) => [cell.label, cell.row, cell.col, cell.status])).toEqual(previous.cells.map((cell) => [cell.label, cell.row, cell.col, cell.status]));
          report.cells.forEach((cell, index) => {
            const before = previous.cells[index];
            for (const field of ["plannedVolume", "removedVolume", "depositedVolume", "remainingVolume", "meanRemainingThickness", "coverage"] as const) {
              closeTo(cell[field], before[field], `${cell.label}.${field} (${threads} threads)`);
            }
          });
        }
      });
    }
  }
});
