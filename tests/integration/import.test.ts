import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { computeSurveyVolumes, type EngineSettings } from "../../shared/pipeline";
import { soundingElevations } from "../../shared/soundings/elevations";
import { parseSoundingsCsv } from "../../shared/soundings/parse-csv";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT } from "../../sample-data/scenario";
import { AuditEvent, Project, Sounding, Survey, getSequelize } from "~/lib/db.server";
import { ArchivedProjectError } from "~/lib/errors";
import { importSurveyFile } from "~/lib/import/import-service.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { DEMO_DIR, FIXTURES, counts, makeDemoSiteProject, postSurvey, projectCrs, storedTotals, surveyRequest } from "./import-helpers";

// The upload limit is lowered for this file so the 413 test needs only a few megabytes; staged
// files go to a temporary directory.
process.env.UPLOAD_MAX_BYTES = String(3 * 1024 * 1024);
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-import-test-"));

afterAll(closeSequelize);

const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
const progress1 = SURVEYS.find((survey) => survey.key === "progress-1")!;
const progress2 = SURVEYS.find((survey) => survey.key === "progress-2")!;
const progress3 = SURVEYS.find((survey) => survey.key === "progress-3")!;
const fieldsOf = (survey: (typeof SURVEYS)[number]) => ({
  kind: survey.kind,
  surveyedOn: survey.surveyedOn,
  waterSurfaceElevation: String(survey.waterSurfaceElevationFt),
  timeZone: PROJECT.timeZone,
  datum: PROJECT.verticalDatum,
});
const demoFile = (survey: (typeof SURVEYS)[number]) => ({ path: join(DEMO_DIR, survey.fileName) });
const fixture = (name: string) => ({ path: join(FIXTURES, name) });

/**
 * The engine run directly on the same files, without the import (parse → elevations → pipeline),
 * as the independent reference the stored cell results must add up to. Source: computed.
 */
function directTotals(surveys: Array<(typeof SURVEYS)[number]>) {
  const crs = projectCrs();
  const workLimit = [WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat)))];
  const points = surveys.map((survey) => {
    const parsed = parseSoundingsCsv(readFileSync(join(DEMO_DIR, survey.fileName), "utf8"));
    const { elevation, refusalElevation } = soundingElevations(parsed, survey.waterSurfaceElevationFt);
    return { parsed, elevation, refusal: refusalElevation };
  });
  const [base, ...later] = points;
  const settings: EngineSettings = {
    cellSize: GRID.cellSizeFt, resolution: GRID.rasterResolutionFt, maxEdge: GRID.maxTriangleEdgeFt,
    originX: GRID.originEastingFt, originY: GRID.originNorthingFt, rotationDegrees: GRID.rotationDegrees,
    tolerance: GRID.toleranceFt, firmShare: GRID.firmShare, minCoverage: GRID.minCoverage,
    surveyNoise: GRID.toleranceFt, rasterPrecision: "float32",
  };
  const result = computeSurveyVolumes(
    {
      baseline: { easting: base.parsed.easting, northing: base.parsed.northing, elevation: base.elevation },
      firm: { easting: base.parsed.easting, northing: base.parsed.northing, elevation: base.refusal! },
      progress: later.map(({ parsed, elevation }) => ({ easting: parsed.easting, northing: parsed.northing, elevation })),
    },
    workLimit,
    settings,
  );
  // ft³ → yd³: 27 ft³ in a cubic yard (NIST SP 811).
  return { plannedVolume: result.totals.plannedVolumeCubicLength / 27, removedVolume: result.totals.removedVolumeCubicLength / 27, remainingVolume: result.totals.remainingVolumeCubicLength / 27, cells: result.totals.cells };
}

function expectClose(actual: number, expected: number, relative = 1e-9) {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.max(Math.abs(expected) * relative, 1e-6));
}

