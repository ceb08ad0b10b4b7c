import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import { closeSequelize } from "../../db/connection.server";
import { cellLabel, type CellGrid } from "../../shared/grid/cell-grid";
import { localDayOf } from "../../shared/local-time";
import { GRID, WORK_LIMIT } from "../../sample-data/scenario";
import { DiveTeam, getSequelize, MonitoringStation, Project, StopWorkEvent, WaterQualityReading, type Role } from "~/lib/db.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import { action as assignAction } from "~/routes/api.projects.$projectId.assignments";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { createRule, createStation, recordReading, resumeStopWork, ruleInputSchema } from "~/models/water-quality.server";
import { recordSighting, sightingInputSchema } from "~/models/wildlife.server";
import { readingInputSchema } from "~/lib/field-records/inputs";
import { addMember, makeUser, requestAs } from "./helpers";

// Something that stops work (a turbidity stop-work event, a wildlife stand-down) stops today's:
// the dive plan for today is refused (409 naming it) while it lasts, under the same project-row
// lock the holds use; a later day may still be planned.

afterAll(closeSequelize);

let project: ProjectView;
const users = new Map<Role, Awaited<ReturnType<typeof makeUser>>>();
const inside: string[] = [];

type Handler = (args: never) => Promise<Response>;
const assign = async (date: string, cell: string) => {
  const request = await requestAs(users.get("dive-supervisor")!.id, `/api/projects/${project.id}/assignments`, {
    method: "POST", body: JSON.stringify({ date, team: "Team Heron", cells: [cell], hose: "Hose A" }), headers: { "Content-Type": "application/json" },
  });
  return (assignAction as Handler)({ request, params: { projectId: String(project.id) }, context: {} } as never);
};
const errorsOf = async (response: Response) => (await response.json()) as { errors: Array<{ field?: string; message: string }>; code?: string; stopWork?: Array<{ id: number }>; standDowns?: Array<{ id: number; species: string }> };
const today = () => localDayOf(Date.now(), project.timeZone);
const dayAfter = (days: number) => localDayOf(Date.now() + days * 86_400_000, project.timeZone);
const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString();
let nextCell = 0;
const freshCell = () => inside[nextCell++];

