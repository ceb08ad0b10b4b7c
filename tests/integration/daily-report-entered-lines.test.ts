import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, DailyReport, Dive, DiveTeam, OutgoingMail, Project, WildlifeStandDown, type Role } from "~/lib/db.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { instantOfLocal } from "../../shared/local-time";
import { loader as dayLoader } from "~/routes/api.projects.$projectId.days.$date";
import { action as crewsAction } from "~/routes/api.projects.$projectId.days.$date.crews";
import { action as downtimeAction } from "~/routes/api.projects.$projectId.days.$date.weather-downtime";
import { action as visitorsAction } from "~/routes/api.projects.$projectId.days.$date.visitors";
import { action as signAction } from "~/routes/api.projects.$projectId.days.$date.sign";
import { action as countersignRequestAction } from "~/routes/api.projects.$projectId.days.$date.countersign-requests";
import { action as pageAction, loader as pageLoader } from "~/routes/projects.$projectId.days.$date";
import { dailyReportBatchPdf, dailyReportPdf, lookUpCountersign } from "~/models/daily-reports.server";
import { lostWorkingTime } from "~/models/stoppages.server";
import { dayNumber } from "../../shared/progress/calendar-days";
import { deleteObject, listObjectKeys } from "~/lib/storage/storage.server";
import { pdfPages } from "../pdf-text";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// Head counts entered over the compiled ones, weather downtime as an interruption, and inspections
// and visitors with their times on the day's report: entered on the page and through the API,
// checked line by line (errors name the line and the field), shown in the API, on the page, in the
// PDF, the batch and the countersign page, kept as signed, locked with the report, audited.
// practice: the reports that hold up in a dispute give head counts, weather tied to its effect on
// the work, idle time with its reason, and the times of inspections.

afterAll(closeSequelize);

const TZ = "America/New_York";
const DAY = "2026-06-10";
// published (15 U.S.C. § 260a): 2026-03-08 is the second Sunday of March (23 h in New York), 2026-11-01 the first Sunday of November (25 h).
const SPRING_FORWARD = "2026-03-08";
const FALL_BACK = "2026-11-01";

type Handler = (args: never) => Promise<Response>;
let projectId: number;
const users = new Map<Role, number>();
const dayPath = (date: string) => `/api/projects/${projectId}/days/${date}`;
const send = async (handler: Handler, role: Role, path: string, method: string, body: unknown, date: string) => handler({
  request: await requestAs(users.get(role)!, path, { method, body: JSON.stringify(body), headers: { "Content-Type": "application/json", Origin: ORIGIN } }),
  params: { projectId: String(projectId), date }, context: {},
} as never);
const putCrews = (role: Role, date: string, crews: unknown) => send(crewsAction as never, role, `${dayPath(date)}/crews`, "PUT", { crews }, date);
const putDowntime = (role: Role, date: string, weatherDowntime: unknown) => send(downtimeAction as never, role, `${dayPath(date)}/weather-downtime`, "PUT", { weatherDowntime }, date);
const putVisitors = (role: Role, date: string, visitors: unknown) => send(visitorsAction as never, role, `${dayPath(date)}/visitors`, "PUT", { visitors }, date);
const getDay = async (date: string) => (await (dayLoader as Handler)({ request: await requestAs(users.get("viewer")!, dayPath(date)), params: { projectId: String(projectId), date }, context: {} } as never)).json();
const project = async () => presentProject((await Project.findByPk(projectId))!);
const local = (date: string, hh: number, mm = 0) => new Date(instantOfLocal(date, hh * 60 + mm, TZ));
const pageForm = async (date: string, fields: Record<string, string>) => {
  const answer = await pageAction({
    request: await requestAs(users.get("dive-supervisor")!, `/projects/${projectId}/days/${date}`, { method: "POST", body: new URLSearchParams(fields), headers: { Origin: ORIGIN } }),
    params: { projectId: String(projectId), date }, context: {},
  } as never);
  return answer && typeof answer === "object" && "init" in answer ? { status: (answer as { init: { status?: number } }).init?.status ?? 200, body: (answer as { data: { errors: Record<string, string>; notice: string | null } }).data } : { status: 200, body: answer as { errors: Record<string, string>; notice: string | null } };
};
/** Sends each case and checks it is refused with 422 naming the field with the message. */
async function expectRefusals(put: (body: unknown) => Promise<Response>, cases: Array<[unknown, string, RegExp]>) {
  for (const [body, field, message] of cases) {
    const answer = await put(body);
    expect(answer.status, JSON.stringify(body)).toBe(422);
    const { errors } = await answer.json();
    expect(errors, JSON.stringify(body)).toContainEqual({ field, message: expect.stringMatching(message) });
  }
}

