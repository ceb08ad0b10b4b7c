import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { instantOfLocal } from "../../shared/local-time";
import {
  AuditEvent, DailyReport, DailyReportAmendment, OutgoingMail, ReportSubscriber, DewateringShift, Dive, DiveCell, DiveTeam, Find, GeotextileTube, Haul, HaulSite, Hold, MonitoringStation, Project, Survey, SurveySnapshot, TubeFill, WildlifeStandDown, type Role,
} from "~/lib/db.server";
import { ConflictError } from "~/lib/errors";
import { presentProject } from "~/lib/auth/project-view.server";
import { action as rulesAction } from "~/routes/api.projects.$projectId.water-quality.rules";
import { action as readingsAction } from "~/routes/api.projects.$projectId.water-quality.readings";
import { loader as dayLoader } from "~/routes/api.projects.$projectId.days.$date";
import { action as signAction } from "~/routes/api.projects.$projectId.days.$date.sign";
import { action as amendAction } from "~/routes/api.projects.$projectId.days.$date.amendments";
import { action as countersignRequestAction } from "~/routes/api.projects.$projectId.days.$date.countersign-requests";
import { action as subscribersAction, loader as subscribersLoader } from "~/routes/api.projects.$projectId.report-subscribers";
import { action as subscriberAction } from "~/routes/api.projects.$projectId.report-subscribers.$subscriberId";
import {
  addAmendment, addSubscriber, batchDates, countersignReport, dailyReportBatchPdf, dailyReportPdf, listMonthDays, lookUpCountersign, removeSubscriber, saveEnteredNotes, sendDailyReportBatch, signDailyReport,
} from "~/models/daily-reports.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import type { MailMessage } from "~/lib/mail/mail.server";
import { getObject, listObjectKeys } from "~/lib/storage/storage.server";
import { pdfPages } from "../pdf-text";
import { addMember, makeProject, makeUser, requestAs, thrown } from "./helpers";

afterAll(closeSequelize);

const TZ = "America/New_York";
const DAY = "2026-06-10";
const NEXT = "2026-06-11";
const PREVIOUS = "2026-06-09";
const local = (day: string, hh: number, mm = 0) => new Date(instantOfLocal(day, hh * 60 + mm, TZ));

