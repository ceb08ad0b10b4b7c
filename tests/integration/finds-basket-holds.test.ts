import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import { closeSequelize } from "../../db/connection.server";
import { createCrs } from "../../shared/crs";
import { cellCentroid, cellLabel, parseCellLabel, type CellGrid } from "../../shared/grid/cell-grid";
import { GRID, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { AuditEvent, DiveTeam, Find, FindSequence, Hold, Project, Zone, type Role } from "~/lib/db.server";
import { action as assignAction } from "~/routes/api.projects.$projectId.assignments";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { action as divesAction } from "~/routes/api.projects.$projectId.dives";
import { action as findsAction } from "~/routes/api.projects.$projectId.finds";
import { loader as findLoader } from "~/routes/api.projects.$projectId.finds.$findId";
import { action as basketsAction } from "~/routes/api.projects.$projectId.finds.baskets";
import { action as noticesAction, loader as noticesLoader } from "~/routes/api.projects.$projectId.holds.$holdId.notices";
import { action as liftAction } from "~/routes/api.projects.$projectId.holds.$holdId.lift";
import { action as newFindPage, loader as newFindLoader } from "~/routes/projects.$projectId.finds.new";
import { action as basketPage } from "~/routes/projects.$projectId.finds.basket";
import { action as findPage } from "~/routes/projects.$projectId.finds.$findId";
import { listObjectKeys } from "~/lib/storage/storage.server";
import { action as holdsPage } from "~/routes/projects.$projectId.holds";
import { loader as findsListLoader } from "~/routes/api.projects.$projectId.finds";
import { loader as dayLoader } from "~/routes/api.projects.$projectId.days.$date";
import { action as custodyAction } from "~/routes/api.projects.$projectId.finds.$findId.custody";
import { action as formPhotoAction } from "~/routes/api.projects.$projectId.finds.$findId.custody.$custodyId.form-photo";
import sharp from "sharp";
import { FindCustody, FindPhoto } from "~/lib/db.server";
import { loader as batchSheet } from "~/routes/projects.$projectId.finds.custody-sheet";
import { ORIGIN, addMember, makeUser, requestAs } from "./helpers";

// The finds' newer pieces as their users meet them: a basket load (a catalogue entry per line in
// one transaction, numbers never reused), the log form's position as easting/northing or
// latitude/longitude (errors on the field typed in) and its prefill from a dive or the day plan,
// the agencies' notices through the API, and a lift back-dated to when resuming was authorised.

afterAll(closeSequelize);

let projectId: number;
const users = new Map<Role, number>();
let grid: CellGrid;
let crsDefinition = "";
const inside: string[] = [];
let diveId = 0;
let heronId = 0;
let egretId = 0;
const DATE = "2026-11-10";

type Handler = (args: never) => Promise<unknown>;
const call = async (handler: Handler, who: Role, path: string, params: Record<string, string> = {}, init: RequestInit = {}) => {
  const request = await requestAs(users.get(who)!, path, init);
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never) as Promise<Response>;
};
const postJson = (handler: Handler, who: Role, path: string, params: Record<string, string>, body: unknown) =>
  call(handler, who, path, params, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
const base = () => `/api/projects/${projectId}`;
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;

/** Posts a page form; answers its status and data (a redirect's Location as `location`). */
type PageBody = { errors: Record<string, string>; logged?: Array<{ id: number; catalogueNumber: string; count: number }> };
async function postPage(handler: Handler, who: Role, path: string, fields: Record<string, string>): Promise<{ status: number; location: string | null; body: PageBody }> {
  const request = await requestAs(users.get(who)!, path, { method: "POST", body: new URLSearchParams(fields), headers: { Origin: ORIGIN, "Content-Type": "application/x-www-form-urlencoded" } });
  try {
    const answer = await handler({ request, params: { projectId: String(projectId) }, context: {} } as never);
    if (answer instanceof Response) return { status: answer.status, location: answer.headers.get("Location"), body: { errors: {} as Record<string, string> } };
    const result = answer as { init?: { status?: number }; data?: unknown };
    return { status: result.init?.status ?? 200, location: null, body: (result.data ?? answer) as { errors: Record<string, string>; logged?: Array<{ id: number; catalogueNumber: string; count: number }> } };
  } catch (error) {
    if (error instanceof Response) return { status: error.status, location: error.headers.get("Location"), body: { errors: {} as Record<string, string> } };
    throw error;
  }
}

const centreOf = (label: string) => {
  const { row, col } = parseCellLabel(label)!;
  return cellCentroid(grid, row, col);
};

beforeAll(async () => {
  const project = await Project.create({
    name: "Basket test", slug: `basket-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 2, findCataloguePrefix: "BSK",
  });
  projectId = project.id;
  for (const [index, zone] of ZONES.entries()) await Zone.create({ projectId, name: zone.name, sortOrder: index, polygonGeoJson: JSON.stringify(zone.polygon) });
  heronId = (await DiveTeam.create({ projectId, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "Ana Reyes", email: "basket-a@example.org", duty: "diver" }, { name: "Bo Lind", email: "basket-b@example.org", duty: "tender" }] })).id;
  egretId = (await DiveTeam.create({ projectId, name: "Team Egret", station: "Barge 2", hoses: [{ name: "Hose B", diameter: 6, diameterUnit: "in" }], members: [{ name: "Cy Moss", email: "basket-c@example.org", duty: "diver" }, { name: "Di Park", email: "basket-d@example.org", duty: "tender" }] })).id;
  for (const role of ["manager", "resource-monitor", "dive-supervisor", "viewer"] as Role[]) {
    const user = await makeUser(`basket-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
  const payload = (await (await call(cellsLoader as never, "viewer", `${base()}/cells`)).json()) as { grid: CellGrid; status: number[]; crs: { definition: string } };
  grid = payload.grid;
  crsDefinition = payload.crs.definition;
  payload.status.forEach((code, index) => {
    if (code >= 0) inside.push(cellLabel(Math.floor(index / grid.cols) + grid.firstRow, (index % grid.cols) + grid.firstCol));
  });
  expect((await postJson(assignAction as never, "dive-supervisor", `${base()}/assignments`, {}, { date: DATE, team: "Team Heron", cells: [inside[3], inside[4]], hose: "Hose A" })).status).toBe(201);
  const dive = await postJson(divesAction as never, "dive-supervisor", `${base()}/dives`, {}, { date: DATE, team: "Team Heron", diver: "Ana Reyes", bottomMinutes: 40, maxDepth: 12, cells: [inside[3], inside[4]] });
  expect(dive.status).toBe(201);
  diveId = ((await dive.json()) as { dive: { id: number } }).dive.id;
});

describe("a basket load through the API", () => {
  const BASKET = {
    lines: [
      { category: "modern-debris", description: "Aluminium cans", count: 14, material: "aluminium" },
      { category: "historic-debris", description: "Glass bottle necks", count: 3, material: "glass" },
      { category: "faunal", description: "Turtle shell fragments", count: 6, taxon: "softshell turtle", element: "carapace" },
    ],
    depthBelowSurface: 11.5, depthInMuck: 0.4, foundAt: "2026-11-10T10:15:00-05:00", finder: "Ana Reyes", fieldTag: "B-17",
  };

  it("stores a catalogue entry per line, numbered in order, with the dive's team and one shared provenience (201)", async () => {
    const response = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { ...BASKET, cell: inside[3], diveId });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { finds: Array<{ id: number; catalogueNumber: string; category: string; count: number }> };
    // Prefix, the local year of foundAt, sequences 1 to 3 in the order of the lines (computed).
    expect(body.finds.map((find) => [find.catalogueNumber, find.category, find.count])).toEqual([
      ["BSK-2026-0001", "modern-debris", 14], ["BSK-2026-0002", "historic-debris", 3], ["BSK-2026-0003", "faunal", 6],
    ]);
    for (const find of body.finds) {
      const { find: detail } = await (await call(findLoader as never, "resource-monitor", `${base()}/finds/${find.id}`, { findId: String(find.id) })).json();
      expect(detail).toMatchObject({ cell: inside[3], depthBelowSurface: 11.5, depthInMuck: 0.4, diveId, team: "Team Heron", finder: "Ana Reyes", fieldTag: "B-17", foundAt: "2026-11-10T15:15:00.000Z" });
    }
    const { find: faunal } = await (await call(findLoader as never, "viewer", `${base()}/finds/${body.finds[2].id}`, { findId: String(body.finds[2].id) })).json();
    expect(faunal).toMatchObject({ taxon: "softshell turtle", element: "carapace" });
    // A viewer sees the entries without any location: the keys are absent, not null.
    expect("cell" in faunal || "depthBelowSurface" in faunal || "diveId" in faunal).toBe(false);
    expect(await AuditEvent.count({ where: { projectId, action: "find-logged" } })).toBe(3);
  });

  it("refuses a cultural line, naming its line and field, and stores nothing, using up no number (422)", async () => {
    const before = await Find.count({ where: { projectId } });
    const sequence = (await FindSequence.findOne({ where: { projectId, year: 2026 } }))!.lastSequence;
    const lines = [BASKET.lines[0], { category: "cultural", description: "Pottery sherd", count: 1 }];
    const refused = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { ...BASKET, lines, cell: inside[3] });
    expect(refused.status).toBe(422);
    const errors = await errorsOf(refused);
    expect(errors).toEqual([expect.objectContaining({ field: "lines.1.category", message: expect.stringContaining("logged on its own") })]);
    expect(await Find.count({ where: { projectId } })).toBe(before);
    expect((await FindSequence.findOne({ where: { projectId, year: 2026 } }))!.lastSequence).toBe(sequence);
  });

  it("refuses a cell outside the work limit and a position in another cell, storing nothing (422)", async () => {
    const before = await Find.count({ where: { projectId } });
    const outside = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { ...BASKET, cell: "ZZ999" });
    expect(outside.status).toBe(422);
    expect((await errorsOf(outside))[0]).toMatchObject({ field: "cell", message: "Cell ZZ999 is not inside the work limit." });
    const [x, y] = centreOf(inside[4]);
    const elsewhere = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { ...BASKET, cell: inside[3], position: { x, y } });
    expect(elsewhere.status).toBe(422);
    expect((await errorsOf(elsewhere))[0]).toMatchObject({ field: "position", message: `The position lies in cell ${inside[4]}, not in ${inside[3]}.` });
    expect(await Find.count({ where: { projectId } })).toBe(before);
  });

  it("refuses a team other than the dive's (422 naming teamId) and roles that do not log finds (403)", async () => {
    const mismatch = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { ...BASKET, diveId, teamId: egretId });
    expect(mismatch.status).toBe(422);
    expect((await errorsOf(mismatch))[0].field).toBe("teamId");
    expect((await postJson(basketsAction as never, "dive-supervisor", `${base()}/finds/baskets`, {}, BASKET)).status).toBe(403);
    expect((await postJson(basketsAction as never, "viewer", `${base()}/finds/baskets`, {}, BASKET)).status).toBe(403);
  });

  it("gives the next find the next number after the basket's: numbers never reused nor skipped", async () => {
    const next = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "modern-debris", description: "Fishing weight", foundAt: "2026-11-10T11:00:00-05:00", teamId: egretId });
    expect(next.status).toBe(201);
    const body = (await next.json()) as { id: number; catalogueNumber: string };
    expect(body.catalogueNumber).toBe("BSK-2026-0004");
    expect((await Find.findByPk(body.id))!.teamId).toBe(egretId);
  });
});

