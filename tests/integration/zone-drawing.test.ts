import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { draftPolygon, type LonLat } from "~/components/map/zone-draft";
import { createApiToken } from "~/lib/auth/api-token.server";
import { AuditEvent, ProjectSettingsVersion, Zone } from "~/lib/db.server";
import { ZONE_COLOUR_VALUES, zoneColourName } from "../../shared/zone-colours";
import { createProject } from "~/models/project-setup.server";
import { loadSetupProgress } from "~/models/setup-guide.server";
import { findProject, presentProject } from "~/lib/auth/project-view.server";
import * as projectApi from "~/routes/api.projects.$projectId";
import * as settingsPage from "~/routes/projects.$projectId.settings";
import { projectCrs } from "./import-helpers";
import { makeUser, ORIGIN, requestAs } from "./helpers";

// Zones drawn on the settings page's map: the corners clicked (lon/lat, closed as the page's draft
// closes them) go through the settings action and the one project setup service, with the same
// checks as zones sent to the API: a ring crossing itself, a ring reaching outside the work limit
// and a ring outside the CRS's area of use are refused, naming the rule; a zone keeps its id (and
// what refers to it) through a rename and through other zones' changes.

afterAll(closeSequelize);

let manager: Awaited<ReturnType<typeof makeUser>>;
let managerToken: string;
let projectId: number;

/** The corners of a demo zone as they would be clicked (no closing repeat). */
const cornersOf = (ring: LonLat[]): LonLat[] => ring.slice(0, -1);
const upperRun = cornersOf(ZONES.find((zone) => zone.name === "Upper run")!.polygon.coordinates[0] as LonLat[]);
const lowerRun = cornersOf(ZONES.find((zone) => zone.name === "Lower run")!.polygon.coordinates[0] as LonLat[]);

