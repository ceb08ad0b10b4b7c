import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Geodesic } from "geographiclib-geodesic";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { DEMO_EMERGENCY, demoProjectInput } from "../../db/seeders/demo-scenario";
import { METRES_PER_UNIT } from "../../shared/units";
import { createApiToken } from "~/lib/auth/api-token.server";
import { AuditEvent, CellResult, Membership, Project, User, Zone } from "~/lib/db.server";
import { createProject, newProjectSchema } from "~/models/project-setup.server";
import * as projectsApi from "~/routes/api.projects";
import * as projectApi from "~/routes/api.projects.$projectId";
import { finishedRecompute } from "./recompute-helpers";
import { DEMO_DIR, postSurvey, projectCrs } from "./import-helpers";
import { addMember, makeUser, ORIGIN, requestAs } from "./helpers";
import * as settingsPage from "~/routes/projects.$projectId.settings";

// Setting a project up through the API: POST /api/projects, GET/PATCH /api/projects/<id>, with
// personal API tokens, against the real database.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-project-setup-"));
afterAll(closeSequelize);

let adminToken: string;
let managerEmail: string;
let managerToken: string;
let viewerToken: string;
let viewerId: number;

beforeAll(async () => {
  const admin = await makeUser("setup-admin", { isSiteAdmin: true });
  adminToken = (await createApiToken(admin, "tests")).token;
  const manager = await makeUser("setup-manager");
  managerEmail = manager.email;
  managerToken = (await createApiToken(manager, "tests")).token;
  const viewer = await makeUser("setup-viewer");
  viewerId = viewer.id;
  viewerToken = (await createApiToken(viewer, "tests")).token;
});