describe("a basket load by volume", () => {
  const DAY = "2026-11-14";
  const post = (body: unknown) => postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, body);
  // Read once the project is made (beforeAll).
  const provenience = () => ({ cell: inside[5], foundAt: `${DAY}T10:00:00-05:00`, finder: "Cy Moss", teamId: egretId });

  it("takes a count, a volume as measured, or both on each line, and says them back (201)", async () => {
    const response = await post({
      ...provenience(),
      lines: [
        { category: "modern-debris", description: "Cans and bottle caps", volume: { value: 2.5, unit: "gal" } },
        { category: "historic-debris", description: "Brick fragments", count: 9, volume: { value: 0.5, unit: "ft3" } },
        { category: "faunal", description: "Snail shells", count: 40, taxon: "apple snail" },
      ],
    });
    expect(response.status).toBe(201);
    const { finds } = (await response.json()) as { finds: Array<{ id: number; count: number | null; volume: { value: number; unit: string } | null }> };
    expect(finds.map((find) => [find.count, find.volume])).toEqual([[null, { value: 2.5, unit: "gal" }], [9, { value: 0.5, unit: "ft3" }], [40, null]]);
    // Kept as entered, and marked as basket lines, for every role (a volume is not a location).
    const { find } = await (await call(findLoader as never, "viewer", `${base()}/finds/${finds[0].id}`, { findId: String(finds[0].id) })).json();
    expect(find).toMatchObject({ count: null, volume: { value: 2.5, unit: "gal" }, fromBasket: true });
    const listed = ((await (await call(findsListLoader as never, "viewer", `${base()}/finds`)).json()) as { finds: Array<{ id: number; volume: unknown; fromBasket: boolean }> }).finds;
    expect(listed.find((entry) => entry.id === finds[1].id)).toMatchObject({ volume: { value: 0.5, unit: "ft3" }, fromBasket: true });
    // A find logged on its own is no basket line.
    expect(listed.find((entry) => !entry.fromBasket)).toBeTruthy();
  });

  it("adds the day's basket lines up in the daily report: items counted and the volumes in US gallons", async () => {
    const day = (await (await call(dayLoader as never, "viewer", `${base()}/days/${DAY}`, { date: DAY })).json()) as { finds: { byHand?: { lines: number; items: number; litres: number | null } } };
    // computed: 2.5 gal × 3.785411784 + 0.5 ft³ × 28.316846592 = 9.46352946 + 14.158423296 = 23.622 L (NIST SP 811)
    expect(day.finds.byHand).toEqual({ lines: 3, items: 49, litres: 23.622 });
  });

  it("refuses a line with neither a count nor a volume, a volume of 0, an unknown unit and more than a cubic metre, naming the line and field, storing nothing (422)", async () => {
    const before = await Find.count({ where: { projectId } });
    const sequence = (await FindSequence.findOne({ where: { projectId, year: 2026 } }))!.lastSequence;
    const refused = await post({
      ...provenience(),
      lines: [
        { category: "modern-debris", description: "Cans", count: 3 },
        { category: "modern-debris", description: "Rope" },
        { category: "modern-debris", description: "Tyre scraps", volume: { value: 0, unit: "L" } },
      ],
    });
    expect(refused.status).toBe(422);
    expect(await errorsOf(refused)).toEqual([
      { field: "lines.1.count", message: "line 2: give how many, the volume, or both" },
      { field: "lines.2.volume.value", message: "line 3: the volume is more than 0" },
    ]);
    const unit = await post({ ...provenience(), lines: [{ category: "historic-debris", description: "Bottles", volume: { value: 3, unit: "bucket" } }] });
    expect(unit.status).toBe(422);
    expect(await errorsOf(unit)).toEqual([expect.objectContaining({ field: "lines.0.volume.unit", message: "the volume's unit is one of gal, ft3, L, m3" })]);
    // 300 gal is 1135.6 L (computed), over the cubic metre one line takes.
    const large = await post({ ...provenience(), lines: [{ category: "modern-debris", description: "Sheet metal", volume: { value: 300, unit: "gal" } }] });
    expect(large.status).toBe(422);
    expect(await errorsOf(large)).toEqual([{ field: "lines.0.volume.value", message: "line 1: at most 264 gal (1000 L) in one line of a basket; log a larger load as several baskets" }]);
    expect(await Find.count({ where: { projectId } })).toBe(before);
    expect((await FindSequence.findOne({ where: { projectId, year: 2026 } }))!.lastSequence).toBe(sequence);
  });

  it("reads the page form's volume and unit on each line, and says a line's error on its field", async () => {
    const path = `/projects/${projectId}/finds/basket`;
    const fields = { foundAt: `${DAY}T11:00`, cell: inside[5], positionIn: "grid" };
    const refused = await postPage(basketPage as never, "resource-monitor", path, {
      "lines.0.category": "modern-debris", "lines.0.description": "Cans", "lines.0.count": "", "lines.0.volume": "1.5", "lines.0.volumeUnit": "gal",
      "lines.3.category": "modern-debris", "lines.3.description": "Rope", "lines.3.count": "", "lines.3.volume": "", "lines.3.volumeUnit": "gal",
      "lines.5.category": "modern-debris", "lines.5.description": "Glass", "lines.5.count": "", "lines.5.volume": "-2", "lines.5.volumeUnit": "L",
      ...fields,
    });
    expect(refused.status).toBe(400);
    expect(refused.body.errors["lines.3.count"]).toBe("line 2: give how many, the volume, or both");
    expect(refused.body.errors["lines.5.volume"]).toBe("line 3: the volume is more than 0");
    const logged = await postPage(basketPage as never, "resource-monitor", path, {
      "lines.0.category": "modern-debris", "lines.0.description": "Cans", "lines.0.count": "", "lines.0.volume": "1.5", "lines.0.volumeUnit": "gal",
      "lines.3.category": "historic-debris", "lines.3.description": "Bottle glass", "lines.3.count": "4", "lines.3.volume": "2", "lines.3.volumeUnit": "L",
      ...fields,
    });
    expect(logged.status).toBe(200);
    const entries = logged.body.logged as unknown as Array<{ count: number | null; volume: unknown }>;
    expect(entries.map((entry) => [entry.count, entry.volume])).toEqual([[null, { value: 1.5, unit: "gal" }], [4, { value: 2, unit: "L" }]]);
  });
});

