import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, DailyReport, DailyReportAmendment, Dive, DiveTeam, OutgoingMail, Project, type Role } from "~/lib/db.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { loader as dayLoader } from "~/routes/api.projects.$projectId.days.$date";
import { action as equipmentAction } from "~/routes/api.projects.$projectId.days.$date.equipment";
import { action as signAction } from "~/routes/api.projects.$projectId.days.$date.sign";
import { action as amendAction } from "~/routes/api.projects.$projectId.days.$date.amendments";
import { action as countersignRequestAction } from "~/routes/api.projects.$projectId.days.$date.countersign-requests";
import { action as pageAction, loader as pageLoader } from "~/routes/projects.$projectId.days.$date";
import { countersignReport, dailyReportBatchPdf, dailyReportPdf, listMonthDays, lookUpCountersign } from "~/models/daily-reports.server";
import { deleteObject, listObjectKeys } from "~/lib/storage/storage.server";
import { pdfPages } from "../pdf-text";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// Equipment working and idle on the day's report (entered on the page and through the API, checked
// line by line, shown on the page, in the PDF, the API and the batch, audited, part of "nothing
// blank"), and a new countersignature after an amendment, the earlier one kept as of its version.
// practice: idle time with its reason is what a delay claim reads first; a report corrected after
// the agency countersigned it goes back to the agency.

afterAll(closeSequelize);

const TZ = "America/New_York";
const DAY = "2026-06-10";
const EARLIER = "2026-06-09";
// Clocks go back at 02:00 on 1 November 2026 in New York: that local day is 25 hours long
// (US Energy Policy Act of 2005: first Sunday in November).
const FALL_BACK = "2026-11-01";
// Clocks go forward on 8 March 2026 (second Sunday in March): 23 hours.
const SPRING_FORWARD = "2026-03-08";

type Handler = (args: never) => Promise<Response>;
let projectId: number;
const users = new Map<Role, number>();
const dayPath = (date: string) => `/api/projects/${projectId}/days/${date}`;
const send = async (handler: Handler, role: Role, path: string, method: string, body: unknown, date: string) => handler({
  request: await requestAs(users.get(role)!, path, { method, body: JSON.stringify(body), headers: { "Content-Type": "application/json", Origin: ORIGIN } }),
  params: { projectId: String(projectId), date }, context: {},
} as never);
const putEquipment = (role: Role, date: string, equipment: unknown) => send(equipmentAction as never, role, `${dayPath(date)}/equipment`, "PUT", { equipment }, date);
const getDay = async (date: string) => (await (dayLoader as Handler)({ request: await requestAs(users.get("viewer")!, dayPath(date)), params: { projectId: String(projectId), date }, context: {} } as never)).json();
const project = async () => presentProject((await Project.findByPk(projectId))!);
const pageForm = async (date: string, fields: Record<string, string>) => {
  const answer = await pageAction({
    request: await requestAs(users.get("dive-supervisor")!, `/projects/${projectId}/days/${date}`, { method: "POST", body: new URLSearchParams(fields), headers: { Origin: ORIGIN } }),
    params: { projectId: String(projectId), date }, context: {},
  } as never);
  // data(...) answers carry their status; a plain object is a 200.
  return answer && typeof answer === "object" && "init" in answer ? { status: (answer as { init: { status?: number } }).init?.status ?? 200, body: (answer as { data: { errors: Record<string, string>; notice: string | null } }).data } : { status: 200, body: answer as { errors: Record<string, string>; notice: string | null } };
};

const PUMPS = [
  { name: "Suction pump 1", workingHours: 7.5, idleHours: 2.5, idleReason: "waiting on the turbidity stop at C1" },
  { name: "Booster pump", workingHours: 7.5, idleHours: 0, idleReason: "" },
  { name: "Dewatering plant", workingHours: 10, idleHours: 0 },
  { name: "Work boat", workingHours: 0, idleHours: 10, idleReason: "outboard under repair" },
];

beforeAll(async () => {
  const made = await makeProject("equipment");
  projectId = made.id;
  // The test database starts empty each run but the test store keeps its files: a project of an
  // earlier run with this id may have left stored PDFs under the same keys.
  for (const key of await listObjectKeys(`projects/${projectId}/`)) await deleteObject(key);
  await Project.update({ timeZone: TZ }, { where: { id: projectId } });
  for (const role of ["manager", "dive-supervisor", "viewer"] as const) {
    const user = await makeUser(`equipment-${role}`);
    users.set(role, user.id);
    await addMember(user.id, projectId, role);
  }
  const team = await DiveTeam.create({ projectId, name: "Alpha", hoses: [], members: [{ name: "a", email: "", duty: "diver" }] });
  for (const day of [DAY, FALL_BACK]) await Dive.create({ projectId, diveDate: day, teamId: team.id, diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 40, maxDepth: 9, notes: "" });
});

