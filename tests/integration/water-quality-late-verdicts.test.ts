import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, Project, StopWorkEvent, WaterQualityReading, type Role } from "~/lib/db.server";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import { action as stationsAction } from "~/routes/api.projects.$projectId.water-quality.stations";
import { action as rulesAction } from "~/routes/api.projects.$projectId.water-quality.rules";
import { action as readingsAction } from "~/routes/api.projects.$projectId.water-quality.readings";
import { addMember, makeProject, makeUser, requestAs } from "./helpers";

// A compliance reading recorded before its background (the background sampled later, or entered
// later from the field) waits unpaired, with no verdict; the background, once entered, gives it its
// verdict, and an exceedance found so opens the stop-work event and alerts, once.

afterAll(closeSequelize);

let projectId: number;
const users = new Map<Role, { id: number; email: string }>();

type Handler = (args: never) => Promise<Response>;
const postJson = async (handler: Handler, role: Role, path: string, body: unknown, headers: Record<string, string> = {}) => {
  const request = await requestAs(users.get(role)!.id, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json", ...headers } });
  return handler({ request, params: { projectId: String(projectId) }, context: {} } as never);
};
const base = () => `/api/projects/${projectId}`;
const postReading = (body: unknown, headers: Record<string, string> = {}) => postJson(readingsAction as never, "dewatering", `${base()}/water-quality/readings`, body, headers);
const stopMails = async (station: string) => {
  await deliverDue();
  return (await listMailboxMessages()).filter((message) => message.subject.includes(`STOP WORK: turbidity exceedance at ${station}`));
};

beforeAll(async () => {
  projectId = (await makeProject("wq-late")).id;
  await Project.update({ timeZone: "America/New_York" }, { where: { id: projectId } });
  for (const role of ["manager", "dive-supervisor", "dewatering"] as Role[]) {
    const user = await makeUser(`wq-late-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, { id: user.id, email: user.email });
  }
  await postJson(stationsAction as never, "manager", `${base()}/water-quality/stations`, { name: "BG late", kind: "background" });
  await postJson(stationsAction as never, "manager", `${base()}/water-quality/stations`, { name: "CP late", kind: "compliance" });
  // 29 NTU above background, inclusive, 60-minute pairing window (Florida criterion as restated citing F.A.C. 62-302.530: published).
  await postJson(rulesAction as never, "manager", `${base()}/water-quality/rules`, { kind: "above-background", limit: 29, inclusive: true, pairingWindowMinutes: 60, notifyWithinHours: 24, source: "Permit late-test, condition 3" });
});

describe("a background entered after the compliance readings waiting for it", () => {
  let waitingId: number;
  let stopWorkId: number;

  it("the compliance reading first: unpaired, no verdict, no stop-work", async () => {
    const body = await (await postReading({ station: "CP late", takenAt: "2026-10-06T09:00:00-04:00", value: 34.5, unit: "NTU" })).json();
    expect(body.evaluation).toEqual({ paired: false, background: null, difference: null, limit: null, exceeds: null });
    expect(body.stopWork).toBeUndefined();
    waitingId = body.id;
  });

  it("the background 20 min later gives it its verdict (5 → 34.5 exceeds, difference 29.5), opens the stop-work at the later sample's time and alerts once", async () => {
    const response = await postReading({ station: "BG late", takenAt: "2026-10-06T09:20:00-04:00", value: 5, unit: "NTU", idempotencyKey: "late-bg-1" });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.evaluation).toBeNull();
    expect(body.judged).toEqual([{ id: waitingId, station: "CP late", takenAt: "2026-10-06T13:00:00.000Z", evaluation: { paired: true, background: 5, difference: 29.5, limit: 34, exceeds: true }, verdict: expect.stringMatching(/^Exceeds the limit of 34 NTU/) }]);
    // Opened when both samples existed (09:20 EDT = 13:20Z); the 24-h agency deadline counts from then (computed).
    const event = await StopWorkEvent.findByPk(body.stopWork.id);
    expect(event!.openedAt.toISOString()).toBe("2026-10-06T13:20:00.000Z");
    expect(body.stopWork.notifyBy).toBe("2026-10-07T13:20:00.000Z");
    stopWorkId = body.stopWork.id;
    expect(body.notices.join(" ")).toContain(`Stop-work event #${stopWorkId} is open`);
    const expected = ["manager", "dive-supervisor", "dewatering"].map((role) => users.get(role as Role)!.email).sort();
    expect([...body.alerted].sort()).toEqual(expected);
    const mails = await stopMails("CP late");
    expect(mails).toHaveLength(3);
    expect(mails[0].text).toContain("Judged when the background reading taken 2026-10-06T13:20:00.000Z was entered");
    const stored = await WaterQualityReading.findByPk(waitingId);
    expect({ paired: stored!.paired, exceeds: stored!.exceeds, backgroundNtu: stored!.backgroundNtu }).toEqual({ paired: true, exceeds: true, backgroundNtu: 5 });
    expect(await AuditEvent.count({ where: { projectId, action: "water-quality-reading-judged" } })).toBe(1);
  });

  it("the same background sent again (its idempotency key) answers the same and opens nothing, sends nothing", async () => {
    const body = await (await postReading({ station: "BG late", takenAt: "2026-10-06T09:20:00-04:00", value: 5, unit: "NTU", idempotencyKey: "late-bg-1" })).json();
    expect(body.judged.map((verdict: { id: number }) => verdict.id)).toEqual([waitingId]);
    expect(body.stopWork.id).toBe(stopWorkId);
    expect(body.alerted).toBeUndefined();
    expect(await StopWorkEvent.count({ where: { projectId } })).toBe(1);
    expect(await stopMails("CP late")).toHaveLength(3);
  });

  it("a second background in the window later changes nothing: the reading was judged once", async () => {
    const body = await (await postReading({ station: "BG late", takenAt: "2026-10-06T09:05:00-04:00", value: 30, unit: "NTU" })).json();
    expect(body.judged).toBeUndefined();
    expect((await WaterQualityReading.findByPk(waitingId))!.backgroundNtu).toBe(5);
    expect(await StopWorkEvent.count({ where: { projectId } })).toBe(1);
  });

  it("with the Idempotency-Key header, a background that judges a reading within the limit is replayed as first answered", async () => {
    const waiting = await (await postReading({ station: "CP late", takenAt: "2026-10-07T10:00:00-04:00", value: 20, unit: "NTU" })).json();
    expect(waiting.evaluation.exceeds).toBeNull();
    const send = () => postReading({ station: "BG late", takenAt: "2026-10-07T10:30:00-04:00", value: 6, unit: "NTU" }, { "Idempotency-Key": "late-header-1" });
    const first = await send();
    expect(first.status).toBe(201);
    const body = await first.json();
    // 20 − 6 = 14 NTU over background, within 29 (computed).
    expect(body.judged).toEqual([expect.objectContaining({ id: waiting.id, evaluation: { paired: true, background: 6, difference: 14, limit: 35, exceeds: false } })]);
    expect(body.stopWork).toBeUndefined();
    const again = await send();
    expect(again.status).toBe(200);
    expect(again.headers.get("Idempotency-Replayed")).toBe("true");
    expect(await again.json()).toEqual(body);
    expect(await WaterQualityReading.count({ where: { projectId, takenAt: new Date("2026-10-07T14:30:00Z") } })).toBe(1);
  });

  it("a background outside the pairing window, or in the other unit, leaves the reading waiting (negative controls)", async () => {
    const waiting = await (await postReading({ station: "CP late", takenAt: "2026-10-08T12:00:00-04:00", value: 80, unit: "NTU" })).json();
    // 90 minutes later, with a 60-minute window: not its background (the pairing check).
    expect((await (await postReading({ station: "BG late", takenAt: "2026-10-08T13:30:00-04:00", value: 5, unit: "NTU" })).json()).judged).toBeUndefined();
    // In the window but in FNU: a rule never pairs readings of two units.
    expect((await (await postReading({ station: "BG late", takenAt: "2026-10-08T12:10:00-04:00", value: 5, unit: "FNU" })).json()).judged).toBeUndefined();
    expect((await WaterQualityReading.findByPk(waiting.id))!.exceeds).toBeNull();
  });
});