describe("the batch custody sheet", () => {
  const sheet = async (who: Role, query: string) => {
    try {
      return (await call(batchSheet as never, who, `/projects/${projectId}/finds/custody-sheet${query}`)) as unknown as { finds: Array<{ catalogueNumber: string; cell?: string | null }>; seesLocations: boolean };
    } catch (error) {
      if (error instanceof Response) return error;
      throw error;
    }
  };

  it("lists the finds ticked in catalogue order, with provenience only for location roles", async () => {
    const ids = (await Find.findAll({ where: { projectId }, order: [["id", "ASC"]], limit: 3 })).map((find) => find.id);
    const query = `?find=${ids[2]}&find=${ids[0]}&find=${ids[0]}`;
    const monitor = (await sheet("resource-monitor", query)) as { finds: Array<{ catalogueNumber: string; cell?: string | null }>; seesLocations: boolean };
    expect(monitor.finds.map((find) => find.catalogueNumber)).toEqual(["BSK-2026-0001", "BSK-2026-0003"]);
    expect(monitor.finds[0].cell).toBe(inside[3]);
    const viewer = (await sheet("viewer", query)) as { finds: Array<Record<string, unknown>>; seesLocations: boolean };
    expect(viewer.seesLocations).toBe(false);
    expect(viewer.finds.every((find) => !("cell" in find) && !("depthBelowSurface" in find))).toBe(true);
  });

  it("answers 400 with no find ticked and 404 naming a find not in the project", async () => {
    const none = (await sheet("viewer", "")) as Response;
    expect(none.status).toBe(400);
    expect(await none.text()).toBe("Choose at least one find on the catalogue for the sheet.");
    const unknown = (await sheet("viewer", "?find=999999999")) as Response;
    expect(unknown.status).toBe(404);
    expect(await unknown.text()).toBe("There is no find #999999999 in this project.");
  });
});

