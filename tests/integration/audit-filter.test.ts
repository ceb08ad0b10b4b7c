import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent } from "~/lib/db.server";
import { listAuditPeople, listProjectAuditEvents } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { makeProject, makeUser } from "./helpers";

// The audit log's filter: by person, by action, and by local days of the project's time zone.

afterAll(closeSequelize);

let project: ProjectView;
let first: { id: number; name: string };
let second: { id: number; name: string };
const ids: Record<string, number> = {};

async function event(label: string, userId: number, action: "sign-in" | "invite", at: string) {
  const created = await AuditEvent.create({ projectId: project.id, userId, action, ip: null, detail: {} });
  await AuditEvent.update({ createdAt: new Date(at) }, { where: { id: created.id }, silent: true });
  ids[label] = Number(created.id);
}

beforeAll(async () => {
  project = { ...(await makeProject("audit-filter")), timeZone: "America/New_York" };
  first = await makeUser("audit-a");
  second = await makeUser("audit-b");
  // computed: New York keeps daylight time (UTC−4) from 2026-03-08 (the second Sunday of March, 15 U.S.C. 260a)
  await event("late", first.id, "sign-in", "2026-03-10T03:30:00Z"); // 2026-03-09 23:30 local
  await event("early", first.id, "invite", "2026-03-10T04:30:00Z"); // 2026-03-10 00:30 local
  await event("next", second.id, "sign-in", "2026-03-11T12:00:00Z"); // 2026-03-11 08:00 local
});

const listed = async (filter: Parameters<typeof listProjectAuditEvents>[2]) => (await listProjectAuditEvents(project, 1, filter)).events.map((entry) => entry.id);

describe("the audit log's filter", () => {
  it("shows every entry newest first, with local dates and times", async () => {
    const { events, total } = await listProjectAuditEvents(project, 1);
    expect(events.map((entry) => entry.id)).toEqual([ids.next, ids.early, ids.late]);
    expect(total).toBe(3);
    expect(events.map((entry) => `${entry.localDay} ${entry.localTime}`)).toEqual(["2026-03-11 08:00", "2026-03-10 00:30", "2026-03-09 23:30"]);
  });

  it("narrows to a person, an action, or both", async () => {
    expect(await listed({ userId: first.id })).toEqual([ids.early, ids.late]);
    expect(await listed({ action: "sign-in" })).toEqual([ids.next, ids.late]);
    expect(await listed({ userId: first.id, action: "sign-in" })).toEqual([ids.late]);
    expect(await listed({ userId: second.id, action: "invite" })).toEqual([]);
  });

  it("counts whole local days, not UTC days", async () => {
    // Both first entries fall on 2026-03-10 in UTC; only one does on the project's clock.
    expect(await listed({ from: "2026-03-10", to: "2026-03-10" })).toEqual([ids.early]);
    expect(await listed({ to: "2026-03-09" })).toEqual([ids.late]);
    expect(await listed({ from: "2026-03-10" })).toEqual([ids.next, ids.early]);
    expect(await listed({ from: "2026-03-12" })).toEqual([]);
  });

  it("lists the people who appear in the log, by name", async () => {
    expect((await listAuditPeople(project)).map((person) => person.id)).toEqual([first, second].sort((a, b) => a.name.localeCompare(b.name)).map((person) => person.id));
  });
});