async function send(method: "POST" | "GET" | "PATCH", token: string, body?: unknown, projectId?: number): Promise<Response> {
  const path = projectId === undefined ? "/api/projects" : `/api/projects/${projectId}`;
  const request = new Request(`${ORIGIN}${path}`, {
    method,
    headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const route = projectId === undefined ? projectsApi : projectApi;
  const handler = method === "GET" ? route.loader : route.action;
  return handler({ request, params: projectId === undefined ? {} : { projectId: String(projectId) }, context: {} } as never);
}

/** The demo's spring, as a new team would describe it (lon/lat unless said). */
function springInput(overrides: Record<string, unknown> = {}) {
  return {
    name: "Test spring setup",
    crs: "EPSG:2237",
    lengthUnit: "us-ft",
    timeZone: "America/New_York",
    workLimit: { type: "Feature", properties: {}, geometry: WORK_LIMIT },
    grid: { cellSize: 20 },
    zones: ZONES.map((zone) => ({ name: zone.name, geometry: zone.polygon })),
    manager: managerEmail,
    ...overrides,
  };
}

async function created(response: Response): Promise<number> {
  const answer = (await response.json()) as { id?: number; errors?: unknown };
  expect(response.status, JSON.stringify(answer)).toBe(201);
  return answer.id!;
}

async function settingsOf(projectId: number) {
  const response = await send("GET", managerToken, undefined, projectId);
  expect(response.status).toBe(200);
  return ((await response.json()) as { settings: { workLimitArea: number; cellCount: number; grid: { originX: number; originY: number; cellSize: number } } }).settings;
}

describe("POST /api/projects", () => {
  it("creates a project the named manager runs; the demo baseline imported into it gives its cells", async () => {
    const projectId = await created(await send("POST", adminToken, springInput()));
    const membership = await Membership.findOne({ where: { projectId, role: "manager" }, include: [{ model: User, as: "user" }] });
    expect(membership?.userId).toBe((await User.findOne({ where: { email: managerEmail } }))!.id);
    const settings = await settingsOf(projectId);
    // computed: the default origin is a multiple of the cell size at or below the limit's south-west corner
    expect(settings.grid.originX % 20).toBe(0);
    expect(settings.grid.originY % 20).toBe(0);
    expect(await CellResult.count({ where: { projectId } })).toBe(0);

    const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
    const stored = await postSurvey(projectId, managerToken, { path: join(DEMO_DIR, baseline.fileName) }, {
      kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    });
    expect(stored.status).toBe(201);
    const cells = await CellResult.count({ where: { projectId } });
    // invariant: cells with figures are cells of the grid
    expect(cells).toBeGreaterThan(0);
    expect(cells).toBeLessThanOrEqual(settings.cellCount);
    expect(await AuditEvent.count({ where: { projectId, action: "project-created" } })).toBe(1);
  }, 60_000);

  it("gives the same area from the work limit in lon/lat and in the CRS, within 0.1 % of geographiclib-geodesic", async () => {
    const crs = projectCrs();
    const inCrs = { type: "Polygon", coordinates: WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat))) };
    const fromLonLat = await settingsOf(await created(await send("POST", adminToken, springInput({ name: "Area in lon/lat", zones: [] }))));
    const fromCrs = await settingsOf(await created(await send("POST", adminToken, springInput({ name: "Area in the CRS", workLimit: inCrs, zones: [] }))));
    const polygon = Geodesic.WGS84.Polygon(false);
    for (const [lon, lat] of WORK_LIMIT.coordinates[0].slice(0, -1)) polygon.AddPoint(lat, lon);
    // reference library: geographiclib-geodesic (Karney's ellipsoidal polygon area)
    const referenceM2 = Math.abs(polygon.Compute(false, true).area!);
    for (const settings of [fromLonLat, fromCrs]) {
      expect(Math.abs((settings.workLimitArea * METRES_PER_UNIT["us-ft"] ** 2) / referenceM2 - 1)).toBeLessThan(0.001);
    }
  });

  it("refuses a self-crossing ring and an empty work limit with 422, naming the problem", async () => {
    const ring = WORK_LIMIT.coordinates[0];
    // Swapping vertices 6 and 21 (of opposite banks) makes the outline cross itself.
    const crossed = ring.map((position, index) => (index === 5 ? ring[20] : index === 20 ? ring[5] : position));
    const selfCrossing = await send("POST", adminToken, springInput({ workLimit: { type: "Polygon", coordinates: [crossed] } }));
    expect(selfCrossing.status).toBe(422);
    const crossingErrors = ((await selfCrossing.json()) as { errors: Array<{ field: string; message: string }> }).errors;
    expect(crossingErrors).toContainEqual({ field: "workLimit", message: expect.stringMatching(/^The work limit polygon 1, ring 1 \(the outline\) crosses itself near vertex \d+\.$/) });

    const empty = await send("POST", adminToken, springInput({ workLimit: { type: "FeatureCollection", features: [] } }));
    expect(empty.status).toBe(422);
    expect(((await empty.json()) as { errors: unknown[] }).errors).toContainEqual({ field: "workLimit", message: "The work limit is empty: it holds no polygon." });
  });

  it("refuses a work limit outside its CRS's area of use, naming the vertex and the area (published: EPSG:2237 covers 26.27–29.6°N, 83.34–81.13°W)", async () => {
    // The same outline moved 15° west (to Texas) while the CRS stays Florida West.
    const moved = { type: "Polygon", coordinates: WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => [lon - 15, lat])) };
    const response = await send("POST", adminToken, springInput({ name: "Wrong place", workLimit: moved }));
    expect(response.status).toBe(422);
    const errors = ((await response.json()) as { errors: Array<{ field: string; message: string }> }).errors;
    expect(errors).toContainEqual({
      field: "workLimit",
      message: expect.stringMatching(/^The work limit polygon 1, ring 1, vertex 1 read as lon\/lat, lies at 28\.\d{4}, -97\.\d{4}, outside the area EPSG:2237 \(NAD83 \/ Florida West \(ftUS\)\) is made for \(26\.27°N to 29\.60°N, 83\.34°W to 81\.13°W\)\./),
    });
  });

  it("names each bad field at once", async () => {
    // The body's shape first (zod), then the settings against each other (the service).
    const shape = await send("POST", adminToken, springInput({ timeZone: "Mars/Olympus", grid: { cellSize: -5 }, lengthUnit: "furlong" }));
    expect(shape.status).toBe(422);
    expect(((await shape.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field).sort()).toEqual(["grid.cellSize", "lengthUnit", "timeZone"]);
    const second = await send("POST", adminToken, springInput({ crs: "EPSG:4326", manager: "nobody-here@example.org" }));
    expect(((await second.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field).sort()).toEqual(["crs", "manager"]);
  });

  it("is refused with 403 to a user not allowed to create projects, and lets an allowed one create and manage it", async () => {
    expect((await send("POST", viewerToken, springInput())).status).toBe(403);
    await User.update({ mayCreateProjects: true }, { where: { id: viewerId } });
    const projectId = await created(await send("POST", viewerToken, springInput({ name: "Allowed creator", manager: undefined, zones: [] })));
    expect((await Membership.findOne({ where: { projectId, userId: viewerId } }))?.role).toBe("manager");
    await User.update({ mayCreateProjects: false }, { where: { id: viewerId } });
  });
});

