import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Papa from "papaparse";
import { isDeepStrictEqual } from "node:util";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { UNZONED_NAME } from "../../shared/volumes/rollup";
import { PERIOD_VOLUME_KEYS } from "../../shared/volumes/period";
import { SURVEYS, ZONES } from "../../sample-data/scenario";
import { AuditEvent, PayPeriodReport, Project, Survey, SurveySnapshot, User, getSequelize } from "~/lib/db.server";
import { getEngineState, serverEnginePool } from "~/lib/engine/engine-state.server";
import { computePeriodFigures, periodCellRows, type PeriodFigures, type PeriodFiguresInput } from "~/lib/engine/period-figures";
import { recomputeProjectStatistics } from "~/lib/engine/recompute.server";
import { presentUser } from "~/lib/auth/users.server";
import { projectPatchSchema, updateProjectSettings } from "~/models/project-setup.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import { ValidationError } from "~/lib/errors";
import { listSignedPeriods, loadPayPeriod, signPayPeriod, type PayPeriodView } from "~/models/pay-periods.server";
import { loadQuantities, quantitiesCsv } from "~/models/quantities.server";
import { setSurveyVerticalBias } from "~/models/survey.server";
import { verticalBiasFromFields, type FieldProblem } from "~/lib/import/form-fields";
import * as quantitiesApi from "~/routes/api.projects.$projectId.quantities";
import * as payPeriodsApi from "~/routes/api.projects.$projectId.pay-periods";
import * as surveyBiasApi from "~/routes/api.projects.$projectId.surveys.$surveyId.bias";
import * as quantitiesCsvApi from "~/routes/api.projects.$projectId.quantities[.]csv";
import * as quantitiesPage from "~/routes/projects.$projectId.quantities";
import * as quantitiesReport from "~/routes/projects.$projectId.quantities.report";
import { requestAs } from "./helpers";
import { importDemoSurveys, makeDemoSiteProject } from "./import-helpers";

// Pay periods on the demo scenario's five surveys, imported through the import path: the default
// period is today's figures, periods between any two surveys add up, the rows add up in every
// export, bad ids are refused by name, and a signed report is kept as issued.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-pay-periods-test-"));
afterAll(closeSequelize);

let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
let project: ProjectView;
let whole: PayPeriodView;

beforeAll(async () => {
  site = await makeDemoSiteProject("pay-periods");
  project = presentProject(site.project);
  await importDemoSurveys(project.id, site.users.surveyor);
  whole = (await loadPayPeriod(project))!;
}, 600_000);

type Volumes = Record<(typeof PERIOD_VOLUME_KEYS)[number], number>;

function expectRowsAddUp(rows: Volumes[], total: Volumes, tolerance: number, label: string) {
  for (const key of PERIOD_VOLUME_KEYS) {
    const sum = rows.reduce((running, row) => running + row[key], 0);
    expect(Math.abs(sum - total[key]), `${label} ${key}`).toBeLessThanOrEqual(tolerance);
  }
}

const apiArgs = async (path: string, userId = site.users.viewer) => ({ request: await requestAs(userId, path), params: { projectId: String(project.id) }, context: {} }) as never;

describe("the default period", () => {
  it("runs from the baseline to the latest survey and is today's figures", async () => {
    expect(whole.surveys.map((survey) => survey.surveyedOn)).toEqual(SURVEYS.map((survey) => survey.surveyedOn));
    expect(whole.whole).toBe(true);
    expect(whole.from.kind).toBe("baseline");
    expect(whole.from.fileName).toBe(SURVEYS[0].fileName);
    expect(whole.from.contentSha256).toMatch(/^[0-9a-f]{64}$/);
    const latest = await SurveySnapshot.findOne({ where: { projectId: project.id }, order: [["surveyedOn", "DESC"]] });
    // invariant: one computation, so the stored figures of the latest date exactly
    for (const key of ["removedVolume", "depositedVolume", "remainingVolume"] as const) {
      expect(whole.figures.total[key], key).toBeCloseTo(latest!.totals[key], 9);
    }
    expect(whole.figures.total.cells).toBe(latest!.totals.cells);
  });

  it("splits removed into paid and over-dredge in every row", () => {
    for (const [name, row] of [...whole.figures.zones.map((zone) => [zone.name, zone] as const), ["project", whole.figures.total] as const]) {
      // invariant: paid + over-dredge = removed
      expect(row.paidVolume + row.overDredgeVolume, name).toBeCloseTo(row.removedVolume, 6);
    }
  });
});

