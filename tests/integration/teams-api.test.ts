import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { closeSequelize, getSequelize } from "../../db/connection.server";
import { createUmzug } from "../../db/umzug";
import { Assignment, AuditEvent, DiveTeam, Project } from "~/lib/db.server";
import { listDiveTeams } from "~/models/dive-teams.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { action as teamsAction, loader as teamsLoader } from "~/routes/api.projects.$projectId.teams";
import { action as teamAction } from "~/routes/api.projects.$projectId.teams.$teamId";
import { addMember, makeProject, makeUser, requestAs } from "./helpers";

// Issue "project setup": dive teams through the API, as the dive supervisor or an agency's system
// would set them up. One service (app/models/dive-teams.server.ts) for the API, the teams page and
// the seeder; a team with work on record is retired, never deleted with its history (practice:
// dive logs are kept records, and the team named on them must stay).

afterAll(closeSequelize);

let projectId: number;
let managerId: number;
let supervisorId: number;
let viewerId: number;
let memberName: string;
let memberId: number;
type Handler = (args: never) => Promise<Response>;
const call = async (handler: Handler, userId: number, path: string, params: Record<string, string>, init: RequestInit = {}) => {
  const request = await requestAs(userId, `/api/projects/${projectId}/teams${path}`, init);
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never);
};
const json = (method: string, body: unknown): RequestInit => ({ method, body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
const create = (userId: number, body: unknown) => call(teamsAction as never, userId, "", {}, json("POST", body));
const patch = (userId: number, teamId: number, body: unknown) => call(teamAction as never, userId, `/${teamId}`, { teamId: String(teamId) }, json("PATCH", body));
const remove = (userId: number, teamId: number) => call(teamAction as never, userId, `/${teamId}`, { teamId: String(teamId) }, { method: "DELETE" });
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;

beforeAll(async () => {
  const project = await makeProject("teams-api");
  projectId = project.id;
  await Project.update({ minTeamSize: 3 }, { where: { id: projectId } });
  managerId = (await makeUser("teams-api-manager")).id;
  const supervisor = await makeUser("teams-api-supervisor");
  supervisorId = supervisor.id;
  viewerId = (await makeUser("teams-api-viewer")).id;
  const diver = await makeUser("teams-api-diver");
  memberName = diver.name;
  memberId = diver.id;
  await addMember(managerId, projectId, "manager");
  await addMember(supervisorId, projectId, "dive-supervisor");
  await addMember(viewerId, projectId, "viewer");
  await addMember(diver.id, projectId, "viewer");
});

describe("POST /api/projects/<id>/teams", () => {
  it("creates a team (201 {id}) with members chosen by id or name and named crew, and audits it", async () => {
    const response = await create(supervisorId, { name: "Team Osprey", members: [memberId, "Wren Ashdown", { name: "Tamsin Orr", duty: "tender" }], hoses: ["Hose 1", "Hose 2"], station: "North landing" });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.id).toBeGreaterThan(0);
    expect(body.team.members).toEqual([
      { name: memberName, email: expect.stringContaining("@example.org"), duty: "", userId: memberId },
      { name: "Wren Ashdown", email: "", duty: "" },
      { name: "Tamsin Orr", email: "", duty: "tender" },
    ]);
    // The first form of hoses, names alone, is still taken: no diameter is known yet.
    expect(body.team).toMatchObject({
      hoses: [{ name: "Hose 1", diameter: null, diameterUnit: "in" }, { name: "Hose 2", diameter: null, diameterUnit: "in" }], pumps: [],
      station: "North landing", belowMinimum: false, retiredAt: null,
    });
    expect(await AuditEvent.count({ where: { projectId, action: "team-created" } })).toBe(1);
    // A member named by name links to the account, as by id.
    const byName = await create(managerId, { name: "Team Kite", members: [memberName.toUpperCase()] });
    expect(byName.status).toBe(201);
    expect((await byName.json()).team).toMatchObject({ members: [{ name: memberName, userId: memberId }], belowMinimum: true });
  });

  it("answers 422 naming each bad field, 409 for a name taken, 403 for a viewer", async () => {
    const bad = await create(managerId, { name: " ", members: [999_999_999, "Ann Lee", "ann  lee"], hoses: ["A", "a"] });
    expect(bad.status).toBe(422);
    expect((await errorsOf(bad)).map((error) => error.field)).toEqual(["name"]);
    const badCrew = await create(managerId, { name: "Team Ibis", members: [999_999_999, "Ann Lee", "ann  lee"], hoses: ["A", "a"] });
    expect(badCrew.status).toBe(422);
    expect((await errorsOf(badCrew)).map((error) => error.field).sort()).toEqual(["hoses.1", "members.0", "members.2"]);
    const taken = await create(managerId, { name: "team osprey" });
    expect(taken.status).toBe(409);
    expect((await errorsOf(taken))[0]).toMatchObject({ field: "name", message: expect.stringContaining("already has a team named Team Osprey") });
    expect((await create(viewerId, { name: "Team Viewer" })).status).toBe(403);
    expect(await DiveTeam.count({ where: { projectId, name: ["Team Ibis", "Team Viewer"] } })).toBe(0);
  });

  it("lists the teams to every member", async () => {
    const response = await call(teamsLoader as never, viewerId, "", {});
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.teams.map((team: { name: string }) => team.name)).toEqual(["Team Osprey", "Team Kite"]);
    expect(body.minTeamSize).toBe(3);
  });
});