describe("a photo of the signed custody form", () => {
  it("is kept as the find's photo and named on the handover (201); a second is refused (409) storing nothing; another find's handover is 404", async () => {
    const find = (await Find.findOne({ where: { projectId }, order: [["id", "ASC"]] }))!;
    const handed = await postJson(custodyAction as never, "resource-monitor", `${base()}/finds/${find.id}/custody`, { findId: String(find.id) }, { fromName: "Ana Reyes", toName: "Lee Ortiz", place: "Site store", purpose: "to-site-store", handedAt: "2026-11-10T16:00:00-05:00", receiverSignature: "Lee Ortiz" });
    expect(handed.status).toBe(201);
    const custodyId = ((await handed.json()) as { id: number }).id;
    const upload = async (who: Role, forFind: number, colour: string) => {
      const form = new FormData();
      const bytes = await sharp({ create: { width: 320, height: 240, channels: 3, background: colour } }).jpeg().toBuffer();
      form.set("file", new Blob([new Uint8Array(bytes)], { type: "image/jpeg" }), "signed-form.jpg");
      return call(formPhotoAction as never, who, `${base()}/finds/${forFind}/custody/${custodyId}/form-photo`, { findId: String(forFind), custodyId: String(custodyId) }, { method: "POST", body: form });
    };
    expect((await upload("viewer", find.id, "#eeeeee")).status).toBe(403);
    const kept = await upload("resource-monitor", find.id, "#eeeeee");
    expect(kept.status).toBe(201);
    const photoId = ((await kept.json()) as { id: number }).id;
    expect((await FindCustody.findByPk(custodyId))!.formPhotoId).toBe(photoId);
    const { find: detail } = await (await call(findLoader as never, "viewer", `${base()}/finds/${find.id}`, { findId: String(find.id) })).json();
    expect(detail.custody.find((entry: { id: number }) => entry.id === custodyId).formPhotoId).toBe(photoId);
    const photos = await FindPhoto.count({ where: { findId: find.id } });
    const again = await upload("resource-monitor", find.id, "#dddddd");
    expect(again.status).toBe(409);
    expect((await errorsOf(again))[0].message).toContain(`has its form's photo already (photo #${photoId})`);
    expect(await FindPhoto.count({ where: { findId: find.id } })).toBe(photos);
    const other = (await Find.findOne({ where: { projectId }, order: [["id", "DESC"]] }))!;
    expect((await upload("resource-monitor", other.id, "#cccccc")).status).toBe(404);
  });

  it("is attached from the handover's own form on the find's page: a refused file stores nothing and is said on that form", async () => {
    const find = (await Find.findOne({ where: { projectId, category: "historic-debris" }, order: [["id", "ASC"]] }))!;
    const handed = await postJson(custodyAction as never, "resource-monitor", `${base()}/finds/${find.id}/custody`, { findId: String(find.id) }, { fromName: "Ana Reyes", toName: "Mo Quist", place: "State lab", purpose: "to-state-lab", handedAt: "2026-11-11T09:00:00-05:00", receiverSignature: "Mo Quist" });
    const custodyId = ((await handed.json()) as { id: number }).id;
    const path = `/projects/${projectId}/finds/${find.id}?custody=${custodyId}`;
    const send = async (who: Role, file: Blob, name: string) => {
      const form = new FormData();
      form.set("file", file, name);
      const request = await requestAs(users.get(who)!, path, { method: "POST", body: form, headers: { Origin: ORIGIN } });
      try {
        const answer = await findPage({ request, params: { projectId: String(projectId), findId: String(find.id) }, context: {} } as never);
        const result = answer as { init?: { status?: number }; data?: unknown };
        return { status: result.init?.status ?? 200, body: (result.data ?? answer) as { custodyId?: number | null; errors: Record<string, string>; notice: string | null } };
      } catch (error) {
        if (error instanceof Response) return { status: error.status, body: { errors: {}, notice: null } };
        throw error;
      }
    };
    const keys = () => listObjectKeys(`projects/${projectId}/finds/${find.id}/`);
    const keysBefore = (await keys()).length;
    const photosBefore = await FindPhoto.count({ where: { findId: find.id } });
    // Not an image (a PDF named .jpg): refused on this handover's form, nothing in the store or the tables.
    const notImage = await send("resource-monitor", new Blob([new TextEncoder().encode("%PDF-1.4 not a photo")], { type: "image/jpeg" }), "form.jpg");
    expect(notImage.status).toBe(400);
    expect(notImage.body.custodyId).toBe(custodyId);
    expect(notImage.body.errors.formPhoto).toMatch(/\S/);
    expect((await FindCustody.findByPk(custodyId))!.formPhotoId).toBeNull();
    expect(await FindPhoto.count({ where: { findId: find.id } })).toBe(photosBefore);
    expect((await keys()).length).toBe(keysBefore);
    // No file chosen: said on the form.
    const empty = await send("resource-monitor", new Blob([]), "");
    expect(empty.status).toBe(400);
    expect(empty.body.errors.formPhoto).toBe("Take or choose the photo of the signed form.");
    // A viewer may not attach one (403).
    const bytes = await sharp({ create: { width: 400, height: 300, channels: 3, background: "#f4f1e8" } }).jpeg().toBuffer();
    expect((await send("viewer", new Blob([new Uint8Array(bytes)], { type: "image/jpeg" }), "signed.jpg")).status).toBe(403);
    const kept = await send("resource-monitor", new Blob([new Uint8Array(bytes)], { type: "image/jpeg" }), "signed.jpg");
    expect(kept.status).toBe(200);
    expect(kept.body.notice).toBe("Photo of the signed form attached to the handover.");
    const photoId = (await FindCustody.findByPk(custodyId))!.formPhotoId;
    expect(photoId).not.toBeNull();
    // The image and its thumbnail (keepPhoto's two objects).
    expect((await keys()).length).toBe(keysBefore + 2);
    // A second is refused on the form, naming the photo kept; nothing more is stored.
    const again = await send("resource-monitor", new Blob([new Uint8Array(bytes)], { type: "image/jpeg" }), "signed-again.jpg");
    expect(again.status).toBe(400);
    expect(again.body.errors.formPhoto).toContain(`has its form's photo already (photo #${photoId})`);
    expect((await keys()).length).toBe(keysBefore + 2);
  });
});