describe("the removed volume's band from the surveys' vertical uncertainty", () => {
  it("is stated with its method, and the zone bands add in quadrature to the project's", () => {
    const { total, zones } = whole.figures;
    expect(total.removedBandVolume).toBeGreaterThan(0);
    // invariant: cells are independent, so the squares of the zone rows' bands add up to the project's
    expect(Math.hypot(...zones.map((zone) => zone.removedBandVolume))).toBeCloseTo(total.removedBandVolume, 6);
    expect(whole.surveys.every((survey) => survey.order === "1a")).toBe(true); // as imported above
    expect(whole.uncertainty).toMatch(/IHO S-44/);
    expect(whole.uncertainty).toMatch(/systematic bias/);
  });

  it("reads each survey's depths from its own water surface (the scenario's levels), and says so", () => {
    // memory: the demo scenario gives every survey its water-surface elevation (sample-data/scenario.ts)
    expect(whole.surveys.map((survey) => survey.depths)).toEqual(SURVEYS.map((survey) => ({ from: "water-surface", waterSurfaceElevation: survey.waterSurfaceElevationFt })));
    expect(whole.uncertainty).toContain(`#${whole.surveys[0].id} order 1a (a 1.64 ftUS, b 0.013), depths from the water surface at ${SURVEYS[0].waterSurfaceElevationFt} ftUS`);
    expect(whole.uncertainty).toMatch(/at each depth d/);
    expect(whole.uncertainty).not.toMatch(/median depth\)/);
  });
});

describe("periods between any two surveys", () => {
  it("consecutive periods add up to the whole: removed − deposited telescopes node by node", async () => {
    let net = 0;
    for (let index = 1; index < whole.surveys.length; index++) {
      const period = (await loadPayPeriod(project, { from: String(whole.surveys[index - 1].id), to: String(whole.surveys[index].id) }))!;
      expect(period.whole).toBe(false);
      net += period.figures.total.removedVolume - period.figures.total.depositedVolume;
      if (index === whole.surveys.length - 1) {
        // invariant: the period ending at the latest survey leaves what the whole leaves
        expect(period.figures.total.remainingVolume).toBeCloseTo(whole.figures.total.remainingVolume, 9);
      }
    }
    // computed: Σ (bottom before − bottom after) over consecutive periods = baseline − latest
    expect(net).toBeCloseTo(whole.figures.total.removedVolume - whole.figures.total.depositedVolume, 6);
  });

  it("an over-dredge allowance set in the tolerances pays more and leaves less over-dredge, without recomputing the stored figures", async () => {
    const manager = presentUser((await User.findByPk(site.users.manager))!);
    // The API's and the settings page's boundary refuses a negative allowance by name.
    const negative = projectPatchSchema.safeParse({ tolerances: { overDredgeAllowance: -0.1 } });
    expect(negative.success).toBe(false);
    expect(negative.error!.issues[0].path).toEqual(["tolerances", "overDredgeAllowance"]);
    const changed = await updateProjectSettings(project, manager, { tolerances: { overDredgeAllowance: 0.5 } });
    expect(changed.recompute).toBeNull();
    expect(changed.settings.tolerances.overDredgeAllowance).toBe(0.5);
    try {
      const allowed = (await loadPayPeriod(presentProject((await Project.findByPk(project.id))!)))!;
      expect(allowed.settings.overDredgeAllowance).toBe(0.5);
      expect(allowed.figures.total.removedVolume).toBeCloseTo(whole.figures.total.removedVolume, 9);
      expect(allowed.figures.total.paidVolume).toBeGreaterThanOrEqual(whole.figures.total.paidVolume);
      expect(allowed.figures.total.overDredgeVolume).toBeLessThanOrEqual(whole.figures.total.overDredgeVolume);
      expect(allowed.method).toContain("over-dredge allowance of 0.5 ftUS");
    } finally {
      await Project.update({ overDredgeAllowance: 0 }, { where: { id: project.id } });
    }
  });
});

