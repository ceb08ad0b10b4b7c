import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import { closeSequelize } from "../../db/connection.server";
import { cellLabel, parseCellLabel } from "../../shared/grid/cell-grid";
import { createCrs } from "../../shared/crs";
import { workLimitArea } from "../../shared/grid/work-limit";
import { GRID, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { CellResult, DiveTeam, Project, Zone, type Role } from "~/lib/db.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { getProjectBands } from "~/models/bands.server";
import { findProject, presentProject } from "~/lib/auth/project-view.server";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { loader as bandsLoader } from "~/routes/api.projects.$projectId.bands";
import { action as assignAction, loader as planLoader } from "~/routes/api.projects.$projectId.assignments";
import { loader as styleLoader } from "~/routes/projects.$projectId.map.style[.]json";
import { addMember, makeUser, requestAs } from "./helpers";

afterAll(closeSequelize);

let projectId: number;
const users = new Map<Role, number>();

beforeAll(async () => {
  const project = await Project.create({
    name: "Map API test", slug: `map-api-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 3,
  });
  projectId = project.id;
  for (const [index, zone] of ZONES.entries()) await Zone.create({ projectId, name: zone.name, sortOrder: index, polygonGeoJson: JSON.stringify(zone.polygon) });
  await DiveTeam.create({ projectId, name: "Team North", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "A", email: "north-a@example.org", duty: "diver" }, { name: "B", email: "north-b@example.org", duty: "tender" }, { name: "C", email: "north-c@example.org", duty: "standby diver" }] });
  await DiveTeam.create({ projectId, name: "Team South", station: "Barge 2", hoses: [{ name: "Hose C", diameter: 6, diameterUnit: "in" }], members: [{ name: "D", email: "south-d@example.org", duty: "diver" }] });
  for (const role of ["manager", "dive-supervisor", "surveyor", "viewer"] as Role[]) {
    const user = await makeUser(`map-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
});

async function get(loader: (args: never) => Promise<Response>, role: Role, path: string, params: Record<string, string>) {
  const request = await requestAs(users.get(role)!, path);
  return loader({ request, params, context: {} } as never);
}

async function post(role: Role, body: unknown) {
  const request = await requestAs(users.get(role)!, `/api/projects/${projectId}/assignments`, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
  return assignAction({ request, params: { projectId: String(projectId) }, context: {} } as never);
}

async function cells() {
  const response = await get(cellsLoader as never, "viewer", `/api/projects/${projectId}/cells`, { projectId: String(projectId) });
  return (await response.json()) as { grid: { cols: number; rows: number; firstCol: number; firstRow: number; cellSize: number }; status: number[]; zone: number[]; zones: unknown[]; remainingThickness: unknown[] };
}

function inLimitLabels(payload: Awaited<ReturnType<typeof cells>>): string[] {
  const labels: string[] = [];
  payload.status.forEach((code, index) => {
    if (code >= 0) labels.push(cellLabel(Math.floor(index / payload.grid.cols) + payload.grid.firstRow, (index % payload.grid.cols) + payload.grid.firstCol));
  });
  return labels;
}

describe("GET /api/projects/<id>/cells", () => {
  it("sends the grid definition and one value per grid cell, not polygons", async () => {
    const payload = await cells();
    const count = payload.grid.cols * payload.grid.rows;
    expect(payload.status).toHaveLength(count);
    expect(payload.remainingThickness).toHaveLength(count);
    expect(payload.zones).toHaveLength(ZONES.length);
    expect(JSON.stringify(payload)).not.toContain("coordinates");
  });

  it("marks as many cells in the limit as its area holds (invariant: in-limit cells × cell area ≈ limit area, within one ring of cells)", async () => {
    const payload = await cells();
    const inLimit = payload.status.filter((code) => code >= 0).length;
    const crs = createCrs(resolveCrsDefinition("EPSG:2237").definition);
    const projected = [WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat)))];
    const areaFt2 = workLimitArea(projected);
    const cellAreaFt2 = payload.grid.cellSize ** 2;
    expect(inLimit * cellAreaFt2).toBeGreaterThan(areaFt2 * 0.8);
    expect(inLimit * cellAreaFt2).toBeLessThan(areaFt2 * 1.2);
    expect(payload.status.every((code) => code === -1 || code === 0)).toBe(true); // no surveys yet: every in-limit cell says no-data
  });
});

describe("POST /api/projects/<id>/assignments", () => {
  const date = "2031-03-04";

  it("assigns cells for a dive supervisor (201), flags nothing for a full team, and lists them in the day plan", async () => {
    const labels = inLimitLabels(await cells()).slice(0, 3);
    const response = await post("dive-supervisor", { date, team: "Team North", cells: labels, hose: "Hose A", notes: "start at the vent" });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect([...body.cells].sort()).toEqual([...labels].sort());
    expect(body.teamBelowMinimum).toBeNull();
    expect(body.caution).toMatch(/dive safety plan/);
    const plan = await (await get(planLoader as never, "viewer", `/api/projects/${projectId}/assignments?date=${date}`, { projectId: String(projectId) })).json();
    expect(plan.teams).toHaveLength(1);
    expect(plan.teams[0].team.name).toBe("Team North");
    expect(plan.teams[0].cells.map((cell: { label: string }) => cell.label).sort()).toEqual([...labels].sort());
  });

  it("refuses the same cell for a second team that day with 409 naming both teams", async () => {
    const labels = inLimitLabels(await cells()).slice(2, 5); // overlaps one cell with the first plan
    const response = await post("manager", { date, team: "Team South", cells: labels, hose: "Hose C", notes: "" });
    expect(response.status).toBe(409);
    const body = await response.json();
    expect(body.conflicts).toEqual([{ cell: labels[0], team: "Team North" }]);
    expect(body.errors).toHaveLength(1);
    expect(body.errors[0].message).toContain("Team North");
    expect(body.errors[0].message).toContain("Team South");
    const plan = await (await get(planLoader as never, "viewer", `/api/projects/${projectId}/assignments?date=${date}`, { projectId: String(projectId) })).json();
    expect(plan.teams.map((team: { team: { name: string } }) => team.team.name)).toEqual(["Team North"]); // nothing half-saved
  });

  it("flags a team smaller than the project minimum", async () => {
    const labels = inLimitLabels(await cells()).slice(10, 11);
    const response = await post("dive-supervisor", { date, team: "Team South", cells: labels, hose: "Hose C" });
    expect(response.status).toBe(201);
    expect((await response.json()).teamBelowMinimum).toEqual({ size: 1, minimum: 3 });
  });

  it("asks for a reason before a confirmed cell goes back into work", async () => {
    const payload = await cells();
    const label = inLimitLabels(payload)[20];
    const position = parseCellLabel(label)!;
    await CellResult.create({ projectId, row: position.row, col: position.col, label, zoneId: null, plannedVolume: 10, removedVolume: 10, depositedVolume: 0, remainingVolume: 0, meanRemainingThickness: 0.1, coverage: 1, areaInLimit: 400, status: "confirmed", latestSurveyId: null, computedAt: new Date() });
    const refused = await post("dive-supervisor", { date: "2031-03-05", team: "Team North", cells: [label], hose: "Hose A" });
    expect(refused.status).toBe(422);
    expect((await refused.json()).code).toBe("reason-required");
    const accepted = await post("dive-supervisor", { date: "2031-03-05", team: "Team North", cells: [label], hose: "Hose A", reason: "storm deposit reported by the divers" });
    expect(accepted.status).toBe(201);
    await CellResult.destroy({ where: { projectId } });
  });

  it("answers 403 to roles other than dive supervisor and manager, 422 to a body that breaks the schema or names unknown cells", async () => {
    for (const role of ["viewer", "surveyor"] as Role[]) {
      expect((await post(role, { date, team: "Team North", cells: ["A1"], hose: "Hose A" })).status, role).toBe(403);
    }
    expect((await post("manager", { date: "2031-02-30", team: "Team North", cells: ["A1"], hose: "Hose A" })).status).toBe(422);
    expect((await post("manager", { date, team: "Team North", cells: [], hose: "Hose A" })).status).toBe(422);
    const unknown = await post("manager", { date, team: "Team North", cells: ["ZZZ999"], hose: "Hose A" });
    expect(unknown.status).toBe(422);
    expect((await post("manager", { date, team: "Team Nobody", cells: ["A1"], hose: "Hose A" })).status).toBe(404);
  });
});

describe("map style and bands", () => {
  it("serves an offline style: no glyphs URL, no tiles, no outside host", async () => {
    const response = await get(styleLoader as never, "viewer", `/projects/${projectId}/map/style.json`, { projectId: String(projectId) });
    const style = await response.json();
    expect(style.glyphs).toBeUndefined();
    expect(JSON.stringify(style)).not.toMatch(/https?:\/\//);
    for (const source of Object.values(style.sources) as Array<{ type: string }>) expect(source.type).toBe("geojson");
    expect(style.layers.find((layer: { id: string }) => layer.id === "zone-labels").layout["text-font"]).toEqual(["Roboto Mono"]);
  });

  it("answers bands as GeoJSON (empty before any survey) and 400 for an unknown surface", async () => {
    const ok = await get(bandsLoader as never, "viewer", `/api/projects/${projectId}/bands?surface=depth`, { projectId: String(projectId) });
    expect(await ok.json()).toEqual({ type: "FeatureCollection", features: [] });
    const bad = await get(bandsLoader as never, "viewer", `/api/projects/${projectId}/bands?surface=volume`, { projectId: String(projectId) });
    expect(bad.status).toBe(400);
  });
});

describe("caching and polling", () => {
  async function recompute(minutesLater: number): Promise<Date> {
    const computedAt = new Date(Math.floor(Date.now() / 1000) * 1000 + 60_000 * minutesLater);
    const { grid } = await cells();
    const position = { row: grid.firstRow + minutesLater, col: grid.firstCol };
    // A recompute writes the cells again with a later computation time.
    await CellResult.create({ projectId, row: position.row, col: position.col, label: cellLabel(position.row, position.col), zoneId: null, plannedVolume: 5, removedVolume: 1, depositedVolume: 0, remainingVolume: 4, meanRemainingThickness: 0.5, coverage: 1, areaInLimit: 400, status: "in-work", latestSurveyId: null, computedAt });
    return computedAt;
  }

  it("answers 304 to a poll with the current ETag and 200 with a new ETag after a recompute", async () => {
    const path = `/api/projects/${projectId}/cells`;
    const first = await get(cellsLoader as never, "viewer", path, { projectId: String(projectId) });
    const etag = first.headers.get("ETag");
    expect(etag).toMatch(/^"[\w-]+"$/);
    const poll = await cellsLoader({ request: await requestAs(users.get("viewer")!, path, { headers: { "If-None-Match": etag! } }), params: { projectId: String(projectId) }, context: {} } as never);
    expect(poll.status).toBe(304);
    expect(await poll.text()).toBe("");
    const written = await recompute(1);
    const after = await cellsLoader({ request: await requestAs(users.get("viewer")!, path, { headers: { "If-None-Match": etag! } }), params: { projectId: String(projectId) }, context: {} } as never);
    expect(after.status).toBe(200);
    expect(after.headers.get("ETag")).not.toBe(etag);
    // The body is the recomputed payload: its computation time is the newest one written.
    expect((await after.json()).computedAt).toBe(written.toISOString());
  });

  it("computes the bands once per recompute stamp and surface, and again after a recompute", async () => {
    const project = presentProject((await findProject(projectId))!);
    const first = await getProjectBands(project, "remaining");
    // The same object back means the contouring did not run again.
    expect(await getProjectBands(project, "remaining")).toBe(first);
    expect(await getProjectBands(project, "depth")).not.toBe(first);
    await recompute(2);
    const after = await getProjectBands(project, "remaining");
    expect(after).not.toBe(first);
    expect(await getProjectBands(project, "remaining")).toBe(after);
  });
});