describe("sounding import through the API", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  let baselineId = 0;
  let progressId = 0;

  beforeAll(async () => {
    site = await makeDemoSiteProject("api");
  });

  it("stores a good baseline: every row, and cell results whose totals equal the engine's direct computation", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, demoFile(baseline), fieldsOf(baseline));
    expect(response.status).toBe(201);
    const body = (await response.json()) as { id: number; rowCount: number; warnings: string[] };
    baselineId = body.id;
    const rows = readFileSync(join(DEMO_DIR, baseline.fileName), "utf8").trim().split("\n").length - 1;
    expect(body.rowCount).toBe(rows); // practice: one sounding per data row
    expect(await Sounding.count({ where: { surveyId: body.id } })).toBe(rows);
    const stored = await storedTotals(site.project.id);
    const direct = directTotals([baseline]);
    expect(stored.cells).toBe(direct.cells);
    expectClose(stored.plannedVolume, direct.plannedVolume); // computed: engine run directly on the file
    expectClose(stored.remainingVolume, direct.remainingVolume); // computed
    expect(stored.removedVolume).toBe(0); // computed: nothing removed before any progress survey
    const first = await Sounding.findOne({ where: { surveyId: body.id }, order: [["sourceRow", "ASC"]] });
    const [firstRow] = readFileSync(join(DEMO_DIR, baseline.fileName), "utf8").split("\n")[1].split(",").slice(3, 4).map(Number);
    expectClose(first!.elevation, baseline.waterSurfaceElevationFt - firstRow, 1e-12); // published rule: elevation = water surface − depth
    expect(await AuditEvent.count({ where: { projectId: site.project.id, action: "survey-imported" } })).toBe(1);
  });

  it("adds a progress survey; stored totals follow the engine on baseline + progress", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, demoFile(progress1), fieldsOf(progress1));
    expect(response.status).toBe(201);
    progressId = ((await response.json()) as { id: number }).id;
    const stored = await storedTotals(site.project.id);
    const direct = directTotals([baseline, progress1]);
    expectClose(stored.removedVolume, direct.removedVolume); // computed
    expectClose(stored.remainingVolume, direct.remainingVolume); // computed
    expect(direct.removedVolume).toBeGreaterThan(0); // the scenario dredged the vent basin before progress 1
    expect((await counts(site.project.id)).snapshots).toBe(2); // one per survey date
  });

  it("flags the same file uploaded again (422, nothing stored)", async () => {
    const before = await counts(site.project.id);
    const response = await postSurvey(site.project.id, site.tokens.surveyor, demoFile(progress1), fieldsOf(progress1));
    expect(response.status).toBe(422);
    const body = (await response.json()) as { errors: Array<{ message: string }> };
    expect(body.errors.some((error) => /same file was imported before/.test(error.message))).toBe(true);
    expect(await counts(site.project.id)).toEqual(before);
  });

  it("retracting the progress survey recomputes the statistics without it; restoring brings them back", async () => {
    const withProgress = await storedTotals(site.project.id);
    const refused = await surveyRequest(site.project.id, progressId, site.tokens.surveyor, "DELETE", { reason: "wrong gauge reading" });
    expect(refused.status).toBe(403);
    const retracted = await surveyRequest(site.project.id, progressId, site.tokens.manager, "DELETE", { reason: "wrong gauge reading" });
    expect(retracted.status).toBe(200);
    const without = await storedTotals(site.project.id);
    const baselineOnly = directTotals([baseline]);
    expectClose(without.removedVolume, 0); // computed: only the baseline is active
    expectClose(without.remainingVolume, baselineOnly.remainingVolume); // computed
    expect((await Survey.findByPk(progressId))!.retractedReason).toBe("wrong gauge reading");
    const restored = await surveyRequest(site.project.id, progressId, site.tokens.manager, "PATCH", { status: "active" });
    expect(restored.status).toBe(200);
    const again = await storedTotals(site.project.id);
    expectClose(again.removedVolume, withProgress.removedVolume); // invariant: restore returns the same figures
    expect(await AuditEvent.count({ where: { projectId: site.project.id, action: ["survey-retracted", "survey-restored"] } })).toBe(2);
  });

  it("lists the surveys and shows one with its QA", async () => {
    const { loader } = await import("~/routes/api.projects.$projectId.surveys");
    const listRequest = new Request(`http://127.0.0.1:3999/api/projects/${site.project.id}/surveys`, { headers: { Authorization: `Bearer ${site.tokens.viewer}` } });
    const list = (await loader({ request: listRequest, params: { projectId: String(site.project.id) }, context: {} } as never)) as Response;
    const { surveys } = (await list.json()) as { surveys: Array<{ id: number; kind: string; status: string }> };
    expect(surveys.map((survey) => [survey.id, survey.kind, survey.status])).toEqual([[progressId, "progress", "active"], [baselineId, "baseline", "active"]]);
    const detail = await surveyRequest(site.project.id, baselineId, site.tokens.viewer, "GET");
    expect(detail.status).toBe(200);
    const { survey } = (await detail.json()) as { survey: { kind: string; qa: { cellsWithSoundings: number; crossings: { comparisons: number } } } };
    expect(survey.kind).toBe("baseline");
    expect(survey.qa.cellsWithSoundings).toBeGreaterThan(0);
  });

  it("lands two imports sent at once, and the statistics reflect both", async () => {
    const [second, third] = await Promise.all([
      postSurvey(site.project.id, site.tokens.surveyor, demoFile(progress2), fieldsOf(progress2)),
      postSurvey(site.project.id, site.tokens.manager, demoFile(progress3), fieldsOf(progress3)),
    ]);
    expect([second.status, third.status]).toEqual([201, 201]);
    const stored = await storedTotals(site.project.id);
    const direct = directTotals([baseline, progress1, progress2, progress3]);
    expectClose(stored.removedVolume, direct.removedVolume); // computed
    expectClose(stored.remainingVolume, direct.remainingVolume); // computed
    expect((await counts(site.project.id)).snapshots).toBe(4);
  });
});