const VISITORS = [
  { arrived: "09:30", left: "11:05", name: "Morgan Alvarez", organisation: "District water agency", purpose: "silt curtain inspection" },
  { arrived: "13:40", name: "Sam Okafor", organisation: "County roads" },
];

beforeAll(async () => {
  const made = await makeProject("entered-lines");
  projectId = made.id;
  for (const key of await listObjectKeys(`projects/${projectId}/`)) await deleteObject(key);
  await Project.update({ timeZone: TZ }, { where: { id: projectId } });
  for (const role of ["manager", "dive-supervisor", "viewer"] as const) {
    const user = await makeUser(`entered-lines-${role}`);
    users.set(role, user.id);
    await addMember(user.id, projectId, role);
  }
  const alpha = await DiveTeam.create({ projectId, name: "Alpha", hoses: [], members: [{ name: "a", email: "", duty: "diver" }] });
  await DiveTeam.create({ projectId, name: "Shore crew", hoses: [], members: [] });
  // Alpha dives without a day plan: two divers in the log (one of them twice).
  for (const diverName of ["Rosa Quintero", "Eli Marsh", "Rosa Quintero"]) {
    await Dive.create({ projectId, diveDate: DAY, teamId: alpha.id, diverName, leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 30, maxDepth: 9, notes: "" });
  }
  // A manatee stand-down 15:30–17:00, overlapping the lightning entered below (14:00–16:00).
  await WildlifeStandDown.create({ projectId, species: "manatee", startedAt: local(DAY, 15, 30), departedAt: local(DAY, 16, 30), endsAt: local(DAY, 17), waitMinutes: 30, shutdownDistance: 50 });
});

