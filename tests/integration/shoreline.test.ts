import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import { closeSequelize } from "../../db/connection.server";
import { GRID, WORK_LIMIT } from "../../sample-data/scenario";
import { AuditEvent, Project, Shoreline, type Role } from "~/lib/db.server";
import { action as mapAction } from "~/routes/projects.$projectId.map";
import { loader as styleLoader } from "~/routes/projects.$projectId.map.style[.]json";
import { addMember, makeUser, requestAs, thrown } from "./helpers";

afterAll(closeSequelize);

let projectId: number;
const users = new Map<Role, number>();

/** The work limit's bounding box grown by about 100 m: a plausible shoreline around it. */
function shorelineAround(): { type: "Polygon"; coordinates: number[][][] } {
  const positions = WORK_LIMIT.coordinates.flat();
  const lons = positions.map(([lon]) => lon), lats = positions.map(([, lat]) => lat);
  const [west, east, south, north] = [Math.min(...lons) - 0.001, Math.max(...lons) + 0.001, Math.min(...lats) - 0.001, Math.max(...lats) + 0.001];
  return { type: "Polygon", coordinates: [[[west, south], [east, south], [east, north], [west, north], [west, south]]] };
}

beforeAll(async () => {
  const project = await Project.create({
    name: "Shoreline test", slug: `shoreline-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 3,
  });
  projectId = project.id;
  for (const role of ["manager", "dive-supervisor", "viewer"] as Role[]) {
    const user = await makeUser(`shore-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
});

async function post(role: Role, fields: Record<string, string | File>) {
  const body = new FormData();
  for (const [key, value] of Object.entries(fields)) body.set(key, value);
  const request = await requestAs(users.get(role)!, `/projects/${projectId}/map`, { method: "POST", body });
  const result = await mapAction({ request, params: { projectId: String(projectId) }, context: {} } as never);
  // A refusal comes as data(result, { status: 4xx }); the page reads the same result from it.
  return "init" in result ? result.data : result;
}

async function style() {
  const request = await requestAs(users.get("viewer")!, `/projects/${projectId}/map/style.json`);
  const response = await styleLoader({ request, params: { projectId: String(projectId) }, context: {} } as never);
  return (await response.json()) as { sources: Record<string, { data: { type: string; features?: Array<{ geometry: unknown }> } }>; layers: Array<{ id: string; source?: string; type: string }> };
}

const file = (content: unknown, name = "spring-run.geojson") => new File([typeof content === "string" ? content : JSON.stringify(content)], name, { type: "application/geo+json" });

describe("the manager's shoreline (map settings)", () => {
  it("uploads a shoreline that the offline style then draws as water beneath the work limit, with an audit entry", async () => {
    const before = await style();
    expect(before.sources.shoreline.data.features).toEqual([]);
    const result = await post("manager", { intent: "upload", shoreline: file(shorelineAround()) });
    expect(result).toMatchObject({ intent: "upload", ok: true, message: expect.stringContaining("spring-run.geojson (1 polygon, 5 vertices) uploaded") });
    const after = await style();
    expect(after.sources.shoreline.data.features?.[0].geometry).toEqual(shorelineAround());
    // The shoreline's water is the first layer drawn, straight on the land (the map's CSS background
    // under its canvas, app.css), and under the work limit, the cells and the outlines.
    const order = after.layers.map((layer) => layer.id);
    const water = after.layers.find((layer) => layer.source === "shoreline" && layer.type === "fill")!;
    expect(order.indexOf(water.id)).toBe(0);
    expect(order.indexOf(water.id)).toBeLessThan(order.indexOf("cells-fill"));
    const audit = await AuditEvent.findOne({ where: { projectId, action: "shoreline-uploaded" } });
    expect(audit?.userId).toBe(users.get("manager"));
  });

  it("replaces the shoreline (one per project), recording what it replaced", async () => {
    const smaller = shorelineAround();
    smaller.coordinates[0][2] = [smaller.coordinates[0][2][0] - 0.0005, smaller.coordinates[0][2][1]];
    const result = await post("manager", { intent: "upload", shoreline: file(smaller, "survey-2031.geojson") });
    expect(result).toMatchObject({ ok: true, message: expect.stringContaining("replaced by survey-2031.geojson") });
    expect(await Shoreline.count({ where: { projectId } })).toBe(1);
    expect((await style()).sources.shoreline.data.features?.[0].geometry).toEqual(smaller);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "shoreline-replaced" } });
    const detail = typeof audit?.detail === "string" ? JSON.parse(audit.detail) : audit?.detail;
    expect(detail).toMatchObject({ fileName: "survey-2031.geojson", replaced: "spring-run.geojson" });
  });

  it("refuses an invalid file with the reason and keeps the stored shoreline", async () => {
    const open = shorelineAround();
    open.coordinates[0].pop();
    const result = await post("manager", { intent: "upload", shoreline: file(open) });
    expect(result).toMatchObject({ ok: false, message: expect.stringContaining("outer ring: the ring is not closed") });
    const far = { type: "Polygon", coordinates: [[[10, 50], [10.01, 50], [10.01, 50.01], [10, 50]]] };
    expect(await post("manager", { intent: "upload", shoreline: file(far) })).toMatchObject({ ok: false, message: expect.stringContaining("from the work limit") });
    expect(await post("manager", { intent: "upload" })).toMatchObject({ ok: false, message: "Choose a GeoJSON file to upload." });
    expect(await Shoreline.count({ where: { projectId } })).toBe(1);
  });

  it("is for the manager only: a viewer and a dive supervisor get a 403", async () => {
    for (const role of ["viewer", "dive-supervisor"] as Role[]) {
      const response = (await thrown(() => post(role, { intent: "upload", shoreline: file(shorelineAround()) }))) as Response;
      expect(response.status).toBe(403);
      const removal = (await thrown(() => post(role, { intent: "remove" }))) as Response;
      expect(removal.status).toBe(403);
    }
    expect(await Shoreline.count({ where: { projectId } })).toBe(1);
  });

  it("removes the shoreline, and the style falls back to the work limit's water", async () => {
    expect(await post("manager", { intent: "remove" })).toMatchObject({ intent: "remove", ok: true });
    expect((await style()).sources.shoreline.data.features).toEqual([]);
    expect(await AuditEvent.count({ where: { projectId, action: "shoreline-removed" } })).toBe(1);
    expect(await post("manager", { intent: "remove" })).toMatchObject({ ok: false, message: "There was no shoreline to remove." });
  });
});