type Handler = (args: never) => Promise<Response>;
let projectId: number;
const users = new Map<Role, { id: number; name: string }>();
const call = async (handler: Handler, role: Role, path: string, init: RequestInit = {}, params: Record<string, string> = {}) => {
  const request = await requestAs(users.get(role)!.id, path, init);
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never);
};
const postJson = (handler: Handler, role: Role, path: string, body: unknown, params: Record<string, string> = {}) =>
  call(handler, role, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json", Origin: "http://127.0.0.1:3999" } }, params);
const dayPath = (date: string) => `/api/projects/${projectId}/days/${date}`;
const getDay = async (role: Role, date: string) => call(dayLoader as never, role, dayPath(date), {}, { date });

// The source records, kept here so the expected figures are their sums.
const dives = [
  { day: DAY, team: "Alpha", bottomMinutes: 42, maxDepth: 11.5, cells: ["B3", "B4"] },
  { day: DAY, team: "Alpha", bottomMinutes: 37, maxDepth: 13, cells: ["B4"] },
  { day: DAY, team: "Bravo", bottomMinutes: 55, maxDepth: 9, cells: ["D7"] },
  { day: NEXT, team: "Bravo", bottomMinutes: 60, maxDepth: 20, cells: ["E1"] },
];
const shifts = [
  { day: DAY, pumpHours: 5, flowM3PerH: 120, drySolidsKg: 7_000, neatPolymerKg: 6.5 },
  { day: DAY, pumpHours: 3.5, flowM3PerH: 80, drySolidsKg: 3_100.4, neatPolymerKg: 2.25 },
  { day: PREVIOUS, pumpHours: 8, flowM3PerH: 100, drySolidsKg: 9_000, neatPolymerKg: 9 },
];
const hauls = [
  { day: DAY, ticket: "H-101", drySolidsKg: 9_100 },
  { day: DAY, ticket: "H-102", drySolidsKg: 8_750.5 },
  { day: NEXT, ticket: "H-103", drySolidsKg: 9_000 },
];

beforeAll(async () => {
  const project = await makeProject("daily-report");
  projectId = project.id;
  await Project.update({ timeZone: TZ }, { where: { id: projectId } });
  for (const role of ["manager", "dive-supervisor", "dewatering", "viewer", "outreach"] as Role[]) {
    const user = await makeUser(`day-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, { id: user.id, name: user.name });
  }
  const member = (name: string) => ({ name, email: "", duty: "diver" });
  const teams = {
    Alpha: await DiveTeam.create({ projectId, name: "Alpha", hoses: [], members: [member("a"), member("b"), member("c"), member("d")] }),
    Bravo: await DiveTeam.create({ projectId, name: "Bravo", hoses: [], members: [member("e"), member("f"), member("g")] }),
  };
  for (const dive of dives) {
    const row = await Dive.create({ projectId, diveDate: dive.day, teamId: teams[dive.team as "Alpha" | "Bravo"].id, diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: dive.bottomMinutes, maxDepth: dive.maxDepth, notes: "" });
    for (const [index, label] of dive.cells.entries()) await DiveCell.create({ diveId: row.id, projectId, row: index, col: 0, label });
  }
  for (const shift of shifts) {
    await DewateringShift.create({
      projectId, shiftDate: shift.day, startAt: "07:00", endAt: "15:00", pumpHours: shift.pumpHours, slurryFlowValue: shift.flowM3PerH, slurryFlowUnit: "m3/h",
      totaliserStart: null, totaliserEnd: null, totaliserUnit: null, solidsByWeight: 0.1, slurrySpecificGravity: null, solidsSpecificGravity: 2.5,
      polymerProduct: "P-1", polymerLot: null, doseMgPerL: 10, stockPercent: 0.5, drySolidsKg: shift.drySolidsKg, neatPolymerKg: shift.neatPolymerKg, notes: "", idempotencyKey: null,
    });
  }
  const tube = await GeotextileTube.create({ projectId, name: "T1", circumference: 18, length: 30, capacityDryMassPerLength: 1000, status: "filling", notes: "", createdById: null });
  await TubeFill.create({ projectId, tubeId: tube.id, shiftId: null, fillDate: DAY, slurryVolumeM3: null, drySolidsKg: 1000 });
  const site = await HaulSite.create({ projectId, name: "Reuse field", kind: "reuse", permitNumber: "" });
  for (const haul of hauls) {
    await Haul.create({ projectId, haulDate: haul.day, ticketNumber: haul.ticket, truck: "T-9", siteId: site.id, loadWetMass: 20, loadVolume: null, cakeSolidsByWeight: 0.45, cakeSolidsFromSample: false, solidsSpecificGravity: 2.5, drySolidsKg: haul.drySolidsKg, notes: "", idempotencyKey: null });
  }
  await MonitoringStation.create({ projectId, name: "C1", kind: "compliance", positionX: null, positionY: null, depthRule: null });
  await MonitoringStation.create({ projectId, name: "C2", kind: "compliance", positionX: null, positionY: null, depthRule: null });
  // Through the readings API, which files each reading on its local day: 23:30 EDT is already the 11th in UTC.
  const rule = await postJson(rulesAction as never, "manager", `/api/projects/${projectId}/water-quality/rules`, { kind: "absolute", limit: 50, source: "Test permit condition" });
  expect(rule.status).toBe(201);
  for (const [takenAt, value] of [["2026-06-10T08:00:00-04:00", 12], ["2026-06-10T23:30:00-04:00", 61], ["2026-06-11T00:30:00-04:00", 12]] as const) {
    const response = await postJson(readingsAction as never, "dewatering", `/api/projects/${projectId}/water-quality/readings`, { station: "C1", takenAt, value, unit: "NTU" });
    expect(response.status, await response.clone().text()).toBe(201);
  }
  // From 22:00 on the 10th to 01:00 on the 11th: 2 h of it fall on the 10th.
  await WildlifeStandDown.create({ projectId, species: "manatee", startedAt: local(DAY, 22), departedAt: local(NEXT, 0, 30), endsAt: local(NEXT, 1), waitMinutes: 30, shutdownDistance: 50 });
  const find = (sequence: number, category: "faunal" | "cultural", foundAt: Date) => Find.create({
    projectId, catalogueNumber: `FS-2031-${String(sequence).padStart(3, "0")}`, catalogueYear: 2031, catalogueSequence: sequence, category, description: "x", material: "", count: 1, taxon: null, element: null, condition: "",
    cellRow: 1, cellCol: 1, cellLabel: "B1", positionX: 600_010, positionY: 1_600_010, depthBelowSurface: null, depthInMuck: null, diveId: null, teamId: null, finder: "Diver", foundAt, fieldTag: "", accessionNumber: null, statusNote: null, idempotencyKey: null,
  });
  const cultural = await find(1, "cultural", local(DAY, 23, 30));
  await find(2, "faunal", local(DAY, 9));
  await find(3, "faunal", local(NEXT, 0, 30));
  await Hold.create({ projectId, findId: cultural.id, radiusM: 50, radiusSource: "permit", placedAt: local(DAY, 23, 35), liftedAt: null, authorisedBy: null, liftNote: null });
});

describe("the day's compiled figures", () => {
  it("equal the sums of the project's records for the local day, including records at 23:30 local time", async () => {
    const response = await getDay("viewer", DAY);
    expect(response.status).toBe(200);
    const body = await response.json();
    const onDay = <T extends { day: string }>(rows: T[]) => rows.filter((row) => row.day === DAY);
    const sum = <T>(rows: T[], pick: (row: T) => number) => rows.reduce((total, row) => total + pick(row), 0);
    expect(body.date).toBe(DAY);
    expect(body.dives.count).toBe(onDay(dives).length);
    expect(body.dives.bottomMinutes).toBe(sum(onDay(dives), (dive) => dive.bottomMinutes)); // 42 + 37 + 55 = 134
    expect(body.dives.maxDepth).toBe(13);
    expect(body.cells).toEqual(["B3", "B4", "D7"]);
    expect(body.teams.map((team: { team: string; bottomMinutes: number }) => [team.team, team.bottomMinutes])).toEqual([["Alpha", 79], ["Bravo", 55]]);
    expect(body.production.shifts).toBe(2);
    expect(body.production.pumpHours).toBe(sum(onDay(shifts), (shift) => shift.pumpHours)); // 8.5
    expect(body.production.slurryPumpedM3).toBeCloseTo(sum(onDay(shifts), (shift) => shift.pumpHours * shift.flowM3PerH), 6); // 600 + 280
    expect(body.production.drySolidsKg).toBeCloseTo(sum(onDay(shifts), (shift) => shift.drySolidsKg), 6); // 10 100.4
    expect(body.production.neatPolymerKg).toBeCloseTo(sum(onDay(shifts), (shift) => shift.neatPolymerKg), 6); // 8.75
    expect(body.production.tubeFills).toBe(1);
    expect(body.production.haulLoads).toBe(2);
    expect(body.production.haulDrySolidsKg).toBeCloseTo(sum(onDay(hauls), (haul) => haul.drySolidsKg), 6); // 17 850.5
    expect(body.production.haulTickets).toEqual(["H-101", "H-102"]);
    // C1 sampled at 08:00 and 23:30 local on the 10th; the 00:30 reading belongs to the 11th.
    expect(body.waterQuality.readings.find((row: { station: string }) => row.station === "C1")).toMatchObject({ count: 2, exceeding: 1, withinLimit: 1, maxValue: 61, verdict: "exceeds" });
    expect(body.waterQuality.exceedances).toEqual([{ station: "C1", at: "2026-06-11T03:30:00.000Z", value: 61, unit: "NTU" }]);
    expect(body.waterQuality.readings.find((row: { station: string }) => row.station === "C2").count).toBe(0);
    expect(body.missing).toContain("compliance station C2 not sampled");
    expect(body.missing).toContain("no weather entered");
    // The 23:30 exceedance stops work (still open): its last half hour of the day is lost.
    expect(body.interruptions).toEqual([expect.objectContaining({ kind: "stand-down", reason: "manatee", lostHours: 2 }), expect.objectContaining({ kind: "stop-work", end: null, lostHours: 0.5 })]);
    // The stop-work's half hour falls inside the stand-down (22:00 to 01:00): an hour lost to two causes counts once, 2 h (not 2 + 0.5).
    expect(body.lostHours).toBe(2);
    // The stop-work's agency notice: not given yet, with when it is due (from the stop-work's own record).
    expect(body.interruptions[1]).toMatchObject({ agencyNotified: null, notifyBy: expect.stringMatching(/^2026-06-1\dT/) });
    expect(body.finds).toEqual({ byCategory: { cultural: 1, faunal: 1 }, catalogueNumbers: ["FS-2031-001", "FS-2031-002"] });
    expect(body.holds.placed).toEqual(["FS-2031-001"]);
    // A funders' document: no find location travels in it.
    expect(JSON.stringify(body)).not.toMatch(/600010|1600010|positionX|cellLabel/);
    expect(body.signed).toBeUndefined();
  });

  it("the next day counts only its own records", async () => {
    const body = await (await getDay("manager", NEXT)).json();
    expect(body.dives).toMatchObject({ count: 1, bottomMinutes: 60 });
    expect(body.production.haulTickets).toEqual(["H-103"]);
    expect(body.finds.catalogueNumbers).toEqual(["FS-2031-003"]);
    // The stand-down's last hour, and the whole 24-hour day of the stop-work not yet resumed.
    expect(body.interruptions.map((event: { kind: string; lostHours: number }) => [event.kind, event.lostHours])).toEqual([["stand-down", 1], ["stop-work", 24]]);
    // Both at once for the stand-down's hour: the 24-hour day loses 24 h, never 25.
    expect(body.lostHours).toBe(24);
  });

  it("on the day of a survey, shows the removed volume and the cells newly at firm sand since the survey before it", async () => {
    // Two surveys' stored totals (what a recompute leaves per survey date); the stand-in survey row
    // only satisfies the snapshot's reference. Expected figures are the differences, by hand.
    const survey = await Survey.create({
      projectId, kind: "progress", surveyedOn: DAY, timeZone: TZ, waterSurfaceElevation: 32, fileHasElevations: false, datum: "NAVD88", crs: "EPSG:2237", lengthUnit: "us-ft",
      fileName: "stand-in.csv", contentSha256: "0".repeat(64), rowCount: 0, soundingCount: 0, uploadedById: null, retractedById: null, qa: {},
    });
    const totals = (removedVolume: number, remainingVolume: number, cellsAtFirmSand: number) => ({
      plannedVolume: 6_348, removedVolume, depositedVolume: 0, remainingVolume, cells: 292, cellsAtFirmSand, cellsConfirmed: 0, cellsInWork: 0, cellsUntouched: 0, cellsNoData: 0,
    });
    const snapshot = (surveyedOn: string, figures: ReturnType<typeof totals>) => SurveySnapshot.create({
      projectId, surveyedOn, lastSurveyId: survey.id, totals: figures, zones: [], cellCols: 0, cellRows: 0, firstCol: 0, firstRow: 0,
      remainingVolumes: Buffer.alloc(0), removedVolumes: Buffer.alloc(0), statuses: Buffer.alloc(0), computedAt: new Date(),
    });
    await snapshot("2026-05-27", totals(1_905.9, 4_442.1, 44));
    await snapshot(DAY, totals(2_480.4, 3_867.6, 61));
    const body = await (await getDay("viewer", DAY)).json();
    // 2,480.4 − 1,905.9 = 574.5 yd³ removed; 61 − 44 = 17 cells
    expect(body.production.survey).toEqual({ surveyedOn: DAY, since: "2026-05-27", removedVolume: 574.5, cellsReachedFirmSand: 17, remainingVolume: 3_867.6, volumeLabel: "yd³" });
    expect((await (await getDay("viewer", NEXT)).json()).production.survey).toBeNull();
  });

  it("is read by every project role except outreach; a date that cannot exist is 404", async () => {
    expect((await getDay("outreach", DAY)).status).toBe(403);
    expect((await getDay("dewatering", DAY)).status).toBe(200);
    expect((await getDay("manager", "2026-02-30")).status).toBe(404);
  });
});

describe("signing and amendments", () => {
  it("an amendment before signing is refused (the report is still edited directly)", async () => {
    expect((await postJson(amendAction as never, "manager", `${dayPath(DAY)}/amendments`, { text: "early" }, { date: DAY })).status).toBe(409);
  });

  it("only a manager or dive supervisor signs; the typed name signs; a second signature is 409", async () => {
    const project = presentProject((await Project.findByPk(projectId))!);
    await saveEnteredNotes(project, { id: users.get("dive-supervisor")!.id, name: "x", email: "", isSiteAdmin: false, mayCreateProjects: false }, DAY, { conditions: "Overcast", airTemperature: "24 °C", wind: "SW 10 kn", rain: "none", effect: "none", inspections: "", safety: "", notes: "" });
    expect((await postJson(signAction as never, "viewer", `${dayPath(DAY)}/sign`, { name: "V" }, { date: DAY })).status).toBe(403);
    expect((await postJson(signAction as never, "dive-supervisor", `${dayPath(DAY)}/sign`, { name: "" }, { date: DAY })).status).toBe(422);
    const signed = await postJson(signAction as never, "dive-supervisor", `${dayPath(DAY)}/sign`, { name: "Dana Reyes" }, { date: DAY });
    expect(signed.status).toBe(201);
    const body = await signed.json();
    expect(body.signed.name).toBe("Dana Reyes");
    expect(body.missing).not.toContain("no weather entered");
    expect(body.dives.bottomMinutes).toBe(134);
    expect((await postJson(signAction as never, "manager", `${dayPath(DAY)}/sign`, { name: "Again" }, { date: DAY })).status).toBe(409);
    expect(await AuditEvent.count({ where: { projectId, action: "daily-report-signed" } })).toBe(1);
    // Locked: entered notes are refused once signed.
    expect(await thrown(() => saveEnteredNotes(project, { id: users.get("manager")!.id, name: "m", email: "", isSiteAdmin: false, mayCreateProjects: false }, DAY, { conditions: "Rain", airTemperature: "", wind: "", rain: "", effect: "", inspections: "", safety: "", notes: "" }))).toBeInstanceOf(ConflictError);
  });

  it("the signed figures stay as signed when a record is added later; an amendment shows beside them", async () => {
    const team = await DiveTeam.findOne({ where: { projectId, name: "Alpha" } });
    await Dive.create({ projectId, diveDate: DAY, teamId: team!.id, diverName: "Late", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 10, maxDepth: 5, notes: "" });
    const amended = await postJson(amendAction as never, "manager", `${dayPath(DAY)}/amendments`, { text: "A 10-minute dive by Late was logged after signing." }, { date: DAY });
    expect(amended.status).toBe(201);
    const body = await (await getDay("viewer", DAY)).json();
    expect(body.dives.bottomMinutes).toBe(134);
    expect(body.signed.amendments).toEqual([expect.objectContaining({ text: "A 10-minute dive by Late was logged after signing." })]);
  });
});

const asUser = (role: Role) => ({ id: users.get(role)!.id, name: users.get(role)!.name, email: "", isSiteAdmin: false, mayCreateProjects: false });
const projectView = async () => presentProject((await Project.findByPk(projectId))!);

describe("the PDF", () => {
  it("has the page's figures for the day, in one or two pages; a draft is rendered anew each time", async () => {
    const project = await projectView();
    // The next day is still a draft: its figures as compiled now.
    const { bytes, stored } = await dailyReportPdf(project, NEXT);
    expect(stored).toBe(false);
    expect(bytes.subarray(0, 5).toString()).toBe("%PDF-");
    const pages = await pdfPages(bytes);
    expect(pages.length).toBeLessThanOrEqual(2);
    const text = pages.join("\n");
    // computed: the NEXT day's sums (one dive of 60 min, ticket H-103, find FS-2031-003), as the page shows them
    expect(text).toContain(`Daily report · ${NEXT}`);
    expect(text).toContain("Draft");
    expect(text).toMatch(/1\s*dives · 60\s*bottom minutes/);
    expect(text).toContain("H-103");
    expect(text).toContain("FS-2031-003");
    expect(text).toContain("no weather entered");
    // A funders' document: no find location.
    expect(text).not.toMatch(/600010|1600010/);
  });

  it("of a signed report is stored once per state and served from storage after that", async () => {
    const project = await projectView();
    const first = await dailyReportPdf(project, DAY);
    expect(first.stored).toBe(true);
    const keys = await listObjectKeys(`projects/${projectId}/daily-reports/${DAY}/`);
    // Signed, then amended once (by the test above): that state's file.
    expect(keys).toContain(`projects/${projectId}/daily-reports/${DAY}/signed-a1.pdf`);
    const again = await dailyReportPdf(project, DAY);
    expect(Buffer.compare(again.bytes, first.bytes)).toBe(0);
    const text = (await pdfPages(first.bytes)).join("\n");
    // computed: the signed figures (134 bottom minutes; the late 10-minute dive came after signing)
    expect(text).toMatch(/3\s*dives · 134\s*bottom minutes/);
    expect(text).toContain("Dana Reyes");
    expect(text).toContain("A 10-minute dive by Late was logged after signing.");
    expect(text).toContain("Agency inspector (countersignature) — not signed");
  });
});

describe("the inspector's countersignature", () => {
  it("goes by a one-time e-mailed link; the report becomes countersigned; the link is then spent", async () => {
    const path = `${dayPath(DAY)}/countersign-requests`;
    expect((await postJson(countersignRequestAction as never, "viewer", path, { email: "inspector@agency.example" }, { date: DAY })).status).toBe(403);
    expect((await postJson(countersignRequestAction as never, "manager", path, { email: "not an address" }, { date: DAY })).status).toBe(422);
    // An unsigned day has nothing to countersign.
    expect((await postJson(countersignRequestAction as never, "manager", `${dayPath(PREVIOUS)}/countersign-requests`, { email: "inspector@agency.example" }, { date: PREVIOUS })).status).toBe(409);
    const first = await postJson(countersignRequestAction as never, "dive-supervisor", path, { email: "First.Inspector@agency.example" }, { date: DAY });
    expect(first.status).toBe(201);
    expect((await first.json()).email).toBe("first.inspector@agency.example");
    const sent = await postJson(countersignRequestAction as never, "dive-supervisor", path, { email: "inspector@agency.example" }, { date: DAY });
    expect(sent.status).toBe(201);
    const mails = await OutgoingMail.findAll({ where: { toAddress: ["first.inspector@agency.example", "inspector@agency.example"] }, order: [["id", "ASC"]] });
    expect(mails).toHaveLength(2);
    const tokenOf = (mail: OutgoingMail) => /\/countersign\/([A-Za-z0-9_-]+)/.exec(mail.bodyText)![1]!;
    // The newer link replaces the older one.
    expect((await lookUpCountersign(tokenOf(mails[0]!))).status).toBe("used");
    const token = tokenOf(mails[1]!);
    // The amendment (made by the test above) is dated a minute back, so it plainly came before the countersignature.
    const dayReport = await DailyReport.findOne({ where: { projectId, localDate: DAY } });
    await DailyReportAmendment.update({ createdAt: new Date(Date.now() - 60_000) }, { where: { reportId: dayReport!.id } });
    const open = await lookUpCountersign(token);
    expect(open.status).toBe("open");
    if (open.status === "open") expect(open.view.report.dives.bottomMinutes).toBe(134);
    expect(await countersignReport(token, "Morgan Alvarez", "127.0.0.1")).toEqual({ ok: true, date: DAY });
    expect(await countersignReport(token, "Someone Else", "127.0.0.1")).toEqual({ ok: false, reason: "used" });
    expect((await lookUpCountersign(token)).status).toBe("used");
    expect(await countersignReport("not-a-token", "X")).toEqual({ ok: false, reason: "unknown" });
    const body = await (await getDay("viewer", DAY)).json();
    expect(body.signed.countersigned).toMatchObject({ name: "Morgan Alvarez", email: "inspector@agency.example" });
    // Amended, then countersigned: the inspector countersigned the report with its amendment beside it.
    expect(body.state).toBe("countersigned");
    expect(await AuditEvent.count({ where: { projectId, action: "daily-report-countersigned" } })).toBe(1);
    expect(await AuditEvent.count({ where: { projectId, action: "daily-report-countersign-requested" } })).toBe(2);
    // Countersigned already: no new link.
    expect((await postJson(countersignRequestAction as never, "manager", path, { email: "inspector@agency.example" }, { date: DAY })).status).toBe(409);
    const text = (await pdfPages((await dailyReportPdf(await projectView(), DAY)).bytes)).join("\n");
    expect(text).toContain("Morgan Alvarez");
    expect(text).toContain("countersigned");
  });

  it("an expired link is refused", async () => {
    const row = await DailyReport.findOne({ where: { projectId, localDate: DAY } });
    const project = await projectView();
    await row!.update({ countersignedAt: null, countersignedByName: null });
    const { token } = await (await import("~/models/daily-reports.server")).requestCountersign(project, asUser("manager"), DAY, "late@agency.example", "http://127.0.0.1", null, new Date(Date.now() - 15 * 86_400_000));
    expect((await lookUpCountersign(token)).status).toBe("expired");
    expect(await countersignReport(token, "Late")).toEqual({ ok: false, reason: "expired" });
    await row!.update({ countersignedAt: new Date(), countersignedByName: "Morgan Alvarez" });
  });
});

describe("subscribers and the two-week batch", () => {
  it("receive the signed report by e-mail with its PDF attached, read from storage when sent", async () => {
    const project = await projectView();
    const manager = asUser("manager");
    const viewerEmail = (await (await import("~/lib/db.server")).User.findByPk(users.get("viewer")!.id))!.email;
    const member = await addSubscriber(project, manager, { userId: users.get("viewer")!.id });
    expect(member).toMatchObject({ email: viewerEmail, member: users.get("viewer")!.name });
    const outside = await addSubscriber(project, manager, { email: "Contracts@Agency.example" });
    expect(outside).toEqual({ id: outside.id, email: "contracts@agency.example", member: null });
    expect(await thrown(() => addSubscriber(project, manager, { email: "contracts@agency.example" }))).toBeInstanceOf(ConflictError);
    expect(await thrown(() => addSubscriber(project, manager, { userId: 999_999 }))).toHaveProperty("details", [{ field: "userId", message: "That person is not a member of this project." }]);
    await signDailyReport(project, asUser("dive-supervisor"), NEXT, "Dana Reyes", null);
    const report = await DailyReport.findOne({ where: { projectId, localDate: NEXT } });
    const mails = await OutgoingMail.findAll({ where: { ref: `daily-report:${report!.id}` }, order: [["toAddress", "ASC"]] });
    expect(mails.map((mail) => mail.toAddress)).toEqual(["contracts@agency.example", viewerEmail].sort());
    expect(mails[0]!.attachments).toEqual([{ storageKey: `projects/${projectId}/daily-reports/${NEXT}/signed.pdf`, filename: `${project.slug}-daily-report-${NEXT}.pdf`, contentType: "application/pdf" }]);
    // The outbox reads the stored file when it sends (a stand-in transport catches what would go out).
    const sentMails: MailMessage[] = [];
    await deliverDue(new Date(Date.now() + 1000), async (mail) => { sentMails.push(mail); });
    const attached = sentMails.find((mail) => mail.to === "contracts@agency.example")!.attachments![0]!;
    expect(attached.filename).toBe(`${project.slug}-daily-report-${NEXT}.pdf`);
    const stored = await getObject(`projects/${projectId}/daily-reports/${NEXT}/signed.pdf`);
    expect(Buffer.compare(attached.content, stored!.bytes)).toBe(0);
    expect((await pdfPages(attached.content)).join("\n")).toMatch(/1\s*dives · 60\s*bottom minutes/);
    await removeSubscriber(project, manager, member.id);
    expect(await ReportSubscriber.count({ where: { projectId } })).toBe(1);
  });

  it("a batch is at most 14 days, one PDF with each day, sent to the subscribers", async () => {
    expect(batchDates("2026-06-01", "2026-06-14")).toHaveLength(14);
    expect(() => batchDates("2026-06-01", "2026-06-15")).toThrow(/at most 14 days/);
    expect(() => batchDates("2026-06-10", "2026-06-09")).toThrow(/comes before the first/);
    // Across a month's end and a leap day (calendar arithmetic, not 24-hour steps).
    expect(batchDates("2028-02-27", "2028-03-01")).toEqual(["2028-02-27", "2028-02-28", "2028-02-29", "2028-03-01"]);
    const project = await projectView();
    const { bytes } = await dailyReportBatchPdf(project, PREVIOUS, NEXT);
    const pages = await pdfPages(bytes);
    const text = pages.join("\n");
    for (const date of [PREVIOUS, DAY, NEXT]) expect(text).toContain(`Daily report · ${date}`);
    expect(pages.length).toBeLessThanOrEqual(6);
    const sent = await sendDailyReportBatch(project, asUser("manager"), PREVIOUS, NEXT);
    expect(sent).toBe(1);
    const mail = await OutgoingMail.findOne({ where: { ref: `daily-report-batch:${projectId}` } });
    expect(mail!.toAddress).toBe("contracts@agency.example");
    expect(mail!.attachments![0]!.filename).toBe(`${project.slug}-daily-reports-${PREVIOUS}-to-${NEXT}.pdf`);
    expect(await getObject(mail!.attachments![0]!.storageKey)).not.toBeNull();
  });

  it("are managed through the API by the manager alone: listed, added (409 for an address already on the list), removed", async () => {
    const path = `/api/projects/${projectId}/report-subscribers`;
    const added = await postJson(subscribersAction as never, "manager", path, { email: "Inspector@Agency.example" });
    expect(added.status).toBe(201);
    const { subscriber } = await added.json();
    expect(subscriber).toMatchObject({ email: "inspector@agency.example", member: null });
    const again = await postJson(subscribersAction as never, "manager", path, { email: "inspector@agency.example" });
    expect(again.status).toBe(409);
    expect((await again.json()).errors[0].field).toBe("email");
    expect((await postJson(subscribersAction as never, "manager", path, { email: "not an address" })).status).toBe(422);
    expect((await postJson(subscribersAction as never, "dive-supervisor", path, { email: "someone@agency.example" })).status).toBe(403);
    expect((await call(subscribersLoader as never, "viewer", path)).status).toBe(403);
    const listed = await (await call(subscribersLoader as never, "manager", path)).json();
    expect(listed.subscribers.map((row: { email: string }) => row.email)).toContain("inspector@agency.example");
    const remove = (role: Role, id: number) => call(subscriberAction as never, role, `${path}/${id}`, { method: "DELETE", headers: { Origin: "http://127.0.0.1:3999" } }, { subscriberId: String(id) });
    expect((await remove("dive-supervisor", subscriber.id)).status).toBe(403);
    expect((await remove("manager", subscriber.id)).status).toBe(204);
    expect((await remove("manager", subscriber.id)).status).toBe(404);
    expect(await ReportSubscriber.count({ where: { projectId, email: "inspector@agency.example" } })).toBe(0);
  });
});

describe("the calendar", () => {
  it("names each day's state: no work, draft, signed, countersigned, amended (the latest event wins, the other said beside it)", async () => {
    const project = await projectView();
    const days = await listMonthDays(project, "2026-06");
    expect(days).toHaveLength(30);
    const state = (date: string) => days.find((day) => day.date === date)!.state;
    expect(state("2026-06-01")).toBe("no work");
    expect(state(PREVIOUS)).toBe("no work"); // a shift but no dive and no report
    // practice: amended at −60 s, then countersigned: countersigned, the amendment said beside it.
    expect(days.find((day) => day.date === DAY)).toMatchObject({ state: "countersigned", note: "with 1 amendment" });
    expect(state(NEXT)).toBe("signed");
    const row = await DailyReport.findOne({ where: { projectId, localDate: NEXT } });
    const countersignedAt = new Date(Date.now() - 2_000);
    await row!.update({ countersignedAt, countersignedByName: "Morgan Alvarez", countersignedEmail: "inspector@agency.example" });
    expect((await listMonthDays(project, "2026-06")).find((day) => day.date === NEXT)).toMatchObject({ state: "countersigned", note: null });
    // An amendment after the countersignature: amended, after it (the correction waits for the inspector).
    await addAmendment(project, asUser("manager"), NEXT, "Haul ticket H-103 read 9.0 t, not 9.9 t.");
    expect((await listMonthDays(project, "2026-06")).find((day) => day.date === NEXT)).toMatchObject({ state: "amended", note: "after countersignature" });
    expect((await (await getDay("viewer", NEXT)).json()).state).toBe("amended");
    await Dive.create({ projectId, diveDate: "2026-06-20", teamId: (await DiveTeam.findOne({ where: { projectId, name: "Alpha" } }))!.id, diverName: "D", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 5, maxDepth: 3, notes: "" });
    expect((await listMonthDays(project, "2026-06")).find((day) => day.date === "2026-06-20")).toEqual({ date: "2026-06-20", state: "draft", note: null, dives: 1 });
  });
});

describe("a day that crosses a daylight-saving change", () => {
  // America/New_York: 2026-03-08 has 23 hours (02:00 → 03:00), 2026-11-01 has 25 (02:00 → 01:00).
  const SPRING = "2026-03-08";
  const FALL = "2026-11-01";
  let dstProjectId: number;

  beforeAll(async () => {
    const project = await makeProject("daily-report-dst");
    dstProjectId = project.id;
    await Project.update({ timeZone: TZ }, { where: { id: dstProjectId } });
    const team = await DiveTeam.create({ projectId: dstProjectId, name: "Delta", hoses: [], members: [{ name: "a", email: "", duty: "diver" }, { name: "b", email: "", duty: "diver" }] });
    for (const [day, minutes] of [[SPRING, 31], [SPRING, 29], [FALL, 44], ["2026-03-07", 50], ["2026-03-09", 70]] as const) {
      await Dive.create({ projectId: dstProjectId, diveDate: day, teamId: team.id, diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: minutes, maxDepth: 10, notes: "" });
    }
    // A stand-down from the evening before each change until the morning after: the whole local day is lost.
    for (const [day, after] of [["2026-03-07", "2026-03-09"], ["2026-10-31", "2026-11-02"]] as const) {
      await WildlifeStandDown.create({ projectId: dstProjectId, species: "manatee", startedAt: local(day, 22), departedAt: local(after, 5), endsAt: local(after, 6), waitMinutes: 30, shutdownDistance: 50 });
    }
    // Finds at 23:30 local on each changing day, and at 00:30 the day after.
    const find = (sequence: number, foundAt: Date) => Find.create({
      projectId: dstProjectId, catalogueNumber: `FS-2026-${String(sequence).padStart(3, "0")}`, catalogueYear: 2026, catalogueSequence: sequence, category: "faunal", description: "x", material: "", count: 1, taxon: null, element: null, condition: "",
      cellRow: 1, cellCol: 1, cellLabel: "B1", positionX: 600_010, positionY: 1_600_010, depthBelowSurface: null, depthInMuck: null, diveId: null, teamId: null, finder: "Diver", foundAt, fieldTag: "", accessionNumber: null, statusNote: null, idempotencyKey: null,
    });
    await find(1, local(SPRING, 23, 30));
    await find(2, local("2026-03-09", 0, 30));
    await find(3, local(FALL, 23, 30));
    await find(4, local(FALL, 1, 30)); // the first 01:30 of the fall day (EDT)
  });

  it("sums only the local day's records and counts 23 or 25 hours of an interruption open all day", async () => {
    const project = presentProject((await Project.findByPk(dstProjectId))!);
    const spring = await dailyReportPdf(project, SPRING);
    const { getDailyReport } = await import("~/models/daily-reports.server");
    const springView = await getDailyReport(project, SPRING);
    const fallView = await getDailyReport(project, FALL);
    // computed: the sums of the records dated on each day
    expect(springView.report.dives).toMatchObject({ count: 2, bottomMinutes: 60 });
    expect(fallView.report.dives).toMatchObject({ count: 1, bottomMinutes: 44 });
    // computed: a day of 23 and of 25 hours (America/New_York's changes in 2026)
    expect(springView.report.lostHours).toBe(23);
    expect(fallView.report.lostHours).toBe(25);
    expect(springView.report.finds.catalogueNumbers).toEqual(["FS-2026-001"]);
    expect(fallView.report.finds.catalogueNumbers).toEqual(["FS-2026-003", "FS-2026-004"]);
    // The PDF carries the same figures as the page.
    const text = (await pdfPages(spring.bytes)).join("\n");
    expect(text).toMatch(/2\s*dives · 60\s*bottom minutes/);
    expect(text).toMatch(/Lost in all:\s*23\s*h/);
  });
});

describe("a day that cannot exist", () => {
  // A month 13, a 30 February, words: none is a day, so none has a report.
  const badDays = ["2026-13-45", "2026-02-30", "abc"];

  it("is a JSON 404 naming the date field on every API day route (GET, sign, amendments, countersign requests), and stores nothing", async () => {
    const before = await DailyReport.count({ where: { projectId } });
    for (const date of badDays) {
      const answers = [
        await getDay("manager", date),
        await postJson(signAction as never, "manager", `${dayPath(date)}/sign`, { name: "Dana Reyes" }, { date }),
        await postJson(amendAction as never, "manager", `${dayPath(date)}/amendments`, { text: "x" }, { date }),
        await postJson(countersignRequestAction as never, "manager", `${dayPath(date)}/countersign-requests`, { email: "inspector@agency.example" }, { date }),
      ];
      for (const answer of answers) {
        expect(answer.status, date).toBe(404);
        expect(answer.headers.get("Content-Type")).toMatch(/application\/json/);
        const body = await answer.json();
        expect(body.errors).toEqual([expect.objectContaining({ field: "date", value: date, message: expect.stringMatching(/There is no (such )?day/) })]);
      }
    }
    expect(await DailyReport.count({ where: { projectId } })).toBe(before);
  });

  it("is the not-found page (404) for the day's page, its form and its PDF", async () => {
    const { loader: pageLoader, action: pageAction } = await import("~/routes/projects.$projectId.days.$date");
    const { loader: pdfLoader } = await import("~/routes/projects.$projectId.days.$date.report[.]pdf");
    for (const date of badDays) {
      const path = `/projects/${projectId}/days/${date}`;
      const page = await thrown(async () => pageLoader({ request: await requestAs(users.get("viewer")!.id, path), params: { projectId: String(projectId), date }, context: {} } as never));
      const form = await thrown(async () => pageAction({
        request: await requestAs(users.get("manager")!.id, path, { method: "POST", body: new URLSearchParams({ intent: "notes", conditions: "Sunny" }), headers: { Origin: "http://127.0.0.1:3999" } }),
        params: { projectId: String(projectId), date }, context: {},
      } as never));
      const pdf = await thrown(async () => pdfLoader({ request: await requestAs(users.get("viewer")!.id, `${path}/report.pdf`), params: { projectId: String(projectId), date }, context: {} } as never));
      for (const answer of [page, form, pdf]) {
        expect(answer, date).toBeInstanceOf(Response);
        expect((answer as Response).status).toBe(404);
        expect(await (answer as Response).text()).toMatch(/There is no (such )?day/);
      }
    }
    // A member who may not read reports is refused first (403): a bad day tells an outsider nothing.
    const refused = await thrown(async () => pageLoader({ request: await requestAs(users.get("outreach")!.id, `/projects/${projectId}/days/abc`), params: { projectId: String(projectId), date: "abc" }, context: {} } as never));
    expect((refused as Response).status).toBe(403);
  });
});