describe("head counts per team, entered over the compiled ones", () => {
  it("compiles a team's count from the dive log when it has no day plan, and asks for the crew on site", async () => {
    const body = await getDay(DAY);
    // computed: the log names Rosa Quintero and Eli Marsh: 2 divers.
    expect(body.teams).toEqual([expect.objectContaining({ team: "Alpha", headCount: 2, compiledHeadCount: 2, headCountSource: "dive log", enteredHeadCount: null })]);
    expect(body.missing).toContain("head count of team Alpha only from the dive log (2 divers): enter the crew on site");
  });

  it("refuses counts that break a rule, naming the line and the field, and stores nothing", async () => {
    await expectRefusals((crews) => putCrews("dive-supervisor", DAY, crews), [
      [[{ team: "Alpha", headCount: 100 }], "crews.0.headCount", /^line 1 \(Alpha\): the head count is a whole number of people from 0 to 99$/],
      [[{ team: "Alpha", headCount: 4.5 }], "crews.0.headCount", /whole number/],
      [[{ team: "Alpha", headCount: -1 }], "crews.0.headCount", /whole number/],
      [[{ team: "Alpha", headCount: "5" }], "crews.0.headCount", /whole number/],
      [[{ team: "Alpha", headCount: 4 }, { team: "Bravo", headCount: 3 }], "crews.1.team", /^line 2 \(Bravo\): this project has no team named Bravo \(its teams: Alpha, Shore crew\)$/],
      [[{ team: "Alpha", headCount: 4 }, { team: "alpha", headCount: 3 }], "crews.1.team", /^line 2 \(alpha\): alpha is already on line 1/],
      [[{ headCount: 3 }], "crews.0.team", /^line 1: name the team$/],
      [[{ team: "Alpha", headCount: 4, reason: "x".repeat(501) }], "crews.0.reason", /at most 500 characters/],
      ["Alpha", "crews", /crews is a list/],
    ]);
    expect(await DailyReport.count({ where: { projectId, localDate: DAY } })).toBe(0);
    expect((await putCrews("viewer", DAY, [{ team: "Alpha", headCount: 4 }])).status).toBe(403);
  });

  it("stores the counts, audited; the API, page and PDF give the entered count with the compiled one beside it", async () => {
    const answer = await putCrews("dive-supervisor", DAY, [{ team: "alpha", headCount: 5, reason: " two tenders and the supervisor " }, { team: "Shore crew", headCount: 0 }]);
    expect(answer.status).toBe(200);
    expect((await answer.json()).crews).toEqual([{ team: "Alpha", headCount: 5, reason: "two tenders and the supervisor" }, { team: "Shore crew", headCount: 0, reason: "" }]);
    const body = await getDay(DAY);
    expect(body.teams.map((team: { team: string; headCount: number; compiledHeadCount: number | null; enteredHeadCount: unknown }) => [team.team, team.headCount, team.compiledHeadCount, team.enteredHeadCount])).toEqual([
      ["Alpha", 5, 2, { headCount: 5, reason: "two tenders and the supervisor" }],
      ["Shore crew", 0, null, { headCount: 0, reason: "" }],
    ]);
    expect(body.missing.join(" ")).not.toContain("head count");
    const audit = await AuditEvent.findAll({ where: { projectId, action: "daily-report-notes-entered" }, order: [["id", "ASC"]] });
    expect(audit.at(-1)!.detail).toEqual({ date: DAY, crews: ["Alpha: 5", "Shore crew: 0"] });
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toContain("Head counts entered: Alpha 2 from the dive log, entered 5 (two tenders and the supervisor); Shore crew none compiled, entered 0.");
    expect(text).toMatch(/Alpha\s*5 entered\s*3\s*90/);
    // The page's form: a blank count keeps the compiled one; an error sits on the line's own field.
    const refused = await pageForm(DAY, { intent: "crews", "crews.0.team": "Alpha", "crews.0.headCount": "", "crews.0.reason": "", "crews.1.team": "Shore crew", "crews.1.headCount": "120", "crews.1.reason": "" });
    expect(refused.status).toBe(400);
    expect(refused.body.errors).toEqual({ "crews.1.headCount": expect.stringMatching(/^line 1 \(Shore crew\): the head count is a whole number/) });
    const saved = await pageForm(DAY, { intent: "crews", "crews.0.team": "Alpha", "crews.0.headCount": "4", "crews.0.reason": "", "crews.1.team": "Shore crew", "crews.1.headCount": "", "crews.1.reason": "" });
    expect(saved).toMatchObject({ status: 200, body: { notice: "Head counts saved." } });
    expect((await getDay(DAY)).entered.crews).toEqual([{ team: "Alpha", headCount: 4, reason: "" }]);
  });
});

