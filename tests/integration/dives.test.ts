import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import { closeSequelize } from "../../db/connection.server";
import { cellLabel } from "../../shared/grid/cell-grid";
import { AIR_NO_DECOMPRESSION_ROWS } from "../../shared/no-decompression";
import { GRID, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { AuditEvent, DiveTeam, Project, Zone, type Role } from "~/lib/db.server";
import { action as assignAction } from "~/routes/api.projects.$projectId.assignments";
import { action as diveAction, loader as diveLoader } from "~/routes/api.projects.$projectId.dives";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { action as planPageAction } from "~/routes/projects.$projectId.plans.$date";
import { localDayOf } from "../../shared/local-time";
import { addMember, makeUser, requestAs } from "./helpers";

afterAll(closeSequelize);

let projectId: number;
const users = new Map<Role, number>();
let labels: string[] = [];
// A past day: the log takes dives on or before the project's today.
const DATE = "2025-04-08";
/** Far enough east that its today is often UTC's tomorrow: the rule must count days there, not in UTC. */
const TIME_ZONE = "Pacific/Kiritimati";

const call = async (handler: (args: never) => Promise<Response>, role: Role, path: string, init: RequestInit = {}) => {
  const request = await requestAs(users.get(role)!, path, init);
  return handler({ request, params: { projectId: String(projectId) }, context: {} } as never);
};
const postJson = (handler: (args: never) => Promise<Response>, role: Role, path: string, body: unknown) =>
  call(handler, role, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
const logDive = (role: Role, body: unknown) => postJson(diveAction as never, role, `/api/projects/${projectId}/dives`, body);
/** The API's error shape, {errors: [{field?, message}]}, as one line of "field: message". */
const errorText = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors.map((error) => (error.field ? `${error.field}: ${error.message}` : error.message)).join("; ");

beforeAll(async () => {
  const project = await Project.create({
    name: "Dive log test", slug: `dives-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 2, timeZone: TIME_ZONE,
  });
  projectId = project.id;
  for (const [index, zone] of ZONES.entries()) await Zone.create({ projectId, name: zone.name, sortOrder: index, polygonGeoJson: JSON.stringify(zone.polygon) });
  await DiveTeam.create({ projectId, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "Odile Farrant", email: "heron-a@example.org", duty: "diver" }, { name: "Pell Anstruther", email: "heron-p@example.org", duty: "standby diver" }, { name: "B", email: "heron-b@example.org", duty: "tender" }] });
  await DiveTeam.create({ projectId, name: "Team Otter", station: "Barge 2", hoses: [{ name: "Hose B", diameter: 6, diameterUnit: "in" }], members: [{ name: "C", email: "otter-c@example.org", duty: "diver" }, { name: "D", email: "otter-d@example.org", duty: "tender" }] });
  for (const role of ["manager", "dive-supervisor", "surveyor", "viewer"] as Role[]) {
    const user = await makeUser(`dives-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
  const payload = (await (await call(cellsLoader as never, "viewer", `/api/projects/${projectId}/cells`)).json()) as { grid: { cols: number; firstRow: number; firstCol: number }; status: number[] };
  payload.status.forEach((code, index) => {
    if (code >= 0) labels.push(cellLabel(Math.floor(index / payload.grid.cols) + payload.grid.firstRow, (index % payload.grid.cols) + payload.grid.firstCol));
  });
  labels = labels.slice(10, 14);
  const assigned = await postJson(assignAction as never, "dive-supervisor", `/api/projects/${projectId}/assignments`, { date: DATE, team: "Team Heron", cells: labels.slice(0, 3), hose: "Hose A" });
  expect(assigned.status).toBe(201);
});

describe("POST /api/projects/<id>/dives", () => {
  it("logs a dive with its two times for a dive supervisor (201), bottom time from leaving the surface to leaving the bottom", async () => {
    const response = await logDive("dive-supervisor", { date: DATE, team: "Team Heron", diver: "Odile Farrant", leftSurface: "08:05", leftBottom: "09:17", maxDepth: 22.4, cells: [labels[0].toLowerCase(), labels[1]], notes: "vent edge" });
    expect(response.status).toBe(201);
    const body = await response.json();
    // 09:17 − 08:05 = 72 minutes (computed).
    expect(body.dive).toMatchObject({ team: "Team Heron", diver: "Odile Farrant", bottomMinutes: 72, maxDepth: 22.4, cells: [labels[0], labels[1]].sort(), leftSurface: "08:05" });
    // 22.4 US ft enters the 25 fsw row (next deeper row: published rule of the US Navy table, figures as recalled in shared/no-decompression.ts).
    expect(body.dive.noDecompression.lookup).toEqual({ kind: "limit", tableDepthFsw: 25, limitMinutes: AIR_NO_DECOMPRESSION_ROWS.find((row) => row.depthFsw === 25)!.limitMinutes });
    expect(body.dive.noDecompression.exceeds).toBe(false);
    expect(body.caution).toContain("dive plan");
    expect(await AuditEvent.count({ where: { projectId, action: "dive-recorded" } })).toBe(1);
  });

  it("flags, as information, a bottom time beyond the table's figure for the logged depth", async () => {
    const limit45 = AIR_NO_DECOMPRESSION_ROWS.find((row) => row.depthFsw === 45)!.limitMinutes!;
    const response = await logDive("manager", { date: DATE, team: "Team Heron", diver: "Pell Anstruther", bottomMinutes: limit45 + 5, maxDepth: 43, cells: [labels[2]] });
    expect(response.status).toBe(201);
    const { dive } = await response.json();
    expect(dive.noDecompression).toMatchObject({ lookup: { kind: "limit", tableDepthFsw: 45, limitMinutes: limit45 }, exceeds: true });
    const atLimit = await (await logDive("manager", { date: DATE, team: "Team Heron", diver: "Pell Anstruther", bottomMinutes: limit45, maxDepth: 43, cells: [labels[2]] })).json();
    expect(atLimit.dive.noDecompression.exceeds).toBe(false);
  });

  it("refuses cells not assigned to that team on that day, naming them", async () => {
    const response = await logDive("dive-supervisor", { date: DATE, team: "Team Otter", diver: "C", bottomMinutes: 30, maxDepth: 10, cells: [labels[0]] });
    expect(response.status).toBe(422);
    expect(await errorText(response)).toContain(`Cells ${labels[0]} are not assigned to Team Otter on ${DATE}`);
    const unassigned = await logDive("dive-supervisor", { date: DATE, team: "Team Heron", diver: "Odile Farrant", bottomMinutes: 30, maxDepth: 10, cells: [labels[3]] });
    expect(unassigned.status).toBe(422);
    expect((await logDive("dive-supervisor", { date: DATE, team: "Team Nobody", diver: "X", bottomMinutes: 30, maxDepth: 10, cells: [labels[0]] })).status).toBe(404);
  });

  it("validates the times, the bottom time and the depth with clear messages (422)", async () => {
    const base = { date: DATE, team: "Team Heron", diver: "Odile Farrant", maxDepth: 10, cells: [labels[0]] };
    const cases: Array<[unknown, string]> = [
      [{ ...base, leftSurface: "09:00", leftBottom: "08:30" }, "leftBottom: the diver leaves the bottom after leaving the surface"],
      [{ ...base, leftSurface: "09:00" }, "leftBottom: give both times"],
      [base, "bottomMinutes: give the bottom time in minutes"],
      [{ ...base, leftSurface: "08:00", leftBottom: "08:40", bottomMinutes: 35 }, "the times give 40 minutes, not 35"],
      [{ ...base, leftSurface: "8:00", leftBottom: "08:40" }, "HH:MM"],
      [{ ...base, bottomMinutes: 20, maxDepth: -3 }, "maxDepth"],
      [{ ...base, bottomMinutes: 20, date: "2031-02-30" }, "that date does not exist"],
      [{ ...base, bottomMinutes: 20, cells: [] }, "name at least one cell"],
    ];
    for (const [body, message] of cases) {
      const response = await logDive("dive-supervisor", body);
      expect(response.status, JSON.stringify(body)).toBe(422);
      expect(await errorText(response)).toContain(message);
    }
  });

  it("refuses a dive dated after the project's today (422 naming the date), counting days in the project's time zone", async () => {
    // The project's today and tomorrow in its own zone (computed with shared/local-time, as the rule is).
    const today = localDayOf(Date.now(), TIME_ZONE);
    const tomorrow = localDayOf(Date.now() + 86_400_000, TIME_ZONE);
    for (const date of [today, tomorrow]) {
      const assigned = await postJson(assignAction as never, "dive-supervisor", `/api/projects/${projectId}/assignments`, { date, team: "Team Heron", cells: [labels[3]], hose: "Hose A" });
      expect(assigned.status, date).toBe(201);
    }
    const refused = await logDive("dive-supervisor", { date: tomorrow, team: "Team Heron", diver: "Odile Farrant", bottomMinutes: 30, maxDepth: 10, cells: [labels[3]] });
    expect(refused.status).toBe(422);
    const body = await refused.json();
    expect(body.code).toBe("future-date");
    expect(body.errors[0]).toMatchObject({ field: "date", value: tomorrow });
    expect(body.errors[0].message).toContain(`${tomorrow} is after today (${today} in ${TIME_ZONE})`);
    // Today in the project's zone is taken, even when it is already tomorrow in UTC.
    const accepted = await logDive("dive-supervisor", { date: today, team: "Team Heron", diver: "Odile Farrant", bottomMinutes: 30, maxDepth: 10, cells: [labels[3]] });
    expect(accepted.status).toBe(201);
    await (await import("~/lib/db.server")).Dive.destroy({ where: { projectId, diveDate: today } });
  });

  it("refuses the same dive on the plan page (422 naming the date), nothing stored", async () => {
    const tomorrow = localDayOf(Date.now() + 86_400_000, TIME_ZONE);
    const before = await (await import("~/lib/db.server")).Dive.count({ where: { projectId } });
    const form = new URLSearchParams({ intent: "dive", team: String((await DiveTeam.findOne({ where: { projectId, name: "Team Heron" } }))!.id), diver: "Odile Farrant", bottomMinutes: "30", maxDepth: "10", cells: labels[3] });
    const request = await requestAs(users.get("dive-supervisor")!, `/projects/${projectId}/plans/${tomorrow}`, {
      method: "POST", body: form, headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: "http://127.0.0.1:3999" },
    });
    const answer = (await planPageAction({ request, params: { projectId: String(projectId), date: tomorrow }, context: {} } as never)) as unknown as { init: { status: number }; data: { ok: boolean; field: string; message: string } };
    expect(answer.init.status).toBe(422);
    expect(answer.data).toMatchObject({ ok: false, field: "date" });
    expect(answer.data.message).toMatch(/^Date: A dive is logged once it has been made/);
    expect(await (await import("~/lib/db.server")).Dive.count({ where: { projectId } })).toBe(before);
  });

  it("takes divers from the team's roster, and anyone else only as a marked visitor", async () => {
    const base = { date: DATE, team: "Team Heron", bottomMinutes: 25, maxDepth: 10, cells: [labels[1]] };
    const stranger = await logDive("dive-supervisor", { ...base, diver: "Quill Ambrose" });
    expect(stranger.status).toBe(422);
    const refusal = await stranger.json();
    expect(refusal.code).toBe("not-on-roster");
    expect(refusal.roster).toEqual(["Odile Farrant", "Pell Anstruther", "B"]);
    expect(refusal.errors[0]).toMatchObject({ field: "diver", value: "Quill Ambrose" });
    expect(refusal.errors[0].message).toContain("Quill Ambrose is not on Team Heron's roster (Odile Farrant, Pell Anstruther, B); choose a diver from the team, or log them as a visitor.");
    // Another team's diver is not this team's either.
    expect((await logDive("dive-supervisor", { ...base, diver: "C" })).status).toBe(422);

    const visitor = await logDive("dive-supervisor", { ...base, diver: "Quill Ambrose", visitor: true });
    expect(visitor.status).toBe(201);
    expect((await visitor.json()).dive).toMatchObject({ diver: "Quill Ambrose", visitor: true });
    // A roster name in other spacing and case is the roster's person, not a visitor (even when sent as one).
    const member = await logDive("dive-supervisor", { ...base, diver: "  pell   ANSTRUTHER ", visitor: true });
    expect((await member.json()).dive).toMatchObject({ diver: "Pell Anstruther", visitor: false });
    const audit = await AuditEvent.findOne({ where: { projectId, action: "dive-recorded" }, order: [["id", "DESC"]] });
    expect(audit!.detail).toMatchObject({ diver: "Pell Anstruther", visitor: false });
    // The day's log shows who was a visitor.
    const byDay = await (await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives?date=${DATE}`)).json();
    expect(byDay.dives.filter((dive: { visitor: boolean }) => dive.visitor).map((dive: { diver: string }) => dive.diver)).toEqual(["Quill Ambrose"]);
  });

  it("is refused (403) for roles other than dive supervisor and manager", async () => {
    for (const role of ["surveyor", "viewer"] as Role[]) {
      const refused = await logDive(role, { date: DATE, team: "Team Heron", diver: "X", bottomMinutes: 20, maxDepth: 10, cells: [labels[0]] });
      expect(refused.status, role).toBe(403);
    }
  });
});

describe("GET /api/projects/<id>/dives", () => {
  it("lists a cell's dives and a day's dives for any member", async () => {
    const byCell = await (await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives?cell=${labels[0]}`)).json();
    expect(byCell.dives.map((dive: { diver: string }) => dive.diver)).toEqual(["Odile Farrant"]);
    const byCell2 = await (await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives?cell=${labels[2]}`)).json();
    expect(byCell2.dives).toHaveLength(2);
    const byDay = await (await call(diveLoader as never, "surveyor", `/api/projects/${projectId}/dives?date=${DATE}`)).json();
    expect(byDay.dives).toHaveLength(5); // three logged first, then a visitor and a roster member
    expect((await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives?cell=${labels[3]}`).then((r) => r.json())).dives).toEqual([]);
    expect((await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives`)).status).toBe(400);
    expect((await call(diveLoader as never, "viewer", `/api/projects/${projectId}/dives?cell=!!`)).status).toBe(400);
  });
});