describe("a period is computed in the engine pool", () => {
  /** The pool's period jobs from now on: what each was given and what it gave back. */
  function watchPeriodJobs() {
    const pool = serverEnginePool();
    expect(pool, "the tests run with the engine pool (ENGINE_THREADS ≥ 1)").not.toBeNull();
    return vi.spyOn(pool!, "computePeriodFigures");
  }

  it("and its figures are exactly those computed on the request thread, every cell, zone and the project", async () => {
    const jobs = watchPeriodJobs();
    try {
      const ids = whole.surveys.map((survey) => String(survey.id));
      // Periods no earlier test read, so each is computed now.
      const periods = [[1, 3], [0, 2], [2, 4], [0, 3]].map(([from, to]) => ({ from: ids[from], to: ids[to] }));
      const read: PayPeriodView[] = [];
      for (const query of periods) read.push((await loadPayPeriod(project, query))!);
      expect(jobs).toHaveBeenCalledTimes(periods.length);
      const state = (await getEngineState(project.id))!;
      for (let index = 0; index < periods.length; index++) {
        const input = jobs.mock.calls[index][0] as PeriodFiguresInput;
        const inPool = (await jobs.mock.results[index].value) as PeriodFigures;
        expect(read[index].figures).toBe(inPool);
        // The rasters cross to the thread in shared memory, not copied on the request thread.
        expect(input.rasters.muckTop.buffer).toBeInstanceOf(SharedArrayBuffer);
        expect(input.grids.nodeCell.buffer).toBeInstanceOf(SharedArrayBuffer);
        // invariant: the same pure computation on this thread gives the same figures bit for bit,
        // also from every later survey's bottom rather than only those up to the period's end.
        const onThread = computePeriodFigures(input);
        const fromWholeState = computePeriodFigures({ ...input, rasters: { ...input.rasters, progress: state.periods.progress } });
        expect(inPool.total, `period ${periods[index].from} → ${periods[index].to}`).toEqual(onThread.total);
        expect(inPool.zones).toEqual(onThread.zones);
        expect(isDeepStrictEqual(inPool, onThread), "every cell's figures").toBe(true);
        expect(isDeepStrictEqual(inPool, fromWholeState), "every cell's figures from the whole state").toBe(true);
        expect(periodCellRows(inPool)).toHaveLength(inPool.total.cells);
      }
    } finally {
      jobs.mockRestore();
    }
  });

  it("and the first read right after a recompute answers with the recomputed state's figures, computed once for readers at once", async () => {
    const ids = whole.surveys.map((survey) => String(survey.id));
    const before = (await loadPayPeriod(project, { from: ids[1], to: ids[4] }))!;
    // The recompute stamp is the time the cells were computed: let it move on from the import's.
    await new Promise((resolve) => setTimeout(resolve, 1100));
    await getSequelize().transaction((transaction) => recomputeProjectStatistics(project.id, transaction));
    const jobs = watchPeriodJobs();
    try {
      // Two readers at once, as the page and an export would.
      const [first, second] = await Promise.all([loadPayPeriod(project), loadPayPeriod(project, { from: ids[1], to: ids[4] })]);
      const again = await loadPayPeriod(project);
      expect(jobs).toHaveBeenCalledTimes(2);
      expect(again!.figures).toBe(first!.figures); // kept after the first read
      // invariant: the default period is today's figures, as the recompute stored them
      const latest = await SurveySnapshot.findOne({ where: { projectId: project.id }, order: [["surveyedOn", "DESC"]] });
      for (const key of ["removedVolume", "depositedVolume", "remainingVolume"] as const) expect(first!.figures.total[key], key).toBeCloseTo(latest!.totals[key], 9);
      // invariant: the same surveys and settings recomputed give the same periods as before it, bit for bit
      expect(isDeepStrictEqual(first!.figures, whole.figures), "the whole period").toBe(true);
      expect(isDeepStrictEqual(second!.figures, before.figures), "a period between two later surveys").toBe(true);
    } finally {
      jobs.mockRestore();
    }
  });
});