describe("weather downtime", () => {
  it("refuses spells that break a rule, naming the line and the field", async () => {
    await expectRefusals((spells) => putDowntime("dive-supervisor", DAY, spells), [
      [[{ start: "14:00", end: "13:00", reason: "lightning" }], "weatherDowntime.0.end", /^line 1: the end \(13:00\) comes after the start \(14:00\); downtime through midnight is entered on each day$/],
      [[{ start: "14:00", end: "14:00", reason: "lightning" }], "weatherDowntime.0.end", /comes after the start/],
      [[{ start: "2pm", end: "15:00", reason: "lightning" }], "weatherDowntime.0.start", /^line 1: the start is a time written HH:MM on the 24-hour clock$/],
      [[{ start: "14:00", end: "24:30", reason: "lightning" }], "weatherDowntime.0.end", /24:00 for the end of the day/],
      [[{ start: "14:00", end: "15:00" }], "weatherDowntime.0.reason", /^line 1: say what weather stopped the work/],
      [[{ start: "14:00", end: "15:00", reason: "lightning" }, { start: "08:00", end: "09:00", reason: "fog" }, { start: "14:30", end: "16:00", reason: "wind" }], "weatherDowntime.2.start", /^line 3: 14:30–16:00 overlaps line 1 \(14:00–15:00\); enter each spell of downtime once$/],
      [Array.from({ length: 13 }, (_, index) => ({ start: `${String(index).padStart(2, "0")}:00`, end: `${String(index).padStart(2, "0")}:30`, reason: "squalls" })), "weatherDowntime", /at most 12 spells/],
    ]);
    // The hour the clocks skip does not exist on that day.
    await expectRefusals((spells) => putDowntime("dive-supervisor", SPRING_FORWARD, spells), [
      [[{ start: "02:30", end: "04:00", reason: "storm" }], "weatherDowntime.0.start", /^line 1: the start 02:30 does not exist on 2026-03-08: the clocks went forward an hour that night$/],
    ]);
    expect(await DailyReport.count({ where: { projectId, localDate: [SPRING_FORWARD] } })).toBe(0);
  });

  it("counts whole 23- and 25-hour days across the daylight-saving changes", async () => {
    for (const [date, hours] of [[SPRING_FORWARD, 23], [FALL_BACK, 25]] as const) {
      expect((await putDowntime("manager", date, [{ start: "00:00", end: "24:00", reason: "tropical storm" }])).status).toBe(200);
      const body = await getDay(date);
      expect(body.interruptions).toEqual([expect.objectContaining({ kind: "weather", reason: "tropical storm", lostHours: hours })]);
      expect(body.lostHours).toBe(hours);
    }
  });

  it("lists the spells with the other interruptions (API, page, PDF), the overlap with a stand-down counted once in the total", async () => {
    const answer = await putDowntime("dive-supervisor", DAY, [{ start: "14:00", end: "16:00", reason: "lightning within 10 miles" }, { start: "07:00", end: "07:30", reason: "fog" }]);
    expect(answer.status).toBe(200);
    const body = await getDay(DAY);
    expect(body.interruptions.map((event: { kind: string; reason: string; start: string; end: string; lostHours: number }) => [event.kind, event.reason, event.start, event.end, event.lostHours])).toEqual([
      // 07:00 EDT is 11:00 UTC.
      ["weather", "fog", "2026-06-10T11:00:00.000Z", "2026-06-10T11:30:00.000Z", 0.5],
      ["weather", "lightning within 10 miles", "2026-06-10T18:00:00.000Z", "2026-06-10T20:00:00.000Z", 2],
      ["stand-down", "manatee", local(DAY, 15, 30).toISOString(), local(DAY, 17).toISOString(), 1.5],
    ]);
    // computed: 07:00–07:30 and 14:00–17:00 are lost: 0.5 + 3 = 3.5 h (line by line 4 h).
    expect(body.lostHours).toBe(3.5);
    // No weather entered at all: the report says so (and the effect of the downtime is asked for once the weather is).
    expect(body.missing).toContain("no weather entered");
    expect(body.missing).toContain("weather downtime entered, but not the weather's effect on the work");
    expect((await pageForm(DAY, { intent: "notes", conditions: "Thunderstorms", effect: "Divers out of the water for lightning, 14:00–16:00" })).status).toBe(200);
    expect((await getDay(DAY)).missing).not.toContain("weather downtime entered, but not the weather's effect on the work");
    const audit = await AuditEvent.findAll({ where: { projectId, action: "daily-report-notes-entered" }, order: [["id", "DESC"]], limit: 2 });
    expect(audit[1]!.detail).toEqual({ date: DAY, weatherDowntime: ["14:00–16:00 lightning within 10 miles", "07:00–07:30 fog"] });
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toContain("Weather downtime (lightning within 10 miles) from 14:00 to 16:00: 2 h lost on the day");
    expect(text).toMatch(/Lost in all: 3\.5 h \(interruptions overlapped: an hour lost to two causes counts once; 4 h line by line\)/);
    // The page's form: errors on the line's own field.
    const refused = await pageForm(DAY, { intent: "weather-downtime", "weatherDowntime.0.start": "14:00", "weatherDowntime.0.end": "16:00", "weatherDowntime.0.reason": "lightning", "weatherDowntime.4.start": "15:00", "weatherDowntime.4.end": "15:30", "weatherDowntime.4.reason": "hail" });
    expect(refused.body.errors).toEqual({ "weatherDowntime.4.start": expect.stringMatching(/^line 2: 15:00–15:30 overlaps line 1/) });
  });
});