describe("equipment working and idle", () => {
  it("a work day without equipment hours lists them as missing; the report says none entered", async () => {
    const body = await getDay(DAY);
    expect(body.missing).toContain("no equipment hours entered");
    expect(body.entered.equipment).toEqual([]);
    // A day without work owes no equipment hours.
    expect((await getDay(EARLIER)).missing).not.toContain("no equipment hours entered");
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toContain("Equipment None entered.");
  });

  it("refuses lines that break a rule, naming the line and the field, and stores nothing", async () => {
    const cases: Array<[unknown, string, RegExp]> = [
      [[{ name: "", workingHours: 5 }], "equipment.0.name", /^line 1: name the equipment/],
      [[PUMPS[0], { name: "Booster", workingHours: 25 }], "equipment.1.workingHours", /^line 2: working hours are a number of hours from 0 to 24$/],
      [[{ name: "Booster", workingHours: -1 }], "equipment.0.workingHours", /^line 1: working hours are a number of hours from 0 to 24$/],
      [[{ name: "Booster", workingHours: "8" }], "equipment.0.workingHours", /^line 1: working hours are a number/],
      [[{ name: "Booster", workingHours: 20, idleHours: 4.5, idleReason: "rain" }], "equipment.0.idleHours", /^line 1: working and idle hours add up to 24\.5 h, more than the 24 h of this day$/],
      [[{ name: "Booster", workingHours: 6, idleHours: 2 }], "equipment.0.idleReason", /^line 1: say why it stood idle/],
      [[{ name: "Booster", workingHours: 6, idleHours: 2, idleReason: "   " }], "equipment.0.idleReason", /^line 1: say why it stood idle/],
      [[{ name: "Booster", workingHours: 0, idleHours: 0 }], "equipment.0.workingHours", /^line 1: give its hours working, idle, or both$/],
      [[PUMPS[1], PUMPS[2], { ...PUMPS[1], name: "booster PUMP" }], "equipment.2.name", /^line 3: booster PUMP is already on line 1/],
      [Array.from({ length: 21 }, (_, index) => ({ name: `Pump ${index}`, workingHours: 1 })), "equipment", /at most 20 pieces/],
      ["a pump", "equipment", /equipment is a list/],
    ];
    for (const [equipment, field, message] of cases) {
      const answer = await putEquipment("dive-supervisor", DAY, equipment);
      expect(answer.status, JSON.stringify(equipment)).toBe(422);
      const { errors } = await answer.json();
      expect(errors, JSON.stringify(equipment)).toContainEqual({ field, message: expect.stringMatching(message) });
    }
    expect(await DailyReport.count({ where: { projectId, localDate: DAY } })).toBe(0);
    // Only who signs the report enters on it.
    expect((await putEquipment("viewer", DAY, PUMPS)).status).toBe(403);
  });

  it("takes up to 25 h on the day the clocks go back and 23 h on the day they go forward", async () => {
    expect((await putEquipment("manager", FALL_BACK, [{ name: "Dewatering plant", workingHours: 25 }])).status).toBe(200);
    const over = await putEquipment("manager", SPRING_FORWARD, [{ name: "Dewatering plant", workingHours: 20, idleHours: 3.5, idleReason: "no crew" }]);
    expect(over.status).toBe(422);
    expect((await over.json()).errors[0].message).toBe("line 1: working and idle hours add up to 23.5 h, more than the 23 h of this day");
  });

  it("stores the lines (PUT replaces them), audited; the API, page, PDF and batch show them; the missing item goes", async () => {
    const answer = await putEquipment("dive-supervisor", DAY, PUMPS);
    expect(answer.status).toBe(200);
    const stored = (await answer.json()).equipment;
    expect(stored).toEqual([
      PUMPS[0], PUMPS[1], { name: "Dewatering plant", workingHours: 10, idleHours: 0, idleReason: "" }, PUMPS[3],
    ]);
    const body = await getDay(DAY);
    expect(body.entered.equipment).toEqual(stored);
    expect(body.missing).not.toContain("no equipment hours entered");
    const audit = await AuditEvent.findAll({ where: { projectId, action: "daily-report-notes-entered" }, order: [["id", "ASC"]] });
    expect(audit.at(-1)!.detail).toEqual({ date: DAY, equipment: ["Suction pump 1", "Booster pump", "Dewatering plant", "Work boat"] });
    // Saving the weather keeps the equipment lines.
    expect((await pageForm(DAY, { intent: "notes", conditions: "Overcast" })).status).toBe(200);
    expect((await getDay(DAY)).entered.equipment).toHaveLength(4);

    const page = await pageLoader({ request: await requestAs(users.get("viewer")!, `/projects/${projectId}/days/${DAY}`), params: { projectId: String(projectId), date: DAY }, context: {} } as never);
    expect(page.report.entered.equipment).toEqual(stored);
    const text = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(text).toMatch(/Suction pump 1\s*7\.5\s*2\.5\s*waiting on the turbidity stop at C1/);
    expect(text).toMatch(/Work boat\s*0\s*10\s*outboard under repair/);
    // computed: 7.5 + 7.5 + 10 + 0 = 25 h working; 2.5 + 10 = 12.5 h idle
    expect(text).toContain("4 pieces: 25 h working, 12.5 h idle");
    const batch = (await pdfPages((await dailyReportBatchPdf(await project(), EARLIER, DAY)).bytes)).join(" ");
    expect(batch).toContain("outboard under repair");
  });

  it("the page's form: lines by their number on the form, blank lines left out, errors on the line's own field", async () => {
    const refused = await pageForm(DAY, {
      intent: "equipment",
      "equipment.0.name": "Suction pump 1", "equipment.0.workingHours": "8", "equipment.0.idleHours": "", "equipment.0.idleReason": "",
      "equipment.3.name": "", "equipment.3.workingHours": "", "equipment.3.idleHours": "", "equipment.3.idleReason": "",
      "equipment.5.name": "Work boat", "equipment.5.workingHours": "2", "equipment.5.idleHours": "6", "equipment.5.idleReason": "",
    });
    expect(refused.status).toBe(400);
    // The second line sent (form line 5) is "line 2" and its error sits on equipment.5.idleReason.
    expect(refused.body.errors).toEqual({ "equipment.5.idleReason": expect.stringMatching(/^line 2: say why it stood idle/) });
    expect((await getDay(DAY)).entered.equipment).toHaveLength(4);
    const saved = await pageForm(DAY, {
      intent: "equipment",
      "equipment.0.name": "Suction pump 1", "equipment.0.workingHours": "8", "equipment.0.idleHours": "", "equipment.0.idleReason": "",
      "equipment.5.name": "Work boat", "equipment.5.workingHours": "2", "equipment.5.idleHours": "6,5", "equipment.5.idleReason": "fog",
    });
    expect(saved).toMatchObject({ status: 200, body: { notice: "Equipment hours saved." } });
    expect((await getDay(DAY)).entered.equipment).toEqual([
      { name: "Suction pump 1", workingHours: 8, idleHours: 0, idleReason: "" },
      { name: "Work boat", workingHours: 2, idleHours: 6.5, idleReason: "fog" },
    ]);
    // A later day starts from these names.
    const next = await pageLoader({ request: await requestAs(users.get("dive-supervisor")!, `/projects/${projectId}/days/2026-06-12`), params: { projectId: String(projectId), date: "2026-06-12" }, context: {} } as never);
    expect(next.equipmentNames).toEqual(["Suction pump 1", "Work boat"]);
  });

  it("is kept as signed and locked with the report", async () => {
    expect((await send(signAction as never, "dive-supervisor", `${dayPath(DAY)}/sign`, "POST", { name: "Dana Reyes" }, DAY)).status).toBe(201);
    expect((await putEquipment("dive-supervisor", DAY, PUMPS)).status).toBe(409);
    expect((await pageForm(DAY, { intent: "equipment", "equipment.0.name": "Booster", "equipment.0.workingHours": "3" })).status).toBe(409);
    const row = (await DailyReport.findOne({ where: { projectId, localDate: DAY } }))!;
    expect((row.snapshot as { entered: { equipment: unknown[] } }).entered.equipment).toHaveLength(2);
  });
});