describe("PATCH and DELETE /api/projects/<id>/teams/<teamId>", () => {
  it("changes a team, refusing another team's name", async () => {
    const team = await DiveTeam.findOne({ where: { projectId, name: "Team Kite" } });
    const changed = await patch(supervisorId, team!.id, { name: "Team Harrier", hoses: ["Hose 3"] });
    expect(changed.status).toBe(200);
    expect((await changed.json()).team).toMatchObject({ name: "Team Harrier", hoses: [{ name: "Hose 3", diameter: null, diameterUnit: "in" }] });
    expect((await patch(supervisorId, team!.id, { name: "Team Osprey" })).status).toBe(409);
    expect((await patch(supervisorId, team!.id, {})).status).toBe(422);
    expect((await patch(viewerId, team!.id, { station: "x" })).status).toBe(403);
    expect((await patch(managerId, 999_999_999, { station: "x" })).status).toBe(404);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "team-changed" } });
    expect(audit?.detail).toMatchObject({ before: { name: "Team Kite" }, after: { name: "Team Harrier" } });
  });

  it("deletes a team with nothing on record (204) and retires one whose assignments name it, keeping them", async () => {
    const spare = await create(managerId, { name: "Team Spare" });
    const spareId = (await spare.json()).id as number;
    expect((await remove(supervisorId, spareId)).status).toBe(204);
    expect(await DiveTeam.count({ where: { id: spareId } })).toBe(0);

    const osprey = await DiveTeam.findOne({ where: { projectId, name: "Team Osprey" } });
    await Assignment.create({ projectId, workDate: "2031-05-06", teamId: osprey!.id, row: 1, col: 1, label: "B2", hose: "Hose 1", notes: "", workingDepth: null, plannedBottomMinutes: null, confirmedReason: null });
    const retired = await remove(managerId, osprey!.id);
    expect(retired.status).toBe(200);
    const body = await retired.json();
    expect(body).toMatchObject({ retired: true, records: { assignments: 1, dives: 0, finds: 0 } });
    expect(body.message).toContain("1 assigned cell");
    expect(await Assignment.count({ where: { teamId: osprey!.id } })).toBe(1);
    await osprey!.reload();
    expect(osprey!.retiredAt).not.toBeNull();
    // Out of the plans' choice; listed after the teams in service; its name stays taken.
    const listed = await (await call(teamsLoader as never, viewerId, "", {})).json();
    expect(listed.teams.map((team: { name: string; retiredAt: string | null }) => [team.name, team.retiredAt !== null])).toEqual([["Team Harrier", false], ["Team Osprey", true]]);
    const again = await create(managerId, { name: "Team Osprey" });
    expect(again.status).toBe(409);
    expect((await errorsOf(again))[0]!.message).toContain("retired team");
    // Brought back.
    const back = await patch(managerId, osprey!.id, { retired: false });
    expect((await back.json()).team.retiredAt).toBeNull();
    expect(await AuditEvent.count({ where: { projectId, action: ["team-retired", "team-returned", "team-deleted"] } })).toBe(3);
  });
});