describe("inspections and visitors with their times", () => {
  it("refuses lines that break a rule, naming the line and the field", async () => {
    await expectRefusals((visitors) => putVisitors("dive-supervisor", DAY, visitors), [
      [[{ arrived: "09:30", left: "09:00", name: "Morgan Alvarez" }], "visitors.0.left", /^line 1: the time of leaving \(09:00\) comes after the arrival \(09:30\)$/],
      [[VISITORS[0], { arrived: "", name: "Sam Okafor" }], "visitors.1.arrived", /^line 2: the time of arrival is a time written HH:MM/],
      [[{ arrived: "09:30", name: " " }], "visitors.0.name", /^line 1: name the visitor or inspector$/],
      [[{ arrived: "09:30", name: "Sam", organisation: 7 }], "visitors.0.organisation", /the organisation is words/],
      [[{ arrived: "09:30", name: "Sam", purpose: "p".repeat(501) }], "visitors.0.purpose", /at most 500 characters/],
      [{ name: "Sam" }, "visitors", /visitors is a list/],
    ]);
  });

  it("stores the lines; the API, page, PDF and countersign page show them; a visitor still on site is listed as missing a time", async () => {
    const answer = await putVisitors("dive-supervisor", DAY, VISITORS);
    expect(answer.status).toBe(200);
    const stored = (await answer.json()).visitors;
    expect(stored).toEqual([VISITORS[0], { arrived: "13:40", left: "", name: "Sam Okafor", organisation: "County roads", purpose: "" }]);
    const body = await getDay(DAY);
    expect(body.entered.visitors).toEqual(stored);
    expect(body.missing).toContain("no time of leaving for Sam Okafor (arrived 13:40)");
    const page = await pageLoader({ request: await requestAs(users.get("viewer")!, `/projects/${projectId}/days/${DAY}`), params: { projectId: String(projectId), date: DAY }, context: {} } as never);
    expect(page.report.entered.visitors).toEqual(stored);
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toMatch(/Inspections and visitors Arrived Left Name Organisation Purpose or notes 09:30 11:05 Morgan Alvarez District water agency silt curtain inspection 13:40 — Sam Okafor County roads —/);
  });

  it("keeps a report's free text from before visitor lines readable, as a note, and editable on the page", async () => {
    const row = (await DailyReport.findOne({ where: { projectId, localDate: DAY } }))!;
    // As the column held it before: no visitor lines, a free-text inspections note.
    const { visitors: _, ...older } = row.entered;
    await DailyReport.update({ entered: { ...older, inspections: "10:00 agency inspector walked the silt curtain" } as never }, { where: { id: row.id } });
    const body = await getDay(DAY);
    expect(body.entered.visitors).toEqual([]);
    expect(body.entered.inspections).toBe("10:00 agency inspector walked the silt curtain");
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toContain("Earlier note (entered as text): 10:00 agency inspector walked the silt curtain");
    // Saving the weather keeps the note unless the page sends it (it shows it while there is one).
    expect((await pageForm(DAY, { intent: "notes", conditions: "Thunderstorms", effect: "Divers out of the water for lightning" })).status).toBe(200);
    expect((await getDay(DAY)).entered.inspections).toBe("10:00 agency inspector walked the silt curtain");
    await putVisitors("dive-supervisor", DAY, VISITORS);
  });
});