describe("the demo seed's input", () => {
  it("stores the scenario's work limit, zones and grid exactly as given (the demo's figures rest on them)", async () => {
    const admin = await makeUser("setup-seed-admin", { isSiteAdmin: true });
    const input = newProjectSchema.parse({ ...demoProjectInput(managerEmail), slug: undefined, name: "Seed input check" });
    const { id } = await createProject(admin, input);
    const project = (await Project.findByPk(id))!;
    // invariant: lon/lat input is stored as it came, so the engine projects the same numbers as before
    expect(project.workLimitGeoJson).toBe(JSON.stringify(WORK_LIMIT));
    const zones = await Zone.findAll({ where: { projectId: id }, order: [["sortOrder", "ASC"]] });
    expect(zones.map((zone) => zone.polygonGeoJson)).toEqual(ZONES.map((zone) => JSON.stringify(zone.polygon)));
    expect([project.gridOriginE, project.gridOriginN, project.cellSize, project.rasterResolution, project.maxEdge, project.rotationDeg, project.tolerance, project.firmShare, project.minCoverage, project.minTeamSize])
      .toEqual([GRID.originEastingFt, GRID.originNorthingFt, GRID.cellSizeFt, GRID.rasterResolutionFt, GRID.maxTriangleEdgeFt, GRID.rotationDegrees, GRID.toleranceFt, GRID.firmShare, GRID.minCoverage, 3]);
    // The demo's emergency information is stored whole, and every number in it is a fictional one (practice: 555-0100 to 555-0199 are set aside for fiction).
    expect(project.emergencyInfo).toEqual(DEMO_EMERGENCY);
    for (const phone of [DEMO_EMERGENCY.hospitalPhone, DEMO_EMERGENCY.chamberPhone, DEMO_EMERGENCY.emergencyNumber]) expect(phone).toMatch(/555-01\d\d$/);
  });
});

describe("GET/PATCH /api/projects/<id>", () => {
  it("is the manager's: a viewer's PATCH is 403 and changes nothing", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Patch refused", zones: [] })));
    const other = await makeUser("setup-other-viewer");
    await addMember(other.id, projectId, "viewer");
    const otherToken = (await createApiToken(other, "tests")).token;
    expect((await send("PATCH", otherToken, { grid: { cellSize: 10 } }, projectId)).status).toBe(403);
    expect((await send("GET", otherToken, undefined, projectId)).status).toBe(403);
    expect((await settingsOf(projectId)).grid.cellSize).toBe(20);
  });

  it("a new cell size after the baseline answers 202 with the recompute's address; the job rewrites the cells in the background", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Patch cell size" })));
    const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
    await postSurvey(projectId, managerToken, { path: join(DEMO_DIR, baseline.fileName) }, {
      kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    });
    const before = await CellResult.count({ where: { projectId } });
    const before20 = await settingsOf(projectId);
    const response = await send("PATCH", managerToken, { grid: { cellSize: 40, originX: before20.grid.originX, originY: before20.grid.originY } }, projectId);
    expect(response.status).toBe(202);
    const answer = (await response.json()) as { recompute: { id: number; url: string }; settings: { cellCount: number } };
    expect(response.headers.get("Location")).toBe(answer.recompute.url);
    const job = await finishedRecompute(managerToken, projectId, answer.recompute.id);
    expect(job.state).toBe("done");
    const after = await CellResult.count({ where: { projectId } });
    // invariant: from the same origin each 40 ft cell is a block of four 20 ft cells, so every
    // 20 ft cell with figures lies in one 40 ft cell with figures, and a 40 ft cell holds at most four
    expect(after).toBeGreaterThanOrEqual(before / 4);
    expect(after).toBeLessThan(before);
    expect(answer.settings.cellCount).toBeLessThan(before20.cellCount);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" } });
    expect((audit?.detail as { before: { grid: { cellSize: number } }; after: { grid: { cellSize: number } } }).before.grid.cellSize).toBe(20);
    expect((audit?.detail as { after: { grid: { cellSize: number } } }).after.grid.cellSize).toBe(40);
  }, 90_000);
});