beforeAll(async () => {
  manager = await makeUser("zone-drawer", { isSiteAdmin: true });
  managerToken = (await createApiToken(manager, "tests")).token;
  ({ id: projectId } = await createProject(manager, {
    name: `Zone drawing ${Date.now().toString(36)}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
    workLimit: WORK_LIMIT, grid: { cellSize: 20 },
  }));
});

async function post(fields: Record<string, string>) {
  const form = new FormData();
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  const request = await requestAs(manager.id, `/projects/${projectId}/settings`, { method: "POST", body: form });
  const result = await settingsPage.action({ request, params: { projectId: String(projectId) }, context: {} } as never);
  return result as unknown as { data: { errors: Record<string, string>; notice: string | null }; init: { status?: number } | null };
}

const drawn = (corners: LonLat[]) => JSON.stringify(draftPolygon(corners));
const zoneNames = async () => (await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] })).map((zone) => zone.name);

describe("a zone drawn on the settings page's map", () => {
  it("is saved from its clicked corners, shown in the zones, audit-logged, and counts for the setup step", async () => {
    const project = presentProject((await findProject(projectId))!);
    expect((await loadSetupProgress(project)).steps.find((step) => step.key === "zones")!.done).toBe(false);
    const saved = await post({ intent: "zone-save", name: "Upper run", geometry: drawn(upperRun) });
    expect(saved.data.errors).toEqual({});
    expect(saved.data.notice).toBe("Saved.");
    expect(await zoneNames()).toEqual(["Upper run"]);
    const stored = await Zone.findOne({ where: { projectId, name: "Upper run" } });
    // computed: the stored outline is the clicked corners, closed once (RFC 7946)
    expect(JSON.parse(stored!.polygonGeoJson).coordinates[0]).toEqual([...upperRun, upperRun[0]]);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] });
    expect((audit?.detail as { after: { zones: string[] } }).after.zones).toEqual(["Upper run"]);
    expect((await loadSetupProgress(project)).steps.find((step) => step.key === "zones")!.done).toBe(true);
  });

  it("keeps a zone's id through a rename and when another zone is added (practice: samples and cell results refer to it)", async () => {
    const before = await Zone.findOne({ where: { projectId, name: "Upper run" } });
    const renamed = await post({ intent: "zone-save", zoneId: String(before!.id), name: "Upper spring run" });
    expect(renamed.data.notice).toBe("Saved.");
    const added = await post({ intent: "zone-save", name: "Lower run", geometry: drawn(lowerRun) });
    expect(added.data.notice).toBe("Saved.");
    const after = await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] });
    expect(after.map((zone) => zone.name)).toEqual(["Upper spring run", "Lower run"]);
    expect(after[0].id).toBe(before!.id);
    expect(after[0].polygonGeoJson).toBe(before!.polygonGeoJson);
  });

  it("refuses a ring that crosses itself, naming the rule and the vertex; nothing is stored", async () => {
    // The first four corners of the upper run taken in a bow-tie order: 1, 3, 2, 4.
    const [a, b, c, d] = [upperRun[0], upperRun[1], upperRun[upperRun.length - 2], upperRun[upperRun.length - 1]];
    const refused = await post({ intent: "zone-save", name: "Bow tie", geometry: drawn([a, c, b, d]) });
    expect(refused.init?.status).toBe(400);
    expect(refused.data.errors.geometry).toMatch(/^Zone "Bow tie" polygon 1, ring 1 \(the outline\) crosses itself near vertex \d+\.$/);
    expect(await zoneNames()).toEqual(["Upper spring run", "Lower run"]);
  });

  it("refuses a ring reaching outside the work limit, naming the rule, the area outside and the vertex", async () => {
    // The lower run's corners with one pushed 200 ft across the bank (computed in the project's CRS).
    const crs = projectCrs();
    const centre = lowerRun.reduce(([x, y], [lon, lat]) => { const [e, n] = crs.fromLonLat(lon, lat); return [x + e / lowerRun.length, y + n / lowerRun.length]; }, [0, 0]);
    const [e, n] = crs.fromLonLat(...lowerRun[1]);
    const away = Math.hypot(e - centre[0], n - centre[1]);
    const pushed = crs.toLonLat(e + ((e - centre[0]) / away) * 200, n + ((n - centre[1]) / away) * 200);
    const corners = lowerRun.map((corner, index) => (index === 1 ? pushed : corner)) as LonLat[];
    const refused = await post({ intent: "zone-save", name: "Over the bank", geometry: drawn(corners) });
    expect(refused.init?.status).toBe(400);
    expect(refused.data.errors.geometry).toMatch(/^Zone "Over the bank" must lie inside the work limit: about [\d,]+ ft² of it lies outside \(polygon 1, ring 1, vertex 2 lies outside it\)\. Move its outline inside the limit\.$/);
    expect(await zoneNames()).toEqual(["Upper spring run", "Lower run"]);
  });

  it("refuses a ring outside the CRS's area of use (the outline moved to Texas), naming the area", async () => {
    const inTexas = upperRun.map(([lon, lat]) => [lon - 16, lat + 2] as LonLat);
    const refused = await post({ intent: "zone-save", name: "Far away", geometry: drawn(inTexas) });
    expect(refused.init?.status).toBe(400);
    expect(refused.data.errors.geometry).toMatch(/^Zone "Far away" polygon 1, ring 1, vertex 1 read as lon\/lat, lies at .* outside the area EPSG:2237/);
  });

  it("refuses the same ring sent to the API (one path: PATCH /api/projects/<id> zones)", async () => {
    const corners = lowerRun.map((corner, index) => (index === 1 ? ([corner[0] + 0.002, corner[1] - 0.002] as LonLat) : corner));
    const response = await projectApi.action({
      request: new Request(`${ORIGIN}/api/projects/${projectId}`, {
        method: "PATCH",
        headers: { Authorization: `Bearer ${managerToken}`, "Content-Type": "application/json" },
        body: JSON.stringify({ zones: [{ name: "Outside", geometry: draftPolygon(corners) }] }),
      }),
      params: { projectId: String(projectId) }, context: {},
    } as never) as Response;
    expect(response.status).toBe(422);
    const body = (await response.json()) as { errors: Array<{ field: string; message: string }> };
    expect(body.errors[0].field).toBe("zones.0.geometry");
    expect(body.errors[0].message).toMatch(/must lie inside the work limit/);
  });

  it("says which zone holds the cells two zones share (overlap allowed: the earlier zone counts them)", async () => {
    const saved = await post({ intent: "zone-save", name: "Whole run", geometry: drawn(lowerRun) });
    expect(saved.data.notice).toMatch(/^Saved\. "Whole run" overlaps "Lower run" by about [\d,]+ ft²: the cells they share count in "Lower run", the earlier zone\.$/);
  });

  it("deletes a zone (the page asks first) and refuses one no longer there", async () => {
    const zone = await Zone.findOne({ where: { projectId, name: "Whole run" } });
    const deleted = await post({ intent: "zone-delete", zoneId: String(zone!.id) });
    expect(deleted.data.notice).toBe("Zone deleted.");
    expect(await zoneNames()).toEqual(["Upper spring run", "Lower run"]);
    const again = await post({ intent: "zone-delete", zoneId: String(zone!.id) });
    expect(again.init?.status).toBe(400);
    expect(again.data.errors.form).toMatch(/no longer there/);
  });
  it("moves a zone up or down the order (the earlier counts shared cells), keeping ids; the first cannot go further up", async () => {
    const [first, second] = await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] });
    const moved = await post({ intent: "zone-move", zoneId: String(second.id), direction: "up" });
    expect(moved.data.notice).toBe("Zone order saved.");
    const after = await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] });
    expect(after.map((zone) => zone.id)).toEqual([second.id, first.id]);
    expect(after.map((zone) => zone.polygonGeoJson)).toEqual([second.polygonGeoJson, first.polygonGeoJson]);
    const refused = await post({ intent: "zone-move", zoneId: String(second.id), direction: "up" });
    expect(refused.init?.status).toBe(400);
    expect(refused.data.errors.form).toBe("That zone is already first.");
    const bad = await post({ intent: "zone-move", zoneId: String(second.id), direction: "sideways" });
    expect(bad.init?.status).toBe(400);
  });

  it("redraws an existing zone's outline: same id, name and place, the new corners stored", async () => {
    const zone = (await Zone.findOne({ where: { projectId, name: "Upper spring run" } }))!;
    // The lower run's outline, a valid zone already (an overlap is allowed).
    const outline = lowerRun;
    const redrawn = await post({ intent: "zone-save", zoneId: String(zone.id), name: zone.name, geometry: drawn(outline) });
    expect(redrawn.data.errors).toEqual({});
    expect(redrawn.data.notice).toMatch(/^Saved\./);
    const after = (await Zone.findByPk(zone.id))!;
    expect([after.name, after.sortOrder]).toEqual([zone.name, zone.sortOrder]);
    // computed: the stored outline is the new corners, closed once
    expect(JSON.parse(after.polygonGeoJson).coordinates[0]).toEqual([...outline, outline[0]]);
  });
});

describe("a zone's colour", () => {
  const patchZones = async (zones: unknown[]) => projectApi.action({
    request: new Request(`${ORIGIN}/api/projects/${projectId}`, {
      method: "PATCH",
      headers: { Authorization: `Bearer ${managerToken}`, "Content-Type": "application/json" },
      body: JSON.stringify({ zones }),
    }),
    params: { projectId: String(projectId) }, context: {},
  } as never) as Promise<Response>;
  const stored = async () => (await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] })).map((zone) => ({ id: zone.id, name: zone.name, colour: zone.colour, geometry: JSON.parse(zone.polygonGeoJson) }));

  it("new zones get the palette's colours in order, each the first no other zone has (shared/zone-colours.ts)", async () => {
    const zones = await stored();
    // The zones drawn above, each given the first free colour when it was made.
    expect(new Set(zones.map((zone) => zone.colour)).size).toBe(zones.length);
    for (const zone of zones) expect(ZONE_COLOUR_VALUES).toContain(zone.colour);
    const response = await patchZones([...zones.map(({ colour: _colour, ...zone }) => zone), { name: "Added by the API", geometry: draftPolygon(upperRun) }]);
    expect(response.status).toBeLessThan(300);
    const after = await stored();
    // A kept zone sent without a colour keeps its own; the new one gets the first colour in palette order not taken.
    expect(after.slice(0, zones.length).map((zone) => zone.colour)).toEqual(zones.map((zone) => zone.colour));
    expect(after.at(-1)!.colour).toBe(ZONE_COLOUR_VALUES.find((colour) => !zones.some((zone) => zone.colour === colour)));
  });

  it("is changed on the settings page: saved, audited with before and after, no new settings version", async () => {
    const [zone] = await stored();
    const versionsBefore = await ProjectSettingsVersion.count({ where: { projectId } });
    const chosen = ZONE_COLOUR_VALUES.find((colour) => colour !== zone.colour)!;
    const saved = await post({ intent: "zone-colour", zoneId: String(zone.id), colour: chosen });
    expect(saved.data.errors).toEqual({});
    expect(saved.data.notice).toBe("Zone colour saved.");
    expect((await Zone.findByPk(zone.id))!.colour).toBe(chosen);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] });
    const detail = audit!.detail as { before: { zoneColours: Record<string, string> }; after: { zoneColours: Record<string, string> } };
    expect([detail.before.zoneColours[zone.name], detail.after.zoneColours[zone.name]]).toEqual([zoneColourName(zone.colour), zoneColourName(chosen)]);
    // A colour moves no figure: no settings version is kept for it.
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versionsBefore);
  });

  it("must be one of the palette's: refused on the page and by the API naming the zone's field; nothing stored", async () => {
    const [zone] = await stored();
    const refused = await post({ intent: "zone-colour", zoneId: String(zone.id), colour: "#ff0000" });
    expect(refused.init?.status).toBe(400);
    expect(refused.data.errors.colour).toMatch(/must be one of the palette's: #0d5c66 \(Teal\)/);
    const response = await patchZones((await stored()).map((each, index) => (index === 1 ? { ...each, colour: "red" } : each)));
    expect(response.status).toBe(422);
    const body = (await response.json()) as { errors: Array<{ field: string; message: string }> };
    expect(body.errors.map((error) => error.field)).toEqual(["zones.1.colour"]);
    expect((await Zone.findByPk(zone.id))!.colour).toBe(zone.colour);
  });

  it("is drawn by the map: each zone feature carries its colour, the outline and the name are painted with it", async () => {
    const { buildMapStyle } = await import("~/models/map-style.server");
    const style = await buildMapStyle(presentProject((await findProject(projectId))!)) as unknown as {
      sources: { zones: { data: { features: Array<{ properties: { name: string; colour: string } }> } } };
      layers: Array<{ id: string; paint?: Record<string, unknown> }>;
    };
    const zones = await stored();
    expect(style.sources.zones.data.features.map((feature) => [feature.properties.name, feature.properties.colour])).toEqual(zones.map((zone) => [zone.name, zone.colour]));
    expect(style.layers.find((layer) => layer.id === "zones-outline")!.paint!["line-color"]).toEqual(["get", "colour"]);
    expect(style.layers.find((layer) => layer.id === "zone-labels")!.paint!["text-color"]).toEqual(["get", "colour"]);
    // The white casing lies under the outline, and the outline over the work limit's red line (both show where they run together).
    const ids = style.layers.map((layer) => layer.id);
    expect(ids.indexOf("zones-casing")).toBeLessThan(ids.indexOf("work-limit-outline"));
    expect(ids.indexOf("work-limit-outline")).toBeLessThan(ids.indexOf("zones-outline"));
  });
});