describe("files with problems store nothing", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  beforeAll(async () => {
    site = await makeDemoSiteProject("bad");
  });

  async function expectRefused(name: string, fields: Record<string, string> = fieldsOf(baseline)) {
    const before = await counts(site.project.id);
    const response = await postSurvey(site.project.id, site.tokens.surveyor, fixture(name), fields);
    expect(response.status).toBe(422);
    expect(await counts(site.project.id)).toEqual(before);
    return ((await response.json()) as { errors: Array<{ row: number | null; column: string; value?: string; message: string }> }).errors;
  }

  it("a non-number: its row and column", async () => {
    const errors = await expectRefused("non-number-depth.csv");
    expect(errors).toEqual([{ row: 5, column: "depth", value: "4.1x", message: "water depth is not a number" }]);
  });

  it("an empty depth", async () => {
    const errors = await expectRefused("empty-depth.csv");
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({ row: 4, column: "depth" });
    expect(errors[0].message).toMatch(/empty/);
  });

  it("a probe shallower than the depth", async () => {
    const errors = await expectRefused("probe-shallower-than-depth.csv");
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({ row: 3, column: "probe" });
    expect(errors[0].message).toMatch(/shallower than the water depth/);
  });

  it("longitude/latitude declared as state plane: says so", async () => {
    const errors = await expectRefused("lon-lat-declared-as-state-plane.csv");
    expect(errors.some((error) => /longitude and latitude/.test(error.message) && /EPSG:4326/.test(error.message))).toBe(true);
  });

  it("the same lon/lat file declared as EPSG:4326 is taken", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, fixture("lon-lat-declared-as-state-plane.csv"), { ...fieldsOf(baseline), crs: "EPSG:4326" });
    expect(response.status).toBe(201);
    const survey = (await response.json()) as { id: number };
    const first = await Sounding.findOne({ where: { surveyId: survey.id }, order: [["sourceRow", "ASC"]] });
    // computed: the fixture's first row came from easting 600072.43 ft; the round trip through lon/lat (7 decimals ≈ 1 cm) keeps it within 0.05 ft.
    expect(Math.abs(first!.easting - 600072.43)).toBeLessThan(0.05);
    await surveyRequest(site.project.id, survey.id, site.tokens.manager, "DELETE", { reason: "test file" });
  });

  it("metres declared as feet: says the numbers are off by 3.2808", async () => {
    const errors = await expectRefused("metres-declared-as-feet.csv");
    expect(errors.some((error) => /look like metres/.test(error.message) && /3\.2808/.test(error.message))).toBe(true);
  });

  it("exact duplicate rows", async () => {
    const errors = await expectRefused("duplicate-rows.csv");
    expect(errors).toEqual([expect.objectContaining({ row: 12, message: "repeats row 11 exactly; leave one of them out" })]);
  });

  it("duplicate rows pass when the repeated row is excluded explicitly", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, fixture("duplicate-rows.csv"), { ...fieldsOf(baseline), excludeRows: "[12]", surveyedOn: "2026-09-01" });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { id: number; rowCount: number };
    expect(body.rowCount).toBe(41);
    expect(await Sounding.count({ where: { surveyId: body.id } })).toBe(40);
    await surveyRequest(site.project.id, body.id, site.tokens.manager, "DELETE", { reason: "test file" });
  });

  it("points outside the work limit: kept with a warning, or dropped by choice", async () => {
    const kept = await postSurvey(site.project.id, site.tokens.surveyor, fixture("outside-work-limit.csv"), fieldsOf(baseline));
    expect(kept.status).toBe(201);
    const keptBody = (await kept.json()) as { id: number; warnings: string[] };
    expect(keptBody.warnings).toContain("2 soundings lie outside the work limit and will be kept.");
    expect(await Sounding.count({ where: { surveyId: keptBody.id } })).toBe(40);
    const dropped = await postSurvey(site.project.id, site.tokens.surveyor, fixture("outside-work-limit.csv"), { ...fieldsOf(baseline), outside: "drop", acceptSameFile: "true" });
    expect(dropped.status).toBe(201);
    const droppedBody = (await dropped.json()) as { id: number };
    const rows = (await Sounding.findAll({ where: { surveyId: droppedBody.id }, attributes: ["sourceRow"] })).map((sounding) => sounding.sourceRow);
    expect(rows).toHaveLength(38);
    expect(rows).not.toContain(7);
    expect(rows).not.toContain(8);
    for (const id of [keptBody.id, droppedBody.id]) await surveyRequest(site.project.id, id, site.tokens.manager, "DELETE", { reason: "test file" });
  });

  it("semicolons, decimal commas and a byte-order mark are read as a good file", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, fixture("semicolon-decimal-comma-bom.csv"), { ...fieldsOf(baseline), surveyedOn: "2026-08-30" });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { id: number };
    const first = await Sounding.findOne({ where: { surveyId: body.id }, order: [["sourceRow", "ASC"]] });
    // The fixture's row 2 reads "600072,43;1679945,81;3,81;5,21" (practice: decimal comma).
    expect(first).toMatchObject({ sourceRow: 2, easting: 600072.43, northing: 1679945.81, depth: 3.81, probe: 5.21, pointId: "BL-00001" });
    expectClose(first!.elevation, baseline.waterSurfaceElevationFt - 3.81, 1e-12);
    await surveyRequest(site.project.id, body.id, site.tokens.manager, "DELETE", { reason: "test file" });
  });

  it("a database failure in the middle of a commit leaves no survey and no soundings", async () => {
    const before = await counts(site.project.id);
    const staged = await writeStagedFile(new Blob([readFileSync(join(DEMO_DIR, baseline.fileName))]).stream(), baseline.fileName);
    let soundingsWritten = 0;
    const attempt = importSurveyFile({
      projectId: site.project.id,
      userId: site.users.surveyor,
      staged,
      options: { kind: "baseline", surveyedOn: "2026-09-02", timeZone: PROJECT.timeZone, waterSurfaceElevation: baseline.waterSurfaceElevationFt, fileHasElevations: false, datum: "NAVD88", crs: PROJECT.crs, lengthUnit: "us-ft", surveyOrder: "1a" },
      choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: true },
      afterSoundings: async (transaction) => {
        soundingsWritten = await Sounding.count({ transaction });
        await getSequelize().query("SELECT * FROM a_table_that_does_not_exist", { transaction });
      },
    });
    await expect(attempt).rejects.toThrow(/a_table_that_does_not_exist/);
    expect(soundingsWritten).toBeGreaterThan(before.soundings); // the failure came after the soundings were written
    expect(await counts(site.project.id)).toEqual(before);
  });

  it("an import still running when its project is archived stores nothing (checked again under the project's lock at commit)", async () => {
    const before = await counts(site.project.id);
    const staged = await writeStagedFile(new Blob([readFileSync(join(DEMO_DIR, baseline.fileName))]).stream(), baseline.fileName);
    // The request was let through while the project was open; it is archived before the commit.
    await Project.update({ archivedAt: new Date("2026-12-01T15:00:00Z") }, { where: { id: site.project.id } });
    try {
      const attempt = importSurveyFile({
        projectId: site.project.id,
        userId: site.users.surveyor,
        staged,
        options: { kind: "baseline", surveyedOn: "2026-09-03", timeZone: PROJECT.timeZone, waterSurfaceElevation: baseline.waterSurfaceElevationFt, fileHasElevations: false, datum: "NAVD88", crs: PROJECT.crs, lengthUnit: "us-ft", surveyOrder: "1a" },
        choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: true },
      });
      await expect(attempt).rejects.toBeInstanceOf(ArchivedProjectError);
      await expect(attempt).rejects.toThrow(/archived on 2026-12-01 while this file was being checked/);
      expect(await counts(site.project.id)).toEqual(before);
    } finally {
      await Project.update({ archivedAt: null }, { where: { id: site.project.id } });
    }
  });
});