describe("zone rows add up to the project for every column", () => {
  it("in the JSON API", async () => {
    const [first, second] = [whole.surveys[1], whole.surveys[3]];
    const response = (await quantitiesApi.loader(await apiArgs(`/api/projects/${project.id}/quantities?from=${first.id}&to=${second.id}`))) as Response;
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.from.id).toBe(first.id);
    expect(body.to.id).toBe(second.id);
    expect(body.zones.map((zone: { name: string }) => zone.name)).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    expectRowsAddUp(body.zones, body.total, 1e-6, "API zones");
    expectRowsAddUp(body.cells, body.total, 1e-6, "API cells");
  });

  it("in the CSV, with the period's surveys, hashes and settings", async () => {
    const csv = quantitiesCsv(await loadQuantities(project, { from: String(whole.surveys[0].id), to: String(whole.surveys[2].id) }), new Date("2026-12-01T00:00:00Z"));
    const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
    expect(rows.find((row) => row[0] === "Period from")?.[1]).toContain(whole.surveys[0].contentSha256);
    expect(rows.find((row) => row[0] === "Period to")?.[1]).toContain(SURVEYS[2].fileName);
    expect(rows.find((row) => row[0] === "Settings in force")?.[1]).toMatch(/over-dredge allowance 0 ftUS/);
    const header = rows.findIndex((row) => row[0] === "period zone");
    const totalAt = rows.findIndex((row) => row[0] === "Period project total");
    const parse = (row: string[]): Volumes => Object.fromEntries(PERIOD_VOLUME_KEYS.map((key, index) => [key, Number(row[index + 1])])) as Volumes;
    const zoneRows = rows.slice(header + 1, totalAt);
    expect(zoneRows.map((row) => row[0])).toEqual([...ZONES.map((zone) => zone.name), UNZONED_NAME]);
    // computed: each volume printed to 0.01 is within 0.005 of the true one
    expectRowsAddUp(zoneRows.map(parse), parse(rows[totalAt]), 0.005 * (zoneRows.length + 1) + 1e-9, "CSV");
  });

  it("in the printable report's data", async () => {
    const report = await quantitiesReport.loader(await apiArgs(`/projects/${project.id}/quantities/report?from=${whole.surveys[1].id}&to=${whole.surveys[4].id}`));
    expect(report.period!.from.id).toBe(whole.surveys[1].id);
    expectRowsAddUp(report.period!.figures.zones, report.period!.figures.total, 1e-6, "report");
  });
});

describe("bad period ends are refused by name", () => {
  const cases: Array<[string, string, string]> = [
    ["from=abc", "from", "abc"],
    ["to=999999999", "to", "999999999"],
  ];
  for (const [query, field, value] of cases) {
    it(`${query} → 422 naming ${field}`, async () => {
      const response = (await quantitiesApi.loader(await apiArgs(`/api/projects/${project.id}/quantities?${query}`))) as Response;
      expect(response.status).toBe(422);
      const body = await response.json();
      expect(body.errors[0]).toMatchObject({ field, value });
    });
  }

  it("a period that runs backwards → 422 naming to, on the CSV too", async () => {
    const query = `from=${whole.surveys[3].id}&to=${whole.surveys[1].id}`;
    const response = (await quantitiesCsvApi.loader(await apiArgs(`/api/projects/${project.id}/quantities.csv?${query}`))) as Response;
    expect(response.status).toBe(422);
    expect((await response.json()).errors[0].field).toBe("to");
  });

  it("an id that is no survey in force of this project → a ValidationError naming from", async () => {
    const refused = await loadPayPeriod(project, { from: "0" }).catch((error: unknown) => error);
    expect(refused).toBeInstanceOf(ValidationError);
    expect((refused as ValidationError).details[0].field).toBe("from");
  });
});

