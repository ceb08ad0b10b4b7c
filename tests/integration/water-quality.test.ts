import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { DewateringShift, MonitoringStation, Project, StopWorkEvent, TurbidityRuleRecord, WaterQualityReading, WildlifeSighting, WildlifeStandDown, type Role } from "~/lib/db.server";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import { action as stationsAction, loader as stationsLoader } from "~/routes/api.projects.$projectId.water-quality.stations";
import { action as rulesAction } from "~/routes/api.projects.$projectId.water-quality.rules";
import { action as readingsAction, loader as readingsLoader } from "~/routes/api.projects.$projectId.water-quality.readings";
import { loader as stopWorkLoader } from "~/routes/api.projects.$projectId.stop-work";
import { action as resumeAction } from "~/routes/api.projects.$projectId.stop-work.$eventId.resume";
import { action as noticeAction } from "~/routes/api.projects.$projectId.stop-work.$eventId.notification";
import { action as sightingsAction } from "~/routes/api.projects.$projectId.wildlife.sightings";
import { presentProject } from "~/lib/auth/project-view.server";
import { complianceSummary } from "~/models/water-quality.server";
import { addMember, makeProject, makeUser, requestAs } from "./helpers";

afterAll(closeSequelize);

type Handler = (args: never) => Promise<Response>;
let projectId: number;
const users = new Map<Role, { id: number; email: string }>();

const call = async (handler: Handler, role: Role, path: string, init: RequestInit = {}, params: Record<string, string> = {}) => {
  const request = await requestAs(users.get(role)!.id, path, init);
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never);
};
const postJson = (handler: Handler, role: Role, path: string, body: unknown, params: Record<string, string> = {}) =>
  call(handler, role, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json", Origin: "http://127.0.0.1:3999" } }, params);
const base = () => `/api/projects/${projectId}`;
const postReading = (role: Role, body: unknown) => postJson(readingsAction as never, role, `${base()}/water-quality/readings`, body);
const fieldsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string }> }).errors.map((error) => error.field);