describe("a signed report", () => {
  it("keeps the lines as signed, refuses edits through the API and the page, and the batch and countersign page show them", async () => {
    expect((await send(signAction as never, "dive-supervisor", `${dayPath(DAY)}/sign`, "POST", { name: "Dana Reyes" }, DAY)).status).toBe(201);
    for (const answer of [
      await putCrews("dive-supervisor", DAY, [{ team: "Alpha", headCount: 9 }]),
      await putDowntime("dive-supervisor", DAY, [{ start: "09:00", end: "10:00", reason: "fog" }]),
      await putVisitors("manager", DAY, [{ arrived: "09:00", name: "Late entry" }]),
    ]) {
      expect(answer.status).toBe(409);
      expect((await answer.json()).errors[0].message).toMatch(/signed and locked/);
    }
    for (const intent of ["crews", "weather-downtime", "visitors"]) expect((await pageForm(DAY, { intent })).status).toBe(409);
    const row = (await DailyReport.findOne({ where: { projectId, localDate: DAY } }))!;
    const snapshot = row.snapshot as { entered: { crews: unknown[]; weatherDowntime: unknown[]; visitors: unknown[] }; lostHours: number; teams: Array<{ headCount: number }> };
    expect(snapshot.entered.crews).toEqual([{ team: "Alpha", headCount: 4, reason: "" }]);
    expect(snapshot.entered.weatherDowntime).toHaveLength(2);
    expect(snapshot.entered.visitors).toHaveLength(2);
    expect(snapshot.lostHours).toBe(3.5);
    expect(snapshot.teams[0]!.headCount).toBe(4);
    const batch = (await pdfPages((await dailyReportBatchPdf(await project(), "2026-06-09", DAY)).bytes)).join(" ");
    expect(batch).toContain("Weather downtime (lightning within 10 miles)");
    expect(batch).toContain("Morgan Alvarez");
    expect(batch).toContain("Alpha 2 from the dive log, entered 4");
    expect((await send(countersignRequestAction as never, "dive-supervisor", `${dayPath(DAY)}/countersign-requests`, "POST", { email: "kit.lines@agency.example" }, DAY)).status).toBe(201);
    const mail = await OutgoingMail.findOne({ where: { toAddress: "kit.lines@agency.example" }, order: [["id", "DESC"]] });
    const lookup = await lookUpCountersign(/\/countersign\/([A-Za-z0-9_-]+)/.exec(mail!.bodyText)![1]!);
    expect(lookup.status).toBe("open");
    if (lookup.status === "open") {
      expect(lookup.view.report.entered.visitors).toHaveLength(2);
      expect(lookup.view.report.interruptions.filter((event) => event.kind === "weather")).toHaveLength(2);
    }
  });
});

describe("the progress figures' lost working time", () => {
  it("takes the weather downtime entered on the reports out of the working hours, an overlap with a stand-down counted once", async () => {
    await Project.update({ workDayStart: "07:00", workDayEnd: "19:00" }, { where: { id: projectId } });
    const lost = await lostWorkingTime(await project(), Date.parse("2026-12-01T00:00:00Z"));
    // computed: DAY loses 07:00–07:30 (fog) and 14:00–17:00 (lightning 14–16, manatee 15:30–17): 3.5 h of its 12 working hours;
    // the two storm days lose their whole 07:00–19:00 (12 h each, whatever the day's length): 3.5 + 12 + 12 = 27.5 h.
    expect(lost.shares.get(dayNumber(DAY))).toBeCloseTo(3.5 / 12, 9);
    expect(lost.shares.get(dayNumber(SPRING_FORWARD))).toBe(1);
    expect(lost.shares.get(dayNumber(FALL_BACK))).toBe(1);
    expect(lost.lostHours).toBeCloseTo(27.5, 9);
  });
});