describe("the settings page /projects/<id>/settings", () => {
  async function post(userId: number, projectId: number, fields: Record<string, string | Blob>) {
    const form = new FormData();
    for (const [name, value] of Object.entries(fields)) form.set(name, value as string);
    const request = await requestAs(userId, `/projects/${projectId}/settings`, { method: "POST", body: form });
    const result = await settingsPage.action({ request, params: { projectId: String(projectId) }, context: {} } as never);
    return result as unknown as { data: { errors: Record<string, string>; notice: string | null; largeGrid?: number; preview?: { coordinates: string; area: number; geoJson: string } }; init: { status?: number } | null };
  }

  it("saves the grid, printing the new cell count; over 200,000 cells asks first; the audit log keeps before and after", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Settings page grid", zones: [] })));
    const manager = (await User.findOne({ where: { email: managerEmail } }))!;
    const before = await settingsOf(projectId);
    const tooFine = await post(manager.id, projectId, { intent: "grid", cellSize: "0.5" });
    expect(tooFine.init?.status).toBe(400);
    // computed: a 0.5 ft cell is 1/1600 of a 20 ft one, so the count grows about 1600 times
    expect(tooFine.data.largeGrid).toBeGreaterThan(200_000);
    expect(tooFine.data.errors.cellSize).toMatch(/more than 200,000/);
    expect((await settingsOf(projectId)).grid.cellSize).toBe(20);

    const saved = await post(manager.id, projectId, { intent: "grid", cellSize: "10", originX: String(before.grid.originX), originY: String(before.grid.originY), rotationDegrees: "0", rasterResolution: "1", maxEdge: "50" });
    const after = await settingsOf(projectId);
    expect(after.grid.cellSize).toBe(10);
    expect(saved.data.notice).toBe(`Saved. The grid has ${after.cellCount.toLocaleString("en-US")} cells.`);
    // invariant: from the same origin, halving the cell size gives between 2 and 4 times the cells over the same extent
    expect(after.cellCount).toBeGreaterThanOrEqual(before.cellCount * 2);
    expect(after.cellCount).toBeLessThanOrEqual(before.cellCount * 4);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" } });
    const detail = audit?.detail as { before: { grid: { cellSize: number } }; after: { grid: { cellSize: number } } };
    expect([detail.before.grid.cellSize, detail.after.grid.cellSize]).toEqual([20, 10]);
  });

  it("previews an uploaded work limit (saying it was read in the CRS) before replacing it; a bad one is named next to the field", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Settings page limit", zones: [] })));
    const manager = (await User.findOne({ where: { email: managerEmail } }))!;
    const crs = projectCrs();
    const inCrs = { type: "Polygon", coordinates: WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat))) };
    const preview = await post(manager.id, projectId, { intent: "work-limit-preview", file: new File([JSON.stringify(inCrs)], "limit.geojson") });
    expect(preview.data.preview?.coordinates).toBe("project-crs");
    const stored = await settingsOf(projectId);
    // invariant: the same outline in another coordinate system has the same area
    expect(Math.abs(preview.data.preview!.area / stored.workLimitArea - 1)).toBeLessThan(1e-6);
    const saved = await post(manager.id, projectId, { intent: "work-limit-save", geoJson: preview.data.preview!.geoJson });
    expect(saved.data.notice).toMatch(/^Saved\./);

    const broken = await post(manager.id, projectId, { intent: "work-limit-preview", file: new File(['{"type":"FeatureCollection","features":[]}'], "empty.geojson") });
    expect(broken.init?.status).toBe(400);
    expect(broken.data.errors.workLimit).toBe("The work limit is empty: it holds no polygon.");
  });
});