describe("the basket page", () => {
  it("logs the lines it is sent, skipping blank ones, and says a line's error on that line's field", async () => {
    const path = `/projects/${projectId}/finds/basket`;
    const refused = await postPage(basketPage as never, "resource-monitor", path, {
      "lines.0.category": "modern-debris", "lines.0.description": "Cans", "lines.0.count": "5",
      "lines.2.category": "modern-debris", "lines.2.description": "Bottles", "lines.2.count": "0",
      "lines.4.category": "modern-debris", "lines.4.description": "", "lines.4.count": "",
      foundAt: "2026-11-10T12:00", cell: inside[4], positionIn: "grid",
    });
    expect(refused.status).toBe(400);
    expect(refused.body.errors["lines.2.count"]).toBe("line 2: the count is a whole number from 1 to 100000");
    const logged = await postPage(basketPage as never, "resource-monitor", path, {
      "lines.0.category": "modern-debris", "lines.0.description": "Cans", "lines.0.count": "5",
      "lines.2.category": "historic-debris", "lines.2.description": "Bottles", "lines.2.count": "2",
      "lines.4.category": "modern-debris", "lines.4.description": "", "lines.4.count": "",
      foundAt: "2026-11-10T12:00", cell: inside[4], diveId: String(diveId), positionIn: "grid", idempotencyKey: "basket-page-key-1",
    });
    expect(logged.status).toBe(200);
    expect(logged.body.logged!.map((find) => find.count)).toEqual([5, 2]);
    // The same form sent again (a double tap) stores nothing more and answers the same entries.
    const again = await postPage(basketPage as never, "resource-monitor", path, {
      "lines.0.category": "modern-debris", "lines.0.description": "Cans", "lines.0.count": "5",
      "lines.2.category": "historic-debris", "lines.2.description": "Bottles", "lines.2.count": "2",
      foundAt: "2026-11-10T12:00", cell: inside[4], diveId: String(diveId), positionIn: "grid", idempotencyKey: "basket-page-key-1",
    });
    expect(again.body.logged).toEqual(logged.body.logged);
  });
});