beforeAll(async () => {
  const row = await Project.create({
    name: "Stopped work test", slug: `stopped-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 1,
  });
  project = presentProject(row);
  await DiveTeam.create({ projectId: project.id, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "A", email: "stopped-heron-a@example.org", duty: "diver" }] });
  for (const role of ["manager", "dive-supervisor", "dewatering"] as Role[]) {
    const user = await makeUser(`stopped-${role}`);
    await addMember(user.id, project.id, role);
    users.set(role, user);
  }
  const request = await requestAs(users.get("manager")!.id, `/api/projects/${project.id}/cells`);
  const payload = (await (cellsLoader as Handler)({ request, params: { projectId: String(project.id) }, context: {} } as never).then((response) => response.json())) as { grid: CellGrid; status: number[] };
  payload.status.forEach((code, index) => {
    if (code >= 0) inside.push(cellLabel(Math.floor(index / payload.grid.cols) + payload.grid.firstRow, (index % payload.grid.cols) + payload.grid.firstCol));
  });
  const manager = users.get("manager")!;
  // Florida criterion, 29 NTU above background (published restatement citing F.A.C. 62-302.530).
  await createRule(project, manager, ruleInputSchema.parse({ kind: "above-background", limit: 29, source: "Permit test, condition 1" }));
  await createStation(project, manager, { name: "BG", kind: "background" });
  await createStation(project, manager, { name: "CP", kind: "compliance" });
});

const reading = (station: string, value: number, takenAt: string) => recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station, takenAt, value, unit: "NTU" }), null, { alert: false });

describe("assigning cells while work is stopped", () => {
  it("refuses today's cells (409 naming the stop-work) during a turbidity stop-work; tomorrow may be planned; after the resumption today is accepted", async () => {
    expect((await assign(today(), freshCell())).status).toBe(201); // negative control: nothing stops work yet
    await reading("BG", 5, minutesAgo(40));
    const exceeded = await reading("CP", 34.5, minutesAgo(30)); // 29.5 over background: exceeds (published criterion)
    const stopWorkId = exceeded.stopWork!.id;
    const refused = await assign(today(), freshCell());
    expect(refused.status).toBe(409);
    const answer = await errorsOf(refused);
    expect(answer.code).toBe("work-stopped");
    expect(answer.stopWork).toEqual([{ id: stopWorkId, station: "CP" }]);
    expect(answer.errors[0]).toMatchObject({ field: "date", message: expect.stringContaining(`stop-work #${stopWorkId} (turbidity exceedance at CP)`) });
    expect((await assign(dayAfter(1), freshCell())).status).toBe(201);

    await reading("BG", 5, minutesAgo(20));
    await reading("CP", 12, minutesAgo(10)); // within: an in-limit resample
    await resumeStopWork(project, users.get("manager")!, stopWorkId, "Curtain repaired; resample within the limit.");
    expect((await assign(today(), freshCell())).status).toBe(201);
  });

  it("refuses today's cells during a stand-down in force, and accepts them once the animal has left and the wait has passed", async () => {
    const sighting = (minutes: number, fields: Record<string, unknown>) => recordSighting(project, users.get("dive-supervisor")!, sightingInputSchema.parse({ species: "manatee", seenAt: minutesAgo(minutes), observer: "Test", ...fields }));
    const started = await sighting(120, { distance: 20 }); // within the default 50 ft (memory)
    const refused = await assign(today(), freshCell());
    expect(refused.status).toBe(409);
    const answer = await errorsOf(refused);
    expect(answer.standDowns).toEqual([{ id: started.standDown!.id, species: "manatee", until: null }]);
    expect(answer.errors[0].message).toContain(`a manatee stand-down (#${started.standDown!.id}, the animal is still near)`);
    // Left 10 minutes ago: the 30-minute wait (memory, the project's default) is still running.
    await sighting(10, { gone: true });
    expect((await assign(today(), freshCell())).status).toBe(409);
    // Moved into the past by the clock: left 90 minutes ago, the wait ended an hour ago (computed).
    const { WildlifeStandDown } = await import("~/lib/db.server");
    await WildlifeStandDown.update({ departedAt: new Date(Date.now() - 90 * 60_000), endsAt: new Date(Date.now() - 60 * 60_000) }, { where: { id: started.standDown!.id } });
    expect((await assign(today(), freshCell())).status).toBe(201);
  });

  it("waits for a stop-work being opened that instant and refuses today's cells, never slipping past it (409)", async () => {
    // A reading opening a stop-work holds the project row's lock until it commits; an assignment
    // asked that instant waits on the same lock before it looks. (Computed: with the look taken
    // before the lock, it saw no event while the reading's transaction was open: 201.)
    const station = await MonitoringStation.findOne({ where: { projectId: project.id, name: "CP" } });
    let assigned: Promise<Response> | null = null;
    let eventId = 0;
    await getSequelize().transaction(async (transaction) => {
      await Project.findByPk(project.id, { lock: transaction.LOCK.UPDATE, transaction });
      assigned = assign(today(), freshCell());
      await new Promise((resolve) => setTimeout(resolve, 400));
      const reading = await WaterQualityReading.findOne({ where: { projectId: project.id, stationId: station!.id }, order: [["id", "DESC"]], transaction });
      const event = await StopWorkEvent.create({ projectId: project.id, stationId: station!.id, readingId: reading!.id, openedAt: new Date(), notifyBy: new Date(Date.now() + 86_400_000) }, { transaction });
      eventId = event.id;
    });
    const answer = await assigned!;
    expect(answer.status).toBe(409);
    expect((await errorsOf(answer)).errors[0].message).toContain(`stop-work #${eventId}`);
    await StopWorkEvent.update({ resumedAt: new Date(), resumeNote: "race test" }, { where: { id: eventId } });
  });
});