describe("a new countersignature after an amendment", () => {
  const linkOf = async (email: string) => {
    const mail = await OutgoingMail.findOne({ where: { toAddress: email }, order: [["id", "DESC"]] });
    return /\/countersign\/([A-Za-z0-9_-]+)/.exec(mail!.bodyText)![1]!;
  };
  const requestLink = (email: string) => send(countersignRequestAction as never, "dive-supervisor", `${dayPath(DAY)}/countersign-requests`, "POST", { email }, DAY);

  it("is refused while the countersignature is current, and asked for once the report is amended; the first stays on record", async () => {
    expect((await requestLink("kit.inspector@agency.example")).status).toBe(201);
    const first = await linkOf("kit.inspector@agency.example");
    expect(await countersignReport(first, "Morgan Alvarez")).toEqual({ ok: true, date: DAY });
    // Countersigned, not amended since: 409.
    const refused = await requestLink("kit.inspector@agency.example");
    expect(refused.status).toBe(409);
    expect((await refused.json()).errors[0].message).toMatch(/not amended since/);

    expect((await send(amendAction as never, "dive-supervisor", `${dayPath(DAY)}/amendments`, "POST", { text: "Work boat idle 6.5 h, not 6." }, DAY)).status).toBe(201);
    // Stored times keep whole seconds: the amendment a minute after the countersignature, the next countersignature two.
    await DailyReportAmendment.update({ createdAt: new Date(Date.now() + 60_000) }, { where: { reportId: (await DailyReport.findOne({ where: { projectId, localDate: DAY } }))!.id } });
    const amended = await getDay(DAY);
    expect(amended.state).toBe("amended");
    expect(amended.signed.countersignOutdated).toBe(true);
    const page = await pageLoader({ request: await requestAs(users.get("dive-supervisor")!, `/projects/${projectId}/days/${DAY}`), params: { projectId: String(projectId), date: DAY }, context: {} } as never);
    expect(page.countersignOutdated).toBe(true);
    const outdatedPdf = (await pdfPages((await dailyReportPdf(await project(), DAY)).bytes)).join(" ");
    expect(outdatedPdf).toContain("Amended after this countersignature");

    expect((await requestLink("kit.second-inspector@agency.example")).status).toBe(201);
    const second = await linkOf("kit.second-inspector@agency.example");
    // The new link is open (the report is countersigned, but amended since); it shows the earlier countersignature.
    const lookup = await lookUpCountersign(second);
    expect(lookup.status).toBe("open");
    if (lookup.status === "open") expect(lookup.view.countersigned?.name).toBe("Morgan Alvarez");
    expect(await countersignReport(second, "Riley Chen", null, new Date(Date.now() + 120_000))).toEqual({ ok: true, date: DAY });
    expect(await countersignReport(second, "Riley Chen", null, new Date(Date.now() + 130_000))).toEqual({ ok: false, reason: "used" });

    const body = await getDay(DAY);
    expect(body.state).toBe("countersigned");
    expect(body.signed.countersigned).toMatchObject({ name: "Riley Chen", email: "kit.second-inspector@agency.example" });
    expect(body.signed.countersignOutdated).toBe(false);
    expect(body.signed.earlierCountersignatures).toEqual([{ name: "Morgan Alvarez", email: "kit.inspector@agency.example", at: expect.any(String), amendments: 0 }]);
    const [calendar] = (await listMonthDays(await project(), "2026-06")).filter((day) => day.date === DAY);
    expect(calendar).toMatchObject({ state: "countersigned", note: "with 1 amendment" });
    // Its own stored file (c2), with both countersignatures.
    const pdf = await dailyReportPdf(await project(), DAY);
    const text = (await pdfPages(pdf.bytes)).join(" ");
    expect(text).toContain("Riley Chen");
    expect(text).toMatch(/Earlier countersignature: Morgan Alvarez, 2026-\d\d-\d\d \d\d:\d\d \(link sent to kit\.inspector@agency\.example\), of the report as signed, before any amendment\./);
    expect(text).not.toContain("Amended after this countersignature");
    const events = await AuditEvent.findAll({ where: { projectId, action: "daily-report-countersigned" }, order: [["id", "ASC"]] });
    expect(events.map((event) => event.detail)).toEqual([
      { date: DAY, name: "Morgan Alvarez", email: "kit.inspector@agency.example", amendments: 0 },
      { date: DAY, name: "Riley Chen", email: "kit.second-inspector@agency.example", amendments: 1, again: true },
    ]);
    // Countersigned again, not amended since: refused again.
    expect((await requestLink("kit.inspector@agency.example")).status).toBe(409);
    expect(await DailyReportAmendment.count({ where: { reportId: (await DailyReport.findOne({ where: { projectId, localDate: DAY } }))!.id } })).toBe(1);
  });

  it("links asked for two days at the same moment are both sent (no deadlock between their transactions)", async () => {
    // Two more signed days, each with an open link, so each request revokes one and inserts one.
    const days = ["2026-06-15", "2026-06-16"];
    for (const day of days) expect((await send(signAction as never, "dive-supervisor", `${dayPath(day)}/sign`, "POST", { name: "Dana Reyes" }, day)).status).toBe(201);
    const ask = (day: string, round: number) => send(countersignRequestAction as never, "dive-supervisor", `${dayPath(day)}/countersign-requests`, "POST", { email: `kit.round${round}@agency.example` }, day);
    for (let round = 0; round < 4; round++) {
      const answers = await Promise.all(days.map((day) => ask(day, round)));
      expect(answers.map((answer) => answer.status), `round ${round}`).toEqual([201, 201]);
    }
  });
});