describe("a named period: a calendar month", () => {
  it("?month= runs from the survey that closed the month before to the month's last survey, with the month named", async () => {
    // The demo's surveys in force by date; October's period is computed by hand from them: the last
    // survey before 1 October, to the last survey on or before 31 October.
    const dates = whole.surveys.map((survey) => survey.surveyedOn);
    const month = dates[dates.length - 1]!.slice(0, 7);
    const first = `${month}-01`;
    const fromIndex = Math.max(0, dates.filter((date) => date < first).length - 1);
    const toIndex = dates.length - 1;
    const response = (await quantitiesApi.loader(await apiArgs(`/api/projects/${project.id}/quantities?month=${month}`))) as Response;
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.from.id).toBe(whole.surveys[fromIndex]!.id);
    expect(body.to.id).toBe(whole.surveys[toIndex]!.id);
    expect(body.month).toEqual({ key: month, name: expect.stringContaining(month.slice(0, 4)) });
    expect(body.months.map((entry: { key: string }) => entry.key)).toContain(month);
    // The same figures as the period asked for by its surveys.
    const bySurveys = await loadPayPeriod(project, { from: String(whole.surveys[fromIndex]!.id), to: String(whole.surveys[toIndex]!.id) });
    expect(body.total.removedVolume).toBeCloseTo(bySurveys!.figures.total.removedVolume, 9);
  });

  it("a month with no survey of its own, a malformed month, or a month with from/to → 422 naming month", async () => {
    for (const query of ["month=2099-01", "month=2026-13", `month=2026-10&from=${whole.surveys[0]!.id}`]) {
      const response = (await quantitiesApi.loader(await apiArgs(`/api/projects/${project.id}/quantities?${query}`))) as Response;
      expect(response.status, query).toBe(422);
      expect((await response.json()).errors[0].field, query).toBe("month");
    }
  });
});