describe("API access", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  beforeAll(async () => {
    site = await makeDemoSiteProject("access");
  });

  it("refuses a viewer's upload with 403 and stores nothing", async () => {
    const response = await postSurvey(site.project.id, site.tokens.viewer, fixture("duplicate-rows.csv"), fieldsOf(baseline));
    expect(response.status).toBe(403);
    expect((await counts(site.project.id)).surveys).toBe(0);
  });

  it("answers 401 without a session or token, and for a revoked-looking token", async () => {
    expect((await postSurvey(site.project.id, null, fixture("duplicate-rows.csv"), fieldsOf(baseline))).status).toBe(401);
    expect((await postSurvey(site.project.id, "fs_not-a-real-token-0123456789", fixture("duplicate-rows.csv"), fieldsOf(baseline))).status).toBe(401);
  });

  it("answers 413 for a file over the size limit", async () => {
    const row = "X-1,600100.00,1679950.00,4.00,5.00,2026-09-08T07:00:00-04:00\n";
    const content = "point_id,easting,northing,depth,probe,time\n" + row.repeat(Math.ceil((3.2 * 1024 * 1024) / row.length));
    const response = await postSurvey(site.project.id, site.tokens.surveyor, { name: "big.csv", content }, fieldsOf(baseline));
    expect(response.status).toBe(413);
    expect((await counts(site.project.id)).surveys).toBe(0);
  });

  it("rejects form fields that do not validate, naming the field", async () => {
    const response = await postSurvey(site.project.id, site.tokens.surveyor, fixture("duplicate-rows.csv"), { kind: "baseline", surveyedOn: "08/09/2026", waterSurfaceElevation: "32.4" });
    expect(response.status).toBe(422);
    const { errors } = (await response.json()) as { errors: Array<{ field?: string }> };
    expect(errors.map((error) => error.field)).toContain("surveyedOn");
  });
});
