import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { PROJECT, SURVEYS, WORK_LIMIT } from "../../sample-data/scenario";
import { ColumnMapping } from "~/lib/db.server";
import { analyseStagedFile } from "~/lib/import/analyse.server";
import { commitChoicesSchema, importOptionsSchema, type ImportOptions } from "~/lib/import/import-options";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { demoImportOptions } from "../../db/seeders/demo-surveys";
import { previousBottomBins } from "~/lib/import/previous-bottom.server";
import { DEMO_DIR, FIXTURES, counts, makeDemoSiteProject, postSurvey, projectCrs } from "./import-helpers";

// The import checks that catch what crews really get wrong, each with its fixture under
// tests/fixtures/import and the message it must produce (README there), through the real
// analysis of a staged file against a project in MariaDB and through the upload API.
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-checks-test-"));

afterAll(closeSequelize);

const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
const progress1 = SURVEYS.find((survey) => survey.key === "progress-1")!;
const fieldsOf = (survey: (typeof SURVEYS)[number], extra: Record<string, string> = {}) => ({
  kind: survey.kind, surveyedOn: survey.surveyedOn, waterSurfaceElevation: String(survey.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum, ...extra,
});
const fixture = (name: string) => join(FIXTURES, name);

function optionsFor(survey: (typeof SURVEYS)[number], extra: Partial<ImportOptions> = {}): ImportOptions {
  return importOptionsSchema.parse(demoImportOptions(survey, extra));
}

async function analyse(projectId: number, path: string, options: ImportOptions, choices = {}) {
  const staged = await writeStagedFile(new Blob([readFileSync(path)]).stream(), path.split("/").pop()!);
  return analyseStagedFile({ path: staged.path, sha256: staged.sha256, fileName: staged.fileName, options, choices: commitChoicesSchema.parse(choices), geometry: await loadProjectGeometry(projectId) });
}

type ApiErrors = { errors: Array<{ field?: string; row?: number; column?: string; message: string }> };

describe("import checks on a baseline file", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  beforeAll(async () => {
    site = await makeDemoSiteProject("checks");
  });

  async function refused(name: string, fields: Record<string, string> = fieldsOf(baseline)) {
    const before = await counts(site.project.id);
    const response = await postSurvey(site.project.id, site.tokens.surveyor, { path: fixture(name) }, fields);
    expect(response.status, name).toBe(422);
    expect(await counts(site.project.id)).toEqual(before);
    return ((await response.json()) as ApiErrors).errors;
  }

  it("guesses the trade's header spellings with units in them (East_ft, North_ft, Sounding_ft, Probe_ft)", async () => {
    const { preview } = await analyse(site.project.id, fixture("header-spellings-with-units.csv"), optionsFor(baseline), { outside: "keep" });
    expect(preview.mapping).toEqual({ id: "PT", easting: "East_ft", northing: "North_ft", depth: "Sounding_ft", probe: "Probe_ft", time: "Date_Time" });
    expect(preview.blockers).toEqual([]);
    // ft in the header and the project's US survey feet differ by 2 parts per million: not a disagreement.
    expect(preview.warnings.join(" ")).not.toMatch(/says/);
  });

  it("a depth header in metres against feet declared is held like the depth-unit check", async () => {
    const { preview } = await analyse(site.project.id, fixture("depth-header-says-metres.csv"), optionsFor(baseline), { outside: "keep" });
    expect(preview.depthUnit?.message).toMatch(/^The column "Depth_m" says metres, but the file's depths were declared as US survey feet \(the project's unit\)\./);
    expect(preview.blockers.join(" ")).toMatch(/another unit than declared/);
    const confirmed = await analyse(site.project.id, fixture("depth-header-says-metres.csv"), optionsFor(baseline), { outside: "keep", acceptDepthUnit: true });
    expect(confirmed.preview.blockers).toEqual([]);
  });

  it("a time of \"yesterday\": its row and column", async () => {
    const errors = await refused("time-yesterday.csv");
    expect(errors).toEqual([expect.objectContaining({ row: 6, column: "time" })]);
    expect(errors[0].message).toMatch(/^time "yesterday" is a word relative to the day it was typed, not a date and time/);
  });

  it("a time in the future in the project's time zone", async () => {
    const errors = await refused("time-in-the-future.csv");
    expect(errors).toEqual([expect.objectContaining({ row: 9, column: "time" })]);
    expect(errors[0].message).toMatch(/^time "2099-09-08T06:50:00-04:00" is in the future: it is now \d{4}-\d{2}-\d{2} \d{2}:\d{2} in the project's time zone/);
  });

  it("a survey date after today is refused", async () => {
    const errors = await refused("header-spellings-with-units.csv", fieldsOf(baseline, { surveyedOn: "2099-01-01" }));
    expect(errors.map((error) => error.message).join(" ")).toMatch(/The survey date 2099-01-01 is after today/);
  });

  it("semicolons (with stray ones at line ends) and vertical bars are named and read, never \"easting is empty\"", async () => {
    for (const [name, words] of [["semicolon-delimited.csv", "semicolons (;)"], ["pipe-delimited.csv", "vertical bars (|)"]] as const) {
      const { preview } = await analyse(site.project.id, fixture(name), optionsFor(baseline), { outside: "keep" });
      expect(preview.warnings, name).toContain(`This file separates columns with ${words}; it was read that way.`);
      expect(preview.fileProblems, name).toEqual([]);
      expect(preview.problemCount, name).toBe(0);
      expect(preview.storedCount, name).toBe(40);
    }
  });

  it("a lon/lat point inside a feet file is named as such", async () => {
    const errors = await refused("lon-lat-point-in-feet-file.csv", fieldsOf(baseline, { outside: "keep" }));
    const row9 = errors.filter((error) => error.row === 9);
    expect(row9).toHaveLength(1);
    expect(row9[0].message).toMatch(/^row 9 looks like longitude\/latitude \(-82\.\d+, 28\.\d+\), not project feet \(EPSG:2237\)/);
  });

  it("an empty file and a header-only file say so plainly", async () => {
    const empty = await refused("empty.csv");
    expect(empty).toEqual([{ field: "file", message: "The file you chose, empty.csv, is empty (0 bytes): there is nothing in it to check. Export the soundings again and choose the new file." }]);
    const headerOnly = await refused("header-only.csv");
    expect(headerOnly.map((error) => error.message)).toContain("The file has a header (point_id, easting, northing, depth, probe, time) but no rows of soundings. Export the soundings again and choose the new file.");
    const { preview } = await analyse(site.project.id, fixture("header-only.csv"), optionsFor(baseline));
    expect(preview.rowsChecked).toBe(false); // zero rows read is an error state, never "every row passes"
    expect(preview.blockers.length).toBeGreaterThan(0);
  });

  it("binary files are refused by their bytes, naming what they seem to be", async () => {
    for (const [name, what] of [["photo-not-csv.png", "a PNG image"], ["soundings-workbook.xlsx", "an Excel workbook (.xlsx)"], ["survey-report.pdf", "a PDF document"]]) {
      const errors = await refused(name);
      expect(errors, name).toHaveLength(1);
      expect(errors[0].message, name).toContain(`The file you chose, ${name}, looks like ${what}, not a CSV text file of soundings.`);
    }
    // A job made from such a file anyway shows no header built from its bytes.
    const { preview } = await analyse(site.project.id, fixture("photo-not-csv.png"), optionsFor(baseline));
    expect(preview.shape.headers).toEqual([]);
    expect(preview.rowsChecked).toBe(false);
    expect(preview.fileProblems).toEqual([expect.stringContaining("looks like a PNG image")]);
  });

  it("spikes: the rule with its unit, their rows, and their places on the plot", async () => {
    const { preview } = await analyse(site.project.id, fixture("spikes.csv"), optionsFor(baseline), { outside: "keep" });
    // computed: IHO S-44 order 1a, a = 0.5 m, b = 0.013 at about 1.2 m depth → √(0.5² + (0.013·1.2)²) ≈ 0.500 m = 1.64 US survey ft.
    expect(preview.spikeRule).toMatch(/^more than 1\.64 ftUS from the median of its neighbours within /);
    expect(preview.qa!.spikes.rows).toEqual(expect.arrayContaining([15, 30]));
    expect(preview.plot!.spikes!.map((spike) => spike.row)).toEqual(expect.arrayContaining([15, 30]));
    expect(preview.warnings.join(" ")).toMatch(/stand out as a spike: more than 1\.64 ftUS .*\(rows .*15.*30/);
  });

  it("one far-off point does not shrink the plot: the frame is the work limit, the point counted at its edge", async () => {
    const { preview } = await analyse(site.project.id, fixture("one-far-off-point.csv"), optionsFor(baseline), { outside: "keep" });
    const crs = projectCrs();
    const limit = WORK_LIMIT.coordinates[0].map(([lon, lat]) => crs.fromLonLat(lon, lat));
    const width = Math.max(...limit.map(([x]) => x)) - Math.min(...limit.map(([x]) => x));
    const plot = preview.plot!;
    // computed: the frame is the work limit's width plus a tenth of its larger side on each side; the point is 50,000 ft east.
    expect(plot.bounds.maxX - plot.bounds.minX).toBeLessThan(width * 1.5);
    expect(plot.beyond).toEqual({ west: 0, east: 1, south: 0, north: 0 });
    expect(plot.outside!.map((point) => point.row)).toEqual([20]);
  });
});

describe("a progress survey with a wrong water-surface elevation is held", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  const file = fixture("progress-wse-zero.csv");
  beforeAll(async () => {
    site = await makeDemoSiteProject("wse");
    const stored = await postSurvey(site.project.id, site.tokens.surveyor, { path: join(DEMO_DIR, baseline.fileName) }, fieldsOf(baseline));
    expect(stored.status).toBe(201);
  });

  it("says nothing with the right water-surface elevation", async () => {
    const { preview } = await analyse(site.project.id, file, optionsFor(progress1), { outside: "keep" });
    expect(preview.bottomShift).toBeNull();
    expect(preview.blockers).toEqual([]);
  });

  it("with 0 instead of about 32 ft: the median shift and the likely cause, held until confirmed", async () => {
    const { preview } = await analyse(site.project.id, file, optionsFor(progress1, { waterSurfaceElevation: 0 }), { outside: "keep" });
    const shift = preview.bottomShift!;
    expect(shift.direction).toBe("down");
    // computed: the bottom moves by the water surface left out (32.1 ft) plus the little this pass dredged.
    expect(shift.medianShift).toBeLessThan(-31.5);
    expect(shift.medianShift).toBeGreaterThan(-34);
    expect(shift.likelyWaterSurface!).toBeGreaterThan(31.5);
    expect(shift.message).toMatch(/^The bottom in this file lies a median 3\d\.\d ftUS lower than the earlier surveys of the same \d+ cells, and below firm sand \(where the probe stopped\) in 100 % of them: far more than dredging could remove\. A whole bottom moving at once is what a wrong water-surface elevation does: 0\.00 ftUS was entered, and about 3\d\.\d ftUS would put the bottom where the earlier surveys found it\./);
    expect(preview.blockers.join(" ")).toMatch(/The whole bottom dropped a median 3\d\.\d ftUS against the earlier surveys/);
  });

  it("the API stores nothing until acceptBottomShift=true", async () => {
    const fields = fieldsOf(progress1, { waterSurfaceElevation: "0" });
    const before = await counts(site.project.id);
    const response = await postSurvey(site.project.id, site.tokens.surveyor, { path: file }, fields);
    expect(response.status).toBe(422);
    expect(await counts(site.project.id)).toEqual(before);
    const { errors } = (await response.json()) as ApiErrors;
    expect(errors.find((error) => error.field === "waterSurfaceElevation")?.message).toMatch(/wrong water-surface elevation.*acceptBottomShift=true/);
    const accepted = await postSurvey(site.project.id, site.tokens.surveyor, { path: file }, { ...fields, acceptBottomShift: "true" });
    expect(accepted.status).toBe(201);
    expect((await counts(site.project.id)).surveys).toBe(before.surveys + 1);
  });

  it("the mapping accepted last is offered first and marked so", async () => {
    const remembered = await ColumnMapping.findOne({ where: { projectId: site.project.id } });
    expect(remembered!.mapping).toMatchObject({ easting: "easting", depth: "depth" });
    const { preview } = await analyse(site.project.id, file, optionsFor(progress1), { outside: "keep", acceptSameFile: true });
    expect(preview.rememberedFields).toEqual(expect.arrayContaining(["easting", "northing", "depth"]));
  });

  it("firm sand still comes from the baseline when the newest surveys read are all progress surveys", async () => {
    const geometry = await loadProjectGeometry(site.project.id);
    const origin = { x: geometry.settings.originX ?? 0, y: geometry.settings.originY ?? 0 };
    // Only the newest survey is read for the bottom (the progress survey stored above, without probes).
    const newestOnly = await previousBottomBins(site.project.id, geometry.settings.cellSize, origin, 1);
    expect(newestOnly.refusal.size).toBeGreaterThan(0);
    const allSurveys = await previousBottomBins(site.project.id, geometry.settings.cellSize, origin, 6);
    expect([...newestOnly.refusal]).toEqual([...allSurveys.refusal]); // the same baseline probes either way
    // computed: the survey confirmed with a water surface of 0 put the bottom below the baseline's firm sand in every shared cell.
    const shared = [...newestOnly.bottom.keys()].filter((key) => newestOnly.refusal.has(key));
    expect(shared.length).toBeGreaterThan(20);
    for (const key of shared) expect(newestOnly.bottom.get(key)!).toBeLessThan(newestOnly.refusal.get(key)!);
  });
});