// Hoses and pumps, each with its diameter in the project's unit family (inches here, US survey
// feet). practice: the plausible range, 1–24 in and 25–610 mm, is Firmsand's (shared/dive-plan/equipment.ts).
describe("hoses and pumps with their diameters", () => {
  const hose = (name: string, diameter: number | null) => ({ name, diameter, diameterUnit: "in" });
  let teamId: number;

  it("are kept with their diameters in inches on a feet project, and shown so", async () => {
    const response = await create(managerId, { name: "Team Grebe", hoses: [{ name: "Hose G1", diameter: 6 }, { name: "Hose G2", diameter: 4.5, diameterUnit: "in" }], pumps: [{ name: "Pump G", diameter: 8 }, "Pump spare"] });
    expect(response.status).toBe(201);
    const body = await response.json();
    teamId = body.id;
    expect(body.team.hoses).toEqual([hose("Hose G1", 6), hose("Hose G2", 4.5)]);
    expect(body.team.pumps).toEqual([hose("Pump G", 8), hose("Pump spare", null)]);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "team-created" }, order: [["id", "DESC"]] });
    expect(audit?.detail).toMatchObject({ after: { hoses: ["Hose G1 (6 in)", "Hose G2 (4.5 in)"], pumps: ["Pump G (8 in)", "Pump spare"] } });
  });

  it("refuse a diameter that is not positive, not a number, out of range or in the other unit, naming hoses.<n>.diameter", async () => {
    const bad = await create(managerId, {
      name: "Team Rail",
      hoses: [{ name: "H0", diameter: -2 }, { name: "H1", diameter: "six" }, { name: "H2", diameter: 152 }, { name: "H3", diameter: 6, diameterUnit: "mm" }, { name: "H4", diameter: 0.5 }],
      pumps: [{ name: "P0", diameter: 6 }, { name: "p0", diameter: 6 }],
    });
    expect(bad.status).toBe(422);
    const errors = await errorsOf(bad);
    expect(errors.map((error) => error.field).sort()).toEqual(["hoses.0.diameter", "hoses.1.diameter"]);
    // Past the schema, the service's checks: range (with the other unit's hint), unit, duplicates.
    const ranged = await create(managerId, { name: "Team Rail", hoses: [{ name: "H2", diameter: 152 }, { name: "H3", diameter: 6, diameterUnit: "mm" }, { name: "H4", diameter: 0.5 }], pumps: [{ name: "P0", diameter: 6 }, { name: "p0", diameter: 6 }] });
    expect(ranged.status).toBe(422);
    const problems = await errorsOf(ranged);
    expect(problems.map((error) => error.field)).toEqual(["hoses.0.diameter", "hoses.1.diameterUnit", "hoses.2.diameter", "pumps.1"]);
    expect(problems[0]!.message).toBe('The hose "H2": its diameter must be from 1 to 24 in (this project gives diameters in inches). Was it given in millimetres? 152 mm is 5.98 in.');
    expect(problems[1]!.message).toContain("this project gives diameters in inches (in)");
    expect(problems[3]!.message).toBe('The pump "p0" is listed twice.');
    expect(await DiveTeam.count({ where: { projectId, name: "Team Rail" } })).toBe(0);
  });

  it("keep their diameters when a client of the first form sends names alone, and round-trip as read", async () => {
    const names = await patch(supervisorId, teamId, { hoses: ["Hose G1", "Hose G3"], pumps: ["pump g"] });
    expect(names.status).toBe(200);
    const team = (await names.json()).team;
    expect(team.hoses).toEqual([hose("Hose G1", 6), hose("Hose G3", null)]);
    expect(team.pumps).toEqual([hose("pump g", 8)]);
    // What GET gives can be sent back unchanged; null clears a diameter.
    const again = await patch(supervisorId, teamId, { hoses: team.hoses, pumps: [{ ...team.pumps[0], diameter: null }] });
    expect((await again.json()).team).toMatchObject({ hoses: team.hoses, pumps: [hose("pump g", null)] });
  });

  it("are shown in millimetres on a metre project, converted from what was stored (published: 1 in = 25.4 mm)", async () => {
    const stored = await DiveTeam.findByPk(teamId);
    const row = (await Project.findByPk(projectId))!;
    const metric = presentProject(Object.assign(row, { lengthUnit: "m" }) as never);
    const [shown] = (await listDiveTeams(metric)).filter((team) => team.id === teamId);
    // computed: 6 in × 25.4 = 152.4 mm, shown whole
    expect(shown!.hoses[0]).toEqual({ name: "Hose G1", diameter: 152, diameterUnit: "mm" });
    expect(stored!.hoses[0]).toEqual(hose("Hose G1", 6));
  });
});

describe("migration 0042", () => {
  it("turns a team's names into hoses and pumps without diameters, in the project's unit, and back", async () => {
    const umzug = createUmzug(getSequelize());
    const metric = await makeProject("teams-api-metric");
    await Project.update({ lengthUnit: "m" }, { where: { id: metric.id } });
    await umzug.down({ to: "0042-team-hoses-and-pumps" });
    let teamId = 0;
    try {
      const [id] = await getSequelize().query(
        "INSERT INTO dive_teams (projectId, name, station, hoses, members, sortOrder, createdAt, updatedAt) VALUES (?, 'Team Old', '', ?, '[]', 1, NOW(), NOW())",
        { replacements: [metric.id, JSON.stringify(["Hose A", "Pump 2", "Hose B"])], type: QueryTypes.INSERT },
      );
      teamId = id as number;
      await umzug.up();
      const team = (await DiveTeam.findByPk(teamId))!;
      expect(team.hoses).toEqual([{ name: "Hose A", diameter: null, diameterUnit: "mm" }, { name: "Hose B", diameter: null, diameterUnit: "mm" }]);
      expect(team.pumps).toEqual([{ name: "Pump 2", diameter: null, diameterUnit: "mm" }]);
      // Down keeps the names (hoses, then pumps).
      await umzug.down({ to: "0042-team-hoses-and-pumps" });
      const [old] = await getSequelize().query<{ hoses: unknown }>("SELECT hoses FROM dive_teams WHERE id = ?", { replacements: [teamId], type: QueryTypes.SELECT });
      expect(typeof old!.hoses === "string" ? JSON.parse(old!.hoses) : old!.hoses).toEqual(["Hose A", "Hose B", "Pump 2"]);
    } finally {
      await umzug.up();
    }
  }, 60_000);
});