describe("the log form's position and prefill", () => {
  const path = () => `/projects/${projectId}/finds/new`;
  const FIELDS = { category: "modern-debris", description: "Spark plug", count: "1", foundAt: "2026-11-10T13:00" };

  it("takes a latitude and longitude, stored in the project's coordinates in the cell it lies in", async () => {
    const [x, y] = centreOf(inside[5]);
    const [lon, lat] = createCrs(crsDefinition).toLonLat(x + 1, y - 1);
    const answer = await postPage(newFindPage as never, "resource-monitor", path(), { ...FIELDS, positionIn: "latlon", latitude: lat.toFixed(8), longitude: lon.toFixed(8) });
    expect(answer.status).toBe(302);
    const find = await Find.findByPk(Number(answer.location!.split("/").at(-1)!.split("?")[0]));
    expect(find!.cellLabel).toBe(inside[5]);
    // Back through proj4 at 1e-8° (about 1 mm): the same point to the centimetre (computed).
    expect(Math.abs(find!.positionX! - (x + 1))).toBeLessThan(0.01);
    expect(Math.abs(find!.positionY! - (y - 1))).toBeLessThan(0.01);
  });

  it("names the field: a latitude outside the work limit, a northing missing, a latitude out of range, an easting in another cell", async () => {
    const outside = await postPage(newFindPage as never, "resource-monitor", path(), { ...FIELDS, positionIn: "latlon", latitude: "40.0", longitude: "-75.0" });
    expect(outside.status).toBe(400);
    expect(outside.body.errors.latitude).toMatch(/^Latitude and longitude: The position .* lies outside the work limit\.$/);
    const half = await postPage(newFindPage as never, "resource-monitor", path(), { ...FIELDS, positionIn: "grid", easting: "500000" });
    expect(half.body.errors).toEqual({ northing: "give the northing with the easting, or neither" });
    const range = await postPage(newFindPage as never, "resource-monitor", path(), { ...FIELDS, positionIn: "latlon", latitude: "123", longitude: "-82" });
    expect(range.body.errors.latitude).toBe("the latitude is a number from -90 to 90");
    const [x, y] = centreOf(inside[6]);
    const other = await postPage(newFindPage as never, "resource-monitor", path(), { ...FIELDS, cell: inside[5], positionIn: "grid", easting: String(x), northing: String(y) });
    expect(other.body.errors.easting).toBe(`Easting and northing: The position lies in cell ${inside[6]}, not in ${inside[5]}.`);
  });

  it("prefills the dive with its team and cells from a dive log entry, and a team and its cells from the day plan", async () => {
    const load = async (query: string) => (await call(newFindLoader as never, "resource-monitor", `/projects/${projectId}/finds/new${query}`)) as unknown as { prefill: { diveId: number | null; teamId: number | null; cells: string[] } };
    expect((await load(`?dive=${diveId}`)).prefill).toEqual({ diveId, teamId: heronId, cells: [inside[3], inside[4]].sort((a, b) => a.localeCompare(b, "en", { numeric: true })) });
    expect((await load(`?team=${egretId}&cells=${inside[7]},ZZ999`)).prefill).toEqual({ diveId: null, teamId: egretId, cells: [inside[7]] });
    expect((await load("?dive=abc&team=-1")).prefill).toEqual({ diveId: null, teamId: null, cells: [] });
  });
});