beforeAll(async () => {
  const project = await makeProject("water-quality");
  projectId = project.id;
  await Project.update({ timeZone: "America/New_York" }, { where: { id: projectId } });
  for (const role of ["manager", "dive-supervisor", "dewatering", "resource-monitor", "surveyor", "viewer"] as Role[]) {
    const user = await makeUser(`wq-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, { id: user.id, email: user.email });
  }
});

describe("stations and rules (manager)", () => {
  it("creates stations and a rule with its source; others are refused", async () => {
    expect((await postJson(stationsAction as never, "manager", `${base()}/water-quality/stations`, { name: "BG-1 up-current", kind: "background", position: { x: 600_100, y: 1_600_200 }, depth: "mid-depth" })).status).toBe(201);
    expect((await postJson(stationsAction as never, "manager", `${base()}/water-quality/stations`, { name: "CP-1 plume", kind: "compliance" })).status).toBe(201);
    expect((await postJson(stationsAction as never, "dewatering", `${base()}/water-quality/stations`, { name: "X", kind: "other" })).status).toBe(403);
    // Florida criterion of 29 NTU above background, as restated citing F.A.C. 62-302.530 (published restatement).
    const rule = await postJson(rulesAction as never, "manager", `${base()}/water-quality/rules`, { kind: "above-background", limit: 29, inclusive: true, pairingWindowMinutes: 60, notifyWithinHours: 24, source: "Permit 0001-ERP, specific condition 12" });
    expect(rule.status).toBe(201);
    const listed = (await (await call(stationsLoader as never, "viewer", `${base()}/water-quality/stations`)).json()) as { stations: Array<{ name: string; position: unknown }> };
    expect(listed.stations.map((station) => station.name)).toEqual(["BG-1 up-current", "CP-1 plume"]);
  });

  it("answers 422 naming the field for bad input, and stores nothing", async () => {
    const before = { stations: await MonitoringStation.count({ where: { projectId } }), rules: await TurbidityRuleRecord.count({ where: { projectId } }) };
    expect(await fieldsOf(await postJson(stationsAction as never, "manager", `${base()}/water-quality/stations`, { name: "Y", kind: "upstream" }))).toEqual(["kind"]);
    expect(await fieldsOf(await postJson(rulesAction as never, "manager", `${base()}/water-quality/rules`, { kind: "absolute", source: "Permit" }))).toEqual(["limit"]);
    expect(await fieldsOf(await postJson(rulesAction as never, "manager", `${base()}/water-quality/rules`, { kind: "above-background", limit: 29 }))).toEqual(["source"]);
    expect({ stations: await MonitoringStation.count({ where: { projectId } }), rules: await TurbidityRuleRecord.count({ where: { projectId } }) }).toEqual(before);
  });
});

describe("readings, the exceedance and the stop-work event", () => {
  let stopWorkId: number;

  it("judges a compliance reading against the paired background (background 5, compliance 33: within, difference 28)", async () => {
    expect((await postReading("dewatering", { station: "BG-1 up-current", takenAt: "2026-11-03T09:00:00-05:00", value: 5, unit: "NTU", instrument: "Turbidimeter T-2" })).status).toBe(201);
    const response = await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-03T09:20:00-05:00", value: 33, unit: "NTU" });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.evaluation).toEqual({ paired: true, background: 5, difference: 28, limit: 34, exceeds: false });
    expect(body.verdict).toMatch(/^Within/);
    expect(body.stopWork).toBeUndefined();
  });

  it("a compliance reading 90 min after the background with a 60-min window is unpaired: no verdict, flagged", async () => {
    const body = await (await postReading("resource-monitor", { station: "CP-1 plume", takenAt: "2026-11-03T10:30:00-05:00", value: 80, unit: "NTU" })).json();
    expect(body.evaluation).toEqual({ paired: false, background: null, difference: null, limit: null, exceeds: null });
    expect(body.verdict).toMatch(/^No verdict/);
    expect(body.stopWork).toBeUndefined();
  });

  it("an exceedance (34.5 over 5) opens a stop-work event with its deadline and e-mails the manager, dive supervisor and operator", async () => {
    await postReading("dewatering", { station: "BG-1 up-current", takenAt: "2026-11-04T08:00:00-05:00", value: 5, unit: "NTU" });
    const response = await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04T08:30:00-05:00", value: 34.5, unit: "NTU", sampledBy: "Rosa Quill" });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.evaluation).toMatchObject({ paired: true, difference: 29.5, exceeds: true });
    // 24 h after the reading (the rule's notification deadline).
    expect(body.stopWork.notifyBy).toBe("2026-11-05T13:30:00.000Z");
    stopWorkId = body.stopWork.id;
    // The answer carries the safety notices in sentences, for a client that synced the reading from its queue.
    expect(body.notices[0]).toBe(body.verdict);
    expect(body.notices[1]).toMatch(new RegExp(`Stop-work event #${stopWorkId} is open`));
    const expected = ["manager", "dive-supervisor", "dewatering"].map((role) => users.get(role as Role)!.email).sort();
    expect([...body.alerted].sort()).toEqual(expected);
    await deliverDue();
    const mail = (await listMailboxMessages()).filter((message) => message.subject.includes("STOP WORK") && expected.some((email) => message.envelopeTo.includes(email)));
    expect(mail).toHaveLength(3);
    expect(mail[0].text).toContain("34.5 NTU");
    expect(mail[0].text).toContain("Paired background: 5 NTU; difference 29.5 NTU");
    // Nobody else: the surveyor and the viewer get no alert.
    expect((await listMailboxMessages()).some((message) => message.envelopeTo.includes(users.get("viewer")!.email))).toBe(false);
  });

  it("a second exceedance at the same station joins the open event", async () => {
    const body = await (await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04T08:45:00-05:00", value: 40, unit: "NTU" })).json();
    expect(body.stopWork.id).toBe(stopWorkId);
    expect(await StopWorkEvent.count({ where: { projectId } })).toBe(1);
  });

  it("records the agency notification: when, to whom, how (manager or monitor)", async () => {
    const notice = (role: Role, body: unknown) => postJson(noticeAction as never, role, `${base()}/stop-work/${stopWorkId}/notification`, body, { eventId: String(stopWorkId) });
    expect((await notice("dewatering", { notifiedAt: "2026-11-04T09:10:00-05:00", to: "District office", how: "telephone" })).status).toBe(403);
    expect(await fieldsOf(await notice("manager", { notifiedAt: "2026-11-04T09:10:00-05:00", how: "telephone" }))).toEqual(["to"]);
    const answer = await notice("resource-monitor", { notifiedAt: "2026-11-04T09:10:00-05:00", to: "District office", how: "telephone" });
    expect(answer.status).toBe(200);
    expect((await answer.json()).event.agencyNotified).toEqual({ at: "2026-11-04T14:10:00.000Z", to: "District office", how: "telephone" });
  });

  it("refuses the resumption (409) until an in-limit resample at the station, then records it", async () => {
    const resume = (role: Role, note: string) => postJson(resumeAction as never, role, `${base()}/stop-work/${stopWorkId}/resume`, { note }, { eventId: String(stopWorkId) });
    expect((await resume("dewatering", "back")).status).toBe(403);
    const refused = await resume("manager", "Silt curtain repaired");
    expect(refused.status).toBe(409);
    expect(await fieldsOf(await resume("manager", ""))).toEqual(["note"]);
    await postReading("dewatering", { station: "BG-1 up-current", takenAt: "2026-11-04T10:00:00-05:00", value: 4, unit: "NTU" });
    const resample = await (await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04T10:10:00-05:00", value: 12, unit: "NTU" })).json();
    expect(resample.evaluation.exceeds).toBe(false);
    const accepted = await resume("resource-monitor", "Silt curtain repaired; resample 12 NTU over background 4");
    expect(accepted.status).toBe(200);
    const { event } = await accepted.json();
    expect(event).toMatchObject({ open: false, resampleReadingId: resample.id, resumeNote: "Silt curtain repaired; resample 12 NTU over background 4" });
    const listed = await (await call(stopWorkLoader as never, "viewer", `${base()}/stop-work`)).json();
    expect(listed.events).toHaveLength(1);
    expect(listed.events[0].open).toBe(false);
  });

  it("a reading at 23:30 local time counts on that local day (America/New_York)", async () => {
    const body = await (await postReading("dewatering", { station: "BG-1 up-current", takenAt: "2026-11-04T23:30:00-05:00", value: 6, unit: "NTU" })).json();
    const reading = await WaterQualityReading.findByPk(body.id);
    expect(reading!.localDay).toBe("2026-11-04");
    const listed = await (await call(readingsLoader as never, "viewer", `${base()}/water-quality/readings?from=2026-11-04&to=2026-11-04&station=BG-1%20up-current`)).json();
    expect(listed.readings.map((row: { id: number }) => row.id)).toContain(body.id);
  });

  it("stores a reading sent twice with one idempotency key once", async () => {
    const body = { station: "BG-1 up-current", takenAt: "2026-11-05T09:00:00-05:00", value: 7, unit: "NTU", idempotencyKey: "phone-42-0007" };
    const first = await (await postReading("dewatering", body)).json();
    const again = await (await postReading("dewatering", body)).json();
    expect(again.id).toBe(first.id);
    expect(await WaterQualityReading.count({ where: { projectId, idempotencyKey: "phone-42-0007" } })).toBe(1);
  });

  it("counts a day with only a dewatering shift as active: its unsampled intervals show as missed", async () => {
    // 2026-11-20: no dive, no reading, one shift logged (the pumps return water without divers).
    const day = "2026-11-20";
    const project = presentProject((await Project.findByPk(projectId))!);
    expect((await complianceSummary(project, { from: day, to: day })).missed).toEqual([]);
    await DewateringShift.create({
      projectId, shiftDate: day, startAt: "07:00", endAt: "15:00", pumpHours: 8, slurryFlowValue: 100, slurryFlowUnit: "m3/h",
      totaliserStart: null, totaliserEnd: null, totaliserUnit: null, solidsByWeight: 0.1, slurrySpecificGravity: null, solidsSpecificGravity: 2.5,
      polymerProduct: "P-1", polymerLot: null, doseMgPerL: 10, stockPercent: 0.5, drySolidsKg: 1000, neatPolymerKg: 1, notes: "", idempotencyKey: null,
    });
    const missed = (await complianceSummary(project, { from: day, to: day })).missed;
    expect(missed.length).toBeGreaterThan(0);
    expect(missed.every((gap) => gap.from.startsWith(day) || gap.from.startsWith("2026-11-21"))).toBe(true);
  });

  it("answers 422 naming the field, storing nothing, and refuses roles that do not take readings", async () => {
    const before = await WaterQualityReading.count({ where: { projectId } });
    expect(await fieldsOf(await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04 08:30", value: 3, unit: "NTU" }))).toEqual(["takenAt"]);
    expect(await fieldsOf(await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04T08:30:00-05:00", value: -1, unit: "NTU" }))).toEqual(["value"]);
    expect(await fieldsOf(await postReading("dewatering", { station: "CP-1 plume", takenAt: "2026-11-04T08:30:00-05:00", value: 3, unit: "JTU" }))).toEqual(["unit"]);
    expect((await postReading("dewatering", { station: "Nowhere", takenAt: "2026-11-04T08:30:00-05:00", value: 3, unit: "NTU" })).status).toBe(404);
    expect((await postReading("dive-supervisor", { station: "CP-1 plume", takenAt: "2026-11-04T08:30:00-05:00", value: 3, unit: "NTU" })).status).toBe(403);
    expect(await WaterQualityReading.count({ where: { projectId } })).toBe(before);
  });
});

describe("wildlife sightings and stand-downs (default 50 ft / 30 min: memory, a project setting)", () => {
  const sight = (role: Role, body: unknown) => postJson(sightingsAction as never, role, `${base()}/wildlife/sightings`, body);

  it("a sighting within the distance starts a stand-down; the animal leaving ends it after the wait", async () => {
    const seen = await sight("dive-supervisor", { species: "Manatee", seenAt: "2026-11-04T11:00:00-05:00", distance: 30, observer: "Ned Carrow" });
    expect(seen.status).toBe(201);
    const started = await seen.json();
    expect(started.standDown).toEqual({ id: expect.any(Number), until: null });
    expect(started.notices[0]).toMatch(new RegExp(`Stand-down #${started.standDown.id} for manatee applies`, "i"));
    const gone = await (await sight("dewatering", { species: "manatee", seenAt: "2026-11-04T11:40:00-05:00", gone: true, observer: "Ned Carrow" })).json();
    // Left at 11:40 local (16:40 UTC) + 30 min wait.
    expect(gone.standDown).toEqual({ id: started.standDown.id, until: "2026-11-04T17:10:00.000Z" });
    const standDown = await WildlifeStandDown.findByPk(started.standDown.id);
    expect(standDown!.waitMinutes).toBe(30);
  });

  it("a sighting beyond the distance starts nothing; a species off the list or a missing distance is 422, nothing stored", async () => {
    expect((await (await sight("resource-monitor", { species: "sea turtle", seenAt: "2026-11-04T12:00:00-05:00", distance: 120, observer: "R" })).json()).standDown).toBeUndefined();
    const before = await WildlifeSighting.count({ where: { projectId } });
    expect(await fieldsOf(await sight("resource-monitor", { species: "dolphin", seenAt: "2026-11-04T12:00:00-05:00", distance: 10, observer: "R" }))).toEqual(["species"]);
    expect(await fieldsOf(await sight("resource-monitor", { species: "manatee", seenAt: "2026-11-04T12:00:00-05:00", observer: "R" }))).toEqual(["distance"]);
    expect((await sight("viewer", { species: "manatee", seenAt: "2026-11-04T12:00:00-05:00", distance: 1, observer: "R" })).status).toBe(403);
    expect(await WildlifeSighting.count({ where: { projectId } })).toBe(before);
  });
});