describe("emergency information", () => {
  const complete = {
    hospitalName: "Harbor General", hospitalPhone: "(555) 555-0142", chamberName: "Bayside Hyperbaric", chamberPhone: "555-0178",
    emergencyNumber: "911", siteAddress: "1 Spring Run Rd", accessPoint: "South boat ramp",
  };
  const formOf = (fields: Record<string, string>) => ({ intent: "emergency", hospitalName: "", hospitalPhone: "", chamberName: "", chamberPhone: "", emergencyNumber: "", siteAddress: "", accessPoint: "", ...fields });

  it("is saved from its own section of the settings page, checked field by field, with before and after in the audit log", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Settings emergency", zones: [] })));
    const manager = (await User.findOne({ where: { email: managerEmail } }))!;
    expect(((await (await send("GET", managerToken, undefined, projectId)).json()) as { settings: { emergency: unknown } }).settings.emergency).toBeNull();
    const post = async (fields: Record<string, string>) => {
      const form = new FormData();
      for (const [name, value] of Object.entries(formOf(fields))) form.set(name, value);
      const request = await requestAs(manager.id, `/projects/${projectId}/settings`, { method: "POST", body: form });
      return (await settingsPage.action({ request, params: { projectId: String(projectId) }, context: {} } as never)) as unknown as { data: { errors: Record<string, string>; notice: string | null }; init: { status?: number } | null };
    };
    const bad = await post({ hospitalName: "Harbor General", chamberPhone: "call the office" });
    expect(bad.init?.status).toBe(400);
    expect(bad.data.errors.hospitalPhone).toBe("give the hospital's phone number with its name");
    expect(bad.data.errors.chamberPhone).toMatch(/write a phone number with its digits/);
    expect((await Project.findByPk(projectId))!.emergencyInfo).toBeNull();

    const saved = await post(complete);
    expect(saved.data.notice).toBe("Saved.");
    expect((await Project.findByPk(projectId))!.emergencyInfo).toEqual(complete);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] });
    const detail = audit!.detail as { before: { emergency: unknown }; after: { emergency: unknown } };
    expect([detail.before.emergency, detail.after.emergency]).toEqual([null, complete]);

    // Every field blank clears it (the day sheet then says none is set).
    await post({});
    expect((await Project.findByPk(projectId))!.emergencyInfo).toBeNull();
  });

  it("is part of the API's PATCH, refused with 422 naming the field", async () => {
    const projectId = await created(await send("POST", adminToken, springInput({ name: "API emergency", zones: [] })));
    const refused = await send("PATCH", managerToken, { emergency: { chamberName: "Bayside Hyperbaric" } }, projectId);
    expect(refused.status).toBe(422);
    expect(((await refused.json()) as { errors: Array<{ field: string }> }).errors.map((error) => error.field)).toEqual(["emergency.chamberPhone"]);
    const saved = await send("PATCH", managerToken, { emergency: complete }, projectId);
    expect(saved.status).toBe(200);
    expect(((await saved.json()) as { settings: { emergency: unknown } }).settings.emergency).toEqual(complete);
  });
});

describe("work-limit files over the size limit", () => {
  it("are refused with 413 on their declared size, before the form is read", async () => {
    const admin = await makeUser("setup-large-file", { isSiteAdmin: true });
    const projectId = await created(await send("POST", adminToken, springInput({ name: "Large file refused", zones: [] })));
    const form = new FormData();
    form.set("intent", "work-limit-preview");
    form.set("file", new File(["x".repeat(3 * 1024 * 1024)], "huge.geojson"));
    const request = await requestAs(admin.id, `/projects/${projectId}/settings`, { method: "POST", body: form });
    const body = new Uint8Array(await request.clone().arrayBuffer());
    const sized = new Request(request, { headers: { ...Object.fromEntries(request.headers), "Content-Length": String(body.byteLength) } });
    const result = (await settingsPage.action({ request: sized, params: { projectId: String(projectId) }, context: {} } as never)) as unknown as { data: { errors: Record<string, string> }; init: { status: number } };
    expect(result.init.status).toBe(413);
    expect(result.data.errors.workLimit).toMatch(/larger than 2 MB/);
  });
});