describe("a hold's agency notices through the API", () => {
  let holdId = "";
  beforeAll(async () => {
    const logged = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "human-remains", description: "Long bone fragment", cell: inside[10], foundAt: "2026-11-11T09:00:00-05:00" });
    holdId = String(((await logged.json()) as { hold: { id: number } }).hold.id);
  });
  const notices = (who: Role) => call(noticesLoader as never, who, `${base()}/holds/${holdId}/notices`, { holdId });
  const tell = (who: Role, body: unknown) => postJson(noticesAction as never, who, `${base()}/holds/${holdId}/notices`, { holdId }, body);

  it("lists who must be told, none told yet, to the roles that see locations only", async () => {
    const answer = await notices("resource-monitor");
    expect(answer.status).toBe(200);
    // Human remains: the historic-preservation office, the medical examiner, the state archaeologist (practice).
    expect(((await answer.json()) as { notices: Array<{ agency: string; toldAt: string | null }> }).notices.map((notice) => [notice.agency, notice.toldAt])).toEqual([
      ["historic-preservation-office", null], ["medical-examiner", null], ["state-archaeologist", null],
    ]);
    expect((await notices("dive-supervisor")).status).toBe(403);
    expect((await notices("viewer")).status).toBe(403);
  });

  it("records a notice (201), refuses it twice (409), before the hold (422), in the future (422), and for roles that do not lift holds (403)", async () => {
    const told = await tell("resource-monitor", { agency: "medical-examiner", toldAt: "2026-11-11T09:20:00-05:00", note: "Duty officer, by telephone" });
    expect(told.status).toBe(201);
    expect(await told.json()).toEqual({ agency: "medical-examiner", toldAt: "2026-11-11T14:20:00.000Z", note: "Duty officer, by telephone" });
    const twice = await tell("manager", { agency: "medical-examiner", toldAt: "2026-11-11T09:30:00-05:00" });
    expect(twice.status).toBe(409);
    expect((await errorsOf(twice))[0].message).toBe("Medical examiner was recorded as told already, at 2026-11-11 09:20 (America/New_York).");
    const early = await tell("resource-monitor", { agency: "state-archaeologist", toldAt: "2026-11-11T08:59:00-05:00" });
    expect(early.status).toBe(422);
    expect((await errorsOf(early))[0]).toMatchObject({ field: "toldAt", message: "The notice cannot come before the hold was placed, at 2026-11-11 09:00 (America/New_York)." });
    const future = await tell("resource-monitor", { agency: "state-archaeologist", toldAt: new Date(Date.now() + 3_600_000).toISOString() });
    expect(future.status).toBe(422);
    expect((await errorsOf(future))[0].field).toBe("toldAt");
    expect((await tell("dive-supervisor", { agency: "state-archaeologist", toldAt: "2026-11-11T10:00:00-05:00" })).status).toBe(403);
    const listed = ((await (await notices("manager")).json()) as { notices: Array<{ agency: string; toldAt: string | null }> }).notices;
    expect(listed.find((notice) => notice.agency === "medical-examiner")!.toldAt).toBe("2026-11-11T14:20:00.000Z");
  });

  it("refuses an agency this hold does not list (a cultural find's hold lists the office alone)", async () => {
    const cultural = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "cultural", description: "Sherd", cell: inside[inside.length - 3], foundAt: "2026-11-11T09:00:00-05:00" });
    const culturalHold = String(((await cultural.json()) as { hold: { id: number } }).hold.id);
    const refused = await postJson(noticesAction as never, "resource-monitor", `${base()}/holds/${culturalHold}/notices`, { holdId: culturalHold }, { agency: "medical-examiner", toldAt: "2026-11-11T09:30:00-05:00" });
    expect(refused.status).toBe(422);
    expect((await errorsOf(refused))[0]).toMatchObject({ field: "agency", message: "This hold does not list Medical examiner: it lists State historic-preservation office." });
  });
});

