import { spawnSync } from "node:child_process";
import { readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";

/**
 * The command line as survey staff run it, on the small basin in tests/fixtures/engine: a 100 × 60
 * us-ft rectangle sounded every 10 ft (EPSG:2237). Both surveys are planar, so the engine must
 * reproduce the closed-form volumes:
 *   before depth 4 + 0.01·x, probe 9 + 0.02·y (x, y from the south-west corner), after = before + 2,
 *   water surface 0, so thickness = 5 + 0.02·y − 0.01·x.
 */
const root = join(import.meta.dirname, "..", "..");
const fixtures = join(root, "tests", "fixtures", "engine");
const built = join(root, "build", "cli", "firmsand.mjs");

// The command line as users run it: the built JavaScript (npm run build:cli), built afresh here.
beforeAll(() => {
  const build = spawnSync(process.execPath, [join(root, "app", "cli", "build.mjs")], { cwd: root, encoding: "utf8" });
  if (build.status !== 0) throw new Error(`the command line did not build: ${build.stderr}`);
});

function firmsand(...args: string[]) {
  const run = spawnSync(process.execPath, [built, ...args], { cwd: root, encoding: "utf8" });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

const base = ["volumes", "--crs", "EPSG:2237", "--units", "us-ft", "--before", join(fixtures, "basin-before.csv"), "--after", join(fixtures, "basin-after.csv")];

describe("firmsand volumes", () => {
  it("prints the report as JSON with closed-form totals", () => {
    const run = firmsand(...base);
    expect(run.stderr).toBe("");
    expect(run.status).toBe(0);
    const report = JSON.parse(run.stdout);
    expect(report.units).toEqual({ length: "us-ft", volume: "yd3" });
    expect(Object.keys(report.totals).sort()).toEqual(["cells", "cellsAtFirmSand", "depositedVolume", "plannedVolume", "remainingVolume", "removedVolume"]);
    // computed: mean thickness over the rectangle = 5 + 0.02·30 − 0.01·50 = 5.1 ft; 6000 ft² · 5.1 = 30,600 ft³;
    // a cubic yard is 27 ft³ (NIST SP 811). Planar surfaces are integrated exactly (1e-9 relative).
    expect(Math.abs(report.totals.plannedVolume - (6000 * 5.1) / 27) / ((6000 * 5.1) / 27)).toBeLessThan(1e-9);
    expect(report.totals.removedVolume).toBeCloseTo((6000 * 2) / 27, 6); // computed: 2 ft over 6000 ft²
    expect(report.totals.remainingVolume).toBeCloseTo((6000 * 3.1) / 27, 6); // computed: planned − removed
    expect(report.totals.depositedVolume).toBe(0);
    expect(report.totals.cells).toBe(15); // computed: 100/20 × 60/20 cells of the default 20 ft
    expect(report.cells).toHaveLength(15);
    const first = report.cells[0];
    expect(Object.keys(first).sort()).toEqual(
      ["col", "coverage", "depositedVolume", "label", "meanRemainingThickness", "plannedVolume", "remainingVolume", "removedVolume", "row", "status"].sort(),
    );
    expect(first).toMatchObject({ row: 0, col: 0, label: "A1", coverage: 1, status: "in-work" });
    // computed: cell A1's centre (10, 10): 5 + 0.2 − 0.1 − 2 = 3.1 ft left
    expect(first.meanRemainingThickness).toBeCloseTo(3.1, 9);
  });

  it("clips to a GeoJSON work limit given in lon/lat", () => {
    const run = firmsand(...base, "--limit", join(fixtures, "basin-limit.geojson"));
    expect(run.status).toBe(0);
    const report = JSON.parse(run.stdout);
    // computed: the limit is x 20–80, y 0–40 (2400 ft², mean thickness 5 + 0.4 − 0.5 = 4.9 ft). Its corners
    // are stored to 1e-10° (about 0.00004 ft), which moves the plane's integral by well under 1e-6.
    const exact = (2400 * 4.9) / 27;
    expect(Math.abs(report.totals.plannedVolume - exact) / exact).toBeLessThan(1e-6);
    expect(report.totals.cells).toBe(6); // computed: 3 × 2 cells of 20 ft
  });

  it("marks cells at firm sand when the tolerance covers what is left", () => {
    const run = firmsand(...base, "--tolerance", "3.5", "--survey-noise", "0.25");
    const report = JSON.parse(run.stdout);
    // computed: remaining thickness is 3.1 + 0.02·y − 0.01·x ≤ 3.5 wherever y ≤ 20 + 0.5·x; cell A1 (x, y < 20) qualifies everywhere.
    expect(report.cells.find((cell: { label: string }) => cell.label === "A1").status).toBe("at-firm-sand");
    expect(report.cells.find((cell: { label: string }) => cell.label === "A3").status).toBe("in-work");
    expect(report.totals.cellsAtFirmSand).toBeGreaterThan(0);
    // Survey noise defaults to the tolerance: 2 ft removed under a 3.5 ft noise allowance is no evidence of work.
    const noisy = JSON.parse(firmsand(...base, "--tolerance", "3.5").stdout);
    expect(noisy.cells.find((cell: { label: string }) => cell.label === "A3").status).toBe("untouched");
  });

  it("names the file, row and column of bad soundings and exits non-zero", () => {
    const bad = join(fixtures, "basin-bad-rows.csv");
    const run = firmsand("volumes", "--crs", "EPSG:2237", "--units", "us-ft", "--before", bad, "--after", join(fixtures, "basin-after.csv"));
    expect(run.status).toBe(1);
    expect(run.stdout).toBe("");
    expect(run.stderr).toContain(`${bad}: row 4, column "depth": water depth is not a number`);
    expect(run.stderr).toContain(`${bad}: row 5, column "probe"`);
  });

  it("refuses missing or inconsistent options with exit code 2", () => {
    expect(firmsand("volumes", "--units", "us-ft").status).toBe(2);
    const mismatch = firmsand(...base.slice(0, 3), "--units", "m", ...base.slice(5));
    expect(mismatch.status).toBe(2);
    expect(mismatch.stderr).toMatch(/does not match/);
  });
});

describe("the built command line's code cache", () => {
  const cliDirectory = join(root, "build", "cli");
  const caches = () => readdirSync(cliDirectory).filter((name) => /^firmsand-bundle\.cjs\.[0-9a-f]{16}\.v8cache$/.test(name));

  it("keeps the compiled code beside the bundle after a run, and a damaged cache changes nothing but is written again", () => {
    for (const name of caches()) rmSync(join(cliDirectory, name), { force: true });
    const first = firmsand(...base);
    expect(first.status).toBe(0);
    expect(caches()).toHaveLength(1);
    const cacheFile = join(cliDirectory, caches()[0]);
    const second = firmsand(...base);
    expect(second.status).toBe(0);
    expect(second.stdout).toBe(first.stdout);
    // V8 refuses code it did not make (its own check); the run compiles as it goes and writes a good cache again.
    writeFileSync(cacheFile, Buffer.alloc(4096, 7));
    const third = firmsand(...base);
    expect(third.status).toBe(0);
    expect(third.stdout).toBe(first.stdout);
    expect(readFileSync(cacheFile).equals(Buffer.alloc(4096, 7))).toBe(false);
  });
});