describe("signed periods", () => {
  it("the manager signs a period; it is stored as issued and audit-logged; a later recompute shows beside it as a difference", async () => {
    const [from, to] = [whole.surveys[1], whole.surveys[4]];
    const manager = { id: site.users.manager, email: "m@example.org", name: "Pat Manager", isSiteAdmin: false, mayCreateProjects: false };
    const id = await signPayPeriod(project, manager, { from: String(from.id), to: String(to.id), signedName: "Pat Manager" }, "127.0.0.1");
    const stored = (await PayPeriodReport.findByPk(id))!;
    const period = (await loadPayPeriod(project, { from: String(from.id), to: String(to.id) }))!;
    expect(stored.snapshot.total).toEqual(period.figures.total);
    expect(stored.snapshot.from.contentSha256).toBe(from.contentSha256);
    expect(stored.signedName).toBe("Pat Manager");
    const audit = await AuditEvent.findOne({ where: { projectId: project.id, action: "pay-period-signed" } });
    expect(audit?.detail).toMatchObject({ reportId: id, fromSurveyId: from.id, toSurveyId: to.id });

    // The printable report of the signed period prints the snapshot; another id of no report is 404.
    const printed = await quantitiesReport.loader(await apiArgs(`/projects/${project.id}/quantities/report?signed=${id}`));
    expect(printed.signed!.name).toBe("Pat Manager");
    expect(printed.period!.figures.total).toEqual(stored.snapshot.total);
    const missing = await quantitiesReport.loader(await apiArgs(`/projects/${project.id}/quantities/report?signed=999999999`)).catch((thrown: unknown) => thrown);
    expect((missing as { init: { status: number } }).init.status).toBe(404);

    let [listed] = await listSignedPeriods(project);
    expect(listed.id).toBe(id);
    for (const key of PERIOD_VOLUME_KEYS) expect(listed.difference![key]).toBe(0); // same surfaces, same settings

    // A different allowance recomputes the period differently: the signed figures stay as issued.
    await Project.update({ overDredgeAllowance: 1 }, { where: { id: project.id } });
    try {
      const changed = presentProject((await Project.findByPk(project.id))!);
      // The page's list serves the reports as issued and does not recompute them: under the new
      // allowance the period is not computed yet, so it is listed without a difference, to be compared when asked.
      const [fromSnapshot] = await listSignedPeriods(changed, "cached");
      expect(fromSnapshot).toMatchObject({ id, compared: false, difference: null, recomputeNote: null });
      expect(fromSnapshot.snapshot.total).toEqual(stored.snapshot.total);
      const page = await quantitiesPage.loader(await apiArgs(`/projects/${project.id}/quantities`));
      expect(page.signed.find((report) => report.id === id)).toMatchObject({ compared: false, difference: null });

      [listed] = await listSignedPeriods(changed);
      expect(listed.compared).toBe(true);
      expect(listed.snapshot.total).toEqual(stored.snapshot.total);
      const now = (await loadPayPeriod(changed, { from: String(from.id), to: String(to.id) }))!;
      // computed: an allowance of 1 ft pays part of what was over-dredge, so the figures now are not the cached ones of allowance 0
      expect(now.figures.total.paidVolume).toBeGreaterThan(stored.snapshot.total.paidVolume);
      expect(listed.difference!.paidVolume).toBeCloseTo(now.figures.total.paidVolume - stored.snapshot.total.paidVolume, 9);
      expect(listed.difference!.removedVolume).toBeCloseTo(0, 9);
      // Once computed (here by the comparison), the page's list shows the difference from that computation.
      const [cheaply] = await listSignedPeriods(changed, "cached");
      expect(cheaply.compared).toBe(true);
      expect(cheaply.difference).toEqual(listed.difference);
    } finally {
      await Project.update({ overDredgeAllowance: 0 }, { where: { id: project.id } });
    }
  });

  it("through the page: only the manager may sign, and a name is required", async () => {
    const form = (fields: Record<string, string>) => new URLSearchParams(fields).toString();
    const path = `/projects/${project.id}/quantities`;
    const post = async (userId: number, fields: Record<string, string>) =>
      quantitiesPage.action({
        request: await requestAs(userId, path, { method: "POST", headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: new URL((await requestAs(null, path)).url).origin }, body: form(fields) }),
        params: { projectId: String(project.id) }, context: {},
      } as never).catch((thrown: unknown) => thrown);
    const fields = { intent: "sign", from: String(whole.surveys[0].id), to: String(whole.surveys[1].id), signedName: "Pat Manager", reviewed: "yes" };
    const refused = await post(site.users.viewer, fields);
    expect(refused instanceof Response ? refused.status : (refused as { init?: { status?: number } }).init?.status).toBe(403);
    const unnamed = (await post(site.users.manager, { ...fields, signedName: " " })) as { data: { errors: Record<string, string> }; init: { status: number } };
    expect(unnamed.init.status).toBe(400);
    expect(unnamed.data.errors.signedName).toBeTruthy();
    const before = await PayPeriodReport.count({ where: { projectId: project.id } });
    await post(site.users.manager, fields);
    expect(await PayPeriodReport.count({ where: { projectId: project.id } })).toBe(before + 1);
  });

  it("through the API: the manager's token signs (201), a viewer's is refused (403), and the signed list comes back", async () => {
    const url = `http://127.0.0.1/api/projects/${project.id}/pay-periods`;
    const params = { projectId: String(project.id) };
    const sign = (token: string, body: unknown) =>
      payPeriodsApi.action({ request: new Request(url, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json", Authorization: `Bearer ${token}` } }), params, context: {} } as never) as Promise<Response>;
    const body = { from: whole.surveys[1].id, to: whole.surveys[2].id, signedName: "Pat Manager", reviewed: true };
    const before = await PayPeriodReport.count({ where: { projectId: project.id } });
    expect((await sign(site.tokens.viewer, body)).status).toBe(403);
    const unreviewed = await sign(site.tokens.manager, { ...body, reviewed: false });
    expect(unreviewed.status).toBe(422);
    expect(((await unreviewed.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field)).toEqual(["reviewed"]);
    expect(await PayPeriodReport.count({ where: { projectId: project.id } })).toBe(before);
    const signed = await sign(site.tokens.manager, body);
    expect(signed.status).toBe(201);
    const { id } = (await signed.json()) as { id: number };
    const listed = (await (await payPeriodsApi.loader({ request: new Request(url, { headers: { Authorization: `Bearer ${site.tokens.viewer}` } }), params, context: {} } as never) as Response).json()) as { signed: Array<{ id: number; signedName: string; snapshot: { from: { id: number } } }> };
    const row = listed.signed.find((report) => report.id === id);
    expect(row?.signedName).toBe("Pat Manager");
    expect(row?.snapshot.from.id).toBe(whole.surveys[1].id);
  });
});

describe("a survey's recorded reference bias", () => {
  it("waits for a change that holds the project's row (an import, a retraction) instead of deadlocking with it", async () => {
    // Every survey change takes the project's row first, then the survey's (lib/import/commit.server.ts).
    // A bias taken survey first waited for the project's row at its audit record (the record's
    // foreign key) while the other change waited for the survey: a deadlock, one of the two refused.
    const survey = whole.surveys[2];
    const bias = { value: 0.05, unit: "ft" as const, source: "staff gauge read to 0.05 ft" };
    const other = await getSequelize().transaction();
    let setting: Promise<unknown> | null = null;
    try {
      await Project.findByPk(project.id, { transaction: other, lock: other.LOCK.UPDATE });
      setting = setSurveyVerticalBias(project, { surveyId: survey.id, userId: site.users.manager, ip: null, bias });
      // The bias's transaction is under way and waiting when the other change asks for the survey.
      await new Promise((done) => setTimeout(done, 300));
      await Survey.findOne({ where: { id: survey.id }, transaction: other, lock: other.LOCK.UPDATE });
      await other.commit();
    } catch (error) {
      await other.rollback().catch(() => undefined);
      await setting?.catch(() => undefined);
      throw error;
    }
    await expect(setting).resolves.toEqual(bias);
    await setSurveyVerticalBias(project, { surveyId: survey.id, userId: site.users.manager, ip: null, bias: null });
  });

  it("widens the period's band by area × bias, is audited, is kept out of a report signed before, and clears", async () => {
    const [baseline, first] = whole.surveys;
    const before = (await loadPayPeriod(project, { from: String(baseline.id), to: String(first.id) }))!;
    const manager = site.users.manager;
    const signedId = await signPayPeriod(project, presentUser((await User.findByPk(manager))!), { from: String(baseline.id), to: String(first.id), signedName: "Pat Manager" }, null);
    await setSurveyVerticalBias(project, { surveyId: first.id, userId: manager, ip: null, bias: { value: 0.1, unit: "ft", source: "staff gauge read to 0.1 ft" } });
    const after = (await loadPayPeriod(project, { from: String(baseline.id), to: String(first.id) }))!;
    // Every cell that changed from the baseline to the first progress survey was sounded by it, so its
    // end rests on that survey: the bias moves removed by the whole changed area (IHO S-44: a
    // systematic error of the reference does not average down over soundings).
    // computed: 0.1 ft (international) = 0.1 × 0.3048 m ÷ (1200/3937 m per US survey foot) = 0.09999980 ftUS
    const biasFtUs = (0.1 * 0.3048 * 3937) / 1200;
    expect(biasFtUs).toBeCloseTo(0.0999998, 7);
    const biasVolume = before.figures.total.biasVolumePerUnit * biasFtUs;
    expect(biasVolume).toBeGreaterThan(0);
    // computed: band² = random² + (changed area × bias)², the two parts independent (quadrature)
    expect(after.figures.total.removedBandVolume).toBeCloseTo(Math.hypot(before.figures.total.removedBandVolume, biasVolume), 6);
    // negative control: the random part alone is narrower
    expect(after.figures.total.removedBandVolume - before.figures.total.removedBandVolume).toBeGreaterThan(0.01);
    expect(after.uncertainty).toContain("reference bias 0.1 ft (staff gauge read to 0.1 ft)");
    const audit = await AuditEvent.findOne({ where: { projectId: project.id, action: "survey-bias-set" }, order: [["id", "DESC"]] });
    expect(audit?.detail).toMatchObject({ surveyId: first.id, before: null, after: { value: 0.1, unit: "ft", source: "staff gauge read to 0.1 ft" } });
    // The report signed before keeps the band it was issued with.
    const kept = (await listSignedPeriods(project)).find((report) => report.id === signedId);
    expect(kept?.snapshot.total.removedBandVolume).toBeCloseTo(before.figures.total.removedBandVolume, 9);
    // Cleared, the band is the random part again.
    await setSurveyVerticalBias(project, { surveyId: first.id, userId: manager, ip: null, bias: null });
    const cleared = (await loadPayPeriod(project, { from: String(baseline.id), to: String(first.id) }))!;
    expect(cleared.figures.total.removedBandVolume).toBeCloseTo(before.figures.total.removedBandVolume, 9);
  });

  it("is refused with the field named: negative, too large, not a number, or without its source", () => {
    const problemsOf = (fields: Record<string, string>) => {
      const problems: FieldProblem[] = [];
      const bias = verticalBiasFromFields(fields, "us-ft", problems);
      return { bias, fields: problems.map((problem) => problem.field), messages: problems.map((problem) => problem.message).join(" ") };
    };
    expect(problemsOf({}).bias).toBeNull();
    expect(problemsOf({}).fields).toEqual([]);
    expect(problemsOf({ verticalBiasValue: "-0.1", verticalBiasSource: "gauge" }).fields).toEqual(["verticalBiasValue"]);
    expect(problemsOf({ verticalBiasValue: "abc", verticalBiasSource: "gauge" }).messages).toContain("verticalBiasValue is not a number");
    expect(problemsOf({ verticalBiasValue: "0.1" }).fields).toEqual(["verticalBiasSource"]);
    // 1 m is the bound: 3.3 ft is over it (3.3 × 0.3048 = 1.00584 m), 3.2 ft is not (0.97536 m)
    expect(problemsOf({ verticalBiasValue: "3.3", verticalBiasUnit: "ft", verticalBiasSource: "gauge" }).messages).toContain("wrong water-surface elevation or datum");
    expect(problemsOf({ verticalBiasValue: "3.2", verticalBiasUnit: "ft", verticalBiasSource: "gauge" }).bias).toEqual({ value: 3.2, unit: "ft", source: "gauge" });
    // the unit defaults to the project's
    expect(problemsOf({ verticalBiasValue: "0,05", verticalBiasSource: "RTK tide" }).bias).toEqual({ value: 0.05, unit: "us-ft", source: "RTK tide" });
  });

  it("is set and cleared over the API after the import (surveyor, manager), refused with the field named, and read back with the survey", async () => {
    const survey = whole.surveys[1];
    const put = (token: string, body: unknown, surveyId: number | string = survey.id) =>
      surveyBiasApi.action({
        request: new Request(`http://127.0.0.1/api/projects/${project.id}/surveys/${surveyId}/bias`, { method: "PUT", body: JSON.stringify(body), headers: { "Content-Type": "application/json", Authorization: `Bearer ${token}` } }),
        params: { projectId: String(project.id), surveyId: String(surveyId) }, context: {},
      } as never) as Promise<Response>;
    const bias = { value: 0.06, unit: "ft", source: "staff gauge read to 0.05 ft" };
    expect((await put(site.tokens.viewer, { verticalBias: bias })).status).toBe(403);
    const refused = await put(site.tokens.surveyor, { verticalBias: { ...bias, value: -1 } });
    expect(refused.status).toBe(422);
    expect(((await refused.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field)).toEqual(["verticalBias.value"]);
    expect((await put(site.tokens.surveyor, { verticalBias: bias }, 999_999)).status).toBe(404);
    const saved = await put(site.tokens.surveyor, { verticalBias: bias });
    expect(saved.status).toBe(200);
    expect(await saved.json()).toEqual({ verticalBias: bias });
    const audit = await AuditEvent.findOne({ where: { projectId: project.id, action: "survey-bias-set" }, order: [["id", "DESC"]] });
    expect((audit!.detail as { after: unknown }).after).toEqual(bias);
    const period = (await loadPayPeriod(project, { from: String(whole.surveys[0].id), to: String(survey.id) }))!;
    expect(period.uncertainty).toContain("reference bias 0.06 ft (staff gauge read to 0.05 ft)");
    const cleared = await put(site.tokens.manager, { verticalBias: null });
    expect(await cleared.json()).toEqual({ verticalBias: null });
    expect((await loadPayPeriod(project, { from: String(whole.surveys[0].id), to: String(survey.id) }))!.uncertainty).not.toContain("reference bias 0.06 ft");
  });
});