describe("a back-dated lift", () => {
  let holdId = "";
  beforeAll(async () => {
    const logged = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "cultural", description: "Bone pin", cell: inside[12], foundAt: "2026-11-12T08:30:00-05:00" });
    holdId = String(((await logged.json()) as { hold: { id: number } }).hold.id);
  });
  const lift = (body: unknown) => postJson(liftAction as never, "manager", `${base()}/holds/${holdId}/lift`, { holdId }, body);

  it("refuses a lift before the hold was placed or in the future, naming liftedAt (422)", async () => {
    const early = await lift({ authorisedBy: "State office", liftedAt: "2026-11-12T08:00:00-05:00" });
    expect(early.status).toBe(422);
    expect((await errorsOf(early))[0]).toMatchObject({ field: "liftedAt", message: "The lift cannot come before the hold was placed, at 2026-11-12 08:30 (America/New_York)." });
    const future = await lift({ authorisedBy: "State office", liftedAt: new Date(Date.now() + 3_600_000).toISOString() });
    expect(future.status).toBe(422);
    expect((await errorsOf(future))[0].field).toBe("liftedAt");
    expect((await Hold.findByPk(Number(holdId)))!.liftedAt).toBeNull();
  });

  it("lifts as of the time entered and audits both times; a second lift is a 409", async () => {
    const lifted = await lift({ authorisedBy: "R. Okafor, state historic-preservation office", liftedAt: "2026-11-12T16:45:00-05:00" });
    expect(lifted.status).toBe(204);
    expect((await Hold.findByPk(Number(holdId)))!.liftedAt!.toISOString()).toBe("2026-11-12T21:45:00.000Z");
    const audit = await AuditEvent.findOne({ where: { projectId, action: "hold-lifted" }, order: [["id", "DESC"]] });
    const detail = audit!.detail as { liftedAt: string; recordedAt: string; holdId: number };
    expect(detail.holdId).toBe(Number(holdId));
    expect(detail.liftedAt).toBe("2026-11-12T21:45:00.000Z");
    expect(Math.abs(new Date(detail.recordedAt).getTime() - Date.now())).toBeLessThan(60_000);
    expect((await lift({ authorisedBy: "Again" })).status).toBe(409);
  });

  it("refuses a lift \"now\" that would come before the hold was placed (a find logged from a clock running ahead), naming liftedAt (422)", async () => {
    // A phone's clock four minutes fast (within the 5 minutes allowed): the find, and so its hold, is placed in the server's future.
    const ahead = new Date(Date.now() + 4 * 60_000);
    const logged = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "cultural", description: "Shell bead", cell: inside[16], foundAt: ahead.toISOString() });
    expect(logged.status).toBe(201);
    const aheadHold = String(((await logged.json()) as { hold: { id: number } }).hold.id);
    const now = await postJson(liftAction as never, "manager", `${base()}/holds/${aheadHold}/lift`, { holdId: aheadHold }, { authorisedBy: "State office" });
    expect(now.status).toBe(422);
    const [error] = await errorsOf(now);
    expect(error.field).toBe("liftedAt");
    expect(error.message).toMatch(/^The lift cannot come before the hold was placed, at \d{4}-\d{2}-\d{2} \d{2}:\d{2} \(America\/New_York\), and it is only /);
    // Nothing was stored: the hold is in force (invariant).
    expect((await Hold.findByPk(Number(aheadHold)))!.liftedAt).toBeNull();
  });

  it("refuses a find (and a basket load) more than 5 minutes ahead of the server's clock, naming foundAt, and stores nothing", async () => {
    const holdsBefore = await Hold.count({ where: { projectId } });
    const ahead = new Date(Date.now() + 10 * 60_000).toISOString();
    const logged = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "cultural", description: "Shell bead from the future", cell: inside[17], foundAt: ahead });
    expect(logged.status).toBe(422);
    expect((await errorsOf(logged))[0]).toMatchObject({ field: "foundAt" });
    expect(await Hold.count({ where: { projectId } })).toBe(holdsBefore);
    const findsBefore = await Find.count({ where: { projectId } });
    const basket = await postJson(basketsAction as never, "resource-monitor", `${base()}/finds/baskets`, {}, { lines: [{ category: "modern-debris", description: "Aluminium cans", count: 2 }], cell: inside[3], foundAt: ahead });
    expect(basket.status).toBe(422);
    expect((await errorsOf(basket))[0]).toMatchObject({ field: "foundAt" });
    expect(await Find.count({ where: { projectId } })).toBe(findsBefore);
  });

  it("reads the page's lift time in the project's time zone", async () => {
    const logged = await postJson(findsAction as never, "resource-monitor", `${base()}/finds`, {}, { category: "cultural", description: "Bead", cell: inside[14], foundAt: "2026-11-13T08:00:00-05:00" });
    const pageHold = ((await logged.json()) as { hold: { id: number } }).hold.id;
    const answer = await postPage(holdsPage as never, "resource-monitor", `/projects/${projectId}/holds`, { intent: "lift", holdId: String(pageHold), authorisedBy: "State office", liftedAt: "2026-11-13T10:05" });
    expect(answer.status).toBe(200);
    // 10:05 in New York in November is 15:05 UTC (EST, UTC−5: published zone rule).
    expect((await Hold.findByPk(pageHold))!.liftedAt!.toISOString()).toBe("2026-11-13T15:05:00.000Z");
  });
});
