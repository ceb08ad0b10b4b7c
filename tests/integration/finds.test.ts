import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import sharp from "sharp";
import { closeSequelize } from "../../db/connection.server";
import { cellCentroid, cellLabel, parseCellLabel, type CellGrid } from "../../shared/grid/cell-grid";
import { METRES_PER_US_SURVEY_FOOT } from "../../shared/units";
import { GRID, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { AuditEvent, DiveTeam, FindPhoto, FindSequence, Hold, HoldCell, HoldNotice, Project, Zone, getSequelize, type Role } from "~/lib/db.server";
import { listObjectKeys } from "~/lib/storage/storage.server";
import { action as assignAction } from "~/routes/api.projects.$projectId.assignments";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { action as findsAction, loader as findsLoader } from "~/routes/api.projects.$projectId.finds";
import { loader as findLoader } from "~/routes/api.projects.$projectId.finds.$findId";
import { loader as csvLoader } from "~/routes/api.projects.$projectId.finds[.]csv";
import { action as projectAction } from "~/routes/api.projects.$projectId";
import { loader as printableCatalogue } from "~/routes/projects.$projectId.finds.catalogue";
import { action as custodyAction } from "~/routes/api.projects.$projectId.finds.$findId.custody";
import { action as photosAction } from "~/routes/api.projects.$projectId.finds.$findId.photos";
import { loader as photoLoader } from "~/routes/api.projects.$projectId.finds.$findId.photos.$photoId";
import { loader as holdsLoader } from "~/routes/api.projects.$projectId.holds";
import { action as liftAction } from "~/routes/api.projects.$projectId.holds.$holdId.lift";
import { addMember, makeUser, requestAs } from "./helpers";

// Finds through the API as each role meets them: the catalogue number, confidential locations
// (absent, not null), photos through the object store (metadata stripped, refusals storing
// nothing, bytes only after the find's permission check), custody, and the stop-work hold that
// refuses assignments until it is lifted.

afterAll(closeSequelize);

let projectId: number;
let otherProjectId: number;
const users = new Map<Role | "stranger" | "admin", number>();
let grid: CellGrid;
const inside: string[] = [];
const DATE = "2026-06-10";

type Handler = (args: never) => Promise<Response>;
const call = async (handler: Handler, who: Role | "stranger" | "admin", path: string, params: Record<string, string> = {}, init: RequestInit = {}) => {
  const request = await requestAs(users.get(who)!, path, init);
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never);
};
const postJson = (handler: Handler, who: Role | "admin", path: string, params: Record<string, string>, body: unknown) =>
  call(handler, who, path, params, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
const base = () => `/api/projects/${projectId}`;
const logFind = (who: Role, body: unknown) => postJson(findsAction as never, who, `${base()}/finds`, {}, body);
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;
const uploadPhoto = (who: Role, findId: number, bytes: Uint8Array, fileName: string, type = "image/jpeg") => {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)], { type }), fileName);
  return call(photosAction as never, who, `${base()}/finds/${findId}/photos`, { findId: String(findId) }, { method: "POST", body: form });
};
const objectsOfProject = () => listObjectKeys(`projects/${projectId}/`);

/** A JPEG whose EXIF holds a GPS position (29° 12′ 30″ N, 82° 3′ 0″ W) and a camera. */
async function photoWithGps(): Promise<Buffer> {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: "#6b8e5a" } })
    .jpeg()
    .withExif({ IFD0: { Make: "Fieldcam", Model: "FC-2" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: "29/1 12/1 30/1", GPSLongitudeRef: "W", GPSLongitude: "82/1 3/1 0/1" } })
    .toBuffer();
}

const CULTURAL = { category: "cultural", description: "Chert projectile point, stemmed, tip missing", material: "chert", condition: "tip broken, old break", depthBelowSurface: 14.5, depthInMuck: 1.2, foundAt: "2026-06-09T10:42:00-04:00", finder: "Test diver", fieldTag: "T-001" };

beforeAll(async () => {
  const make = async (label: string) =>
    Project.create({
      name: `Finds test ${label}`, slug: `finds-${label}-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
      gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
      tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 2, findCataloguePrefix: "TFS",
    });
  const project = await make("main");
  projectId = project.id;
  otherProjectId = (await make("other")).id;
  for (const [index, zone] of ZONES.entries()) await Zone.create({ projectId, name: zone.name, sortOrder: index, polygonGeoJson: JSON.stringify(zone.polygon) });
  await DiveTeam.create({ projectId, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "A", email: "finds-heron-a@example.org", duty: "diver" }, { name: "B", email: "finds-heron-b@example.org", duty: "tender" }] });
  for (const role of ["manager", "resource-monitor", "dive-supervisor", "viewer", "outreach"] as Role[]) {
    const user = await makeUser(`finds-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
  users.set("stranger", (await makeUser("finds-stranger")).id);
  users.set("admin", (await makeUser("finds-admin", { isSiteAdmin: true })).id);
  const payload = (await (await call(cellsLoader as never, "viewer", `${base()}/cells`)).json()) as { grid: CellGrid; status: number[] };
  grid = payload.grid;
  payload.status.forEach((code, index) => {
    if (code >= 0) inside.push(cellLabel(Math.floor(index / grid.cols) + grid.firstRow, (index % grid.cols) + grid.firstCol));
  });
});

describe("logging a cultural find", () => {
  let findId: number;
  let holdId: number;
  let heldCells: string[];
  let cell: string;

  it("gives the next catalogue number and places a hold on the cells within 50 m (201)", async () => {
    cell = inside[Math.floor(inside.length / 2)];
    const response = await logFind("resource-monitor", { ...CULTURAL, cell });
    expect(response.status).toBe(201);
    const body = await response.json();
    // Prefix, the project's local year of foundAt (2026 in New York), first sequence.
    expect(body.catalogueNumber).toBe("TFS-2026-0001");
    findId = body.id;
    holdId = body.hold.id;
    heldCells = body.hold.cells;
    expect(heldCells).toContain(cell);
    expect(body.notices).toEqual([expect.stringContaining(`Hold #${holdId} stops work in ${heldCells.length} cells`)]);
    // Geometry check, independent of the search: the radius is 50 m (half the permit's 100-metre
    // diameter) = 50 / (1200/3937) US ft. Every held cell's centre lies within r + half a cell
    // diagonal of the find's cell centre; every cell of the limit whose centre lies within
    // r − half a diagonal is held.
    const radiusFt = 50 / METRES_PER_US_SURVEY_FOOT;
    const halfDiagonal = (GRID.cellSizeFt * Math.SQRT2) / 2;
    const at = parseCellLabel(cell)!;
    const [cx, cy] = cellCentroid(grid, at.row, at.col);
    const distance = (label: string) => {
      const { row, col } = parseCellLabel(label)!;
      const [x, y] = cellCentroid(grid, row, col);
      return Math.hypot(x - cx, y - cy);
    };
    for (const label of heldCells) expect(distance(label), label).toBeLessThanOrEqual(radiusFt + halfDiagonal);
    for (const label of inside) if (distance(label) <= radiusFt - halfDiagonal) expect(heldCells, label).toContain(label);
    expect(heldCells.length).toBeGreaterThan(1);
    expect(await HoldNotice.count({ where: { holdId } })).toBe(1);
  });

  it("numbers the next find 0002 and never hands a number out twice", async () => {
    const response = await logFind("manager", { category: "faunal", description: "Deer antler tine", taxon: "white-tailed deer", element: "antler", foundAt: "2026-06-09T11:00:00-04:00", cell: inside[0] });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.catalogueNumber).toBe("TFS-2026-0002");
    expect(body.hold).toBeUndefined(); // a faunal find holds nothing
    expect((await FindSequence.findOne({ where: { projectId, year: 2026 } }))?.lastSequence).toBe(2);
  });

  it("answers a repeated idempotency key with the first find, storing nothing new", async () => {
    const body = { category: "modern-debris", description: "Aluminium can", foundAt: "2026-06-09T12:00:00-04:00", idempotencyKey: `key-${randomBytes(6).toString("hex")}` };
    const first = await logFind("resource-monitor", body);
    const again = await logFind("resource-monitor", body);
    expect(first.status).toBe(201);
    expect(again.status).toBe(200);
    expect((await again.json()).id).toBe((await first.json()).id);
  });

  it("refuses bad input with 422 naming the field", async () => {
    const cases: Array<[unknown, string]> = [
      [{ ...CULTURAL, category: "treasure", cell }, "category"],
      [{ ...CULTURAL, cell, foundAt: "yesterday" }, "foundAt"],
      [{ ...CULTURAL, cell: "ZZ999" }, "cell"],
      [{ ...CULTURAL, cell: undefined }, "cell"],
      [{ ...CULTURAL, cell, depthInMuck: -1 }, "depthInMuck"],
      [{ ...CULTURAL, cell, taxon: "deer" }, "taxon"],
      [{ ...CULTURAL, cell, diveId: 999999 }, "diveId"],
    ];
    for (const [body, field] of cases) {
      const response = await logFind("resource-monitor", body);
      expect([404, 422], field).toContain(response.status);
      expect((await errorsOf(response)).map((error) => error.field), field).toContain(field);
    }
  });

  it("shows locations to the monitor and leaves them out entirely for a viewer; outreach and strangers get nothing", async () => {
    const monitor = (await (await call(findsLoader as never, "resource-monitor", `${base()}/finds`)).json()).finds.find((item: { id: number }) => item.id === findId);
    expect(monitor).toMatchObject({ catalogueNumber: "TFS-2026-0001", cell, depthBelowSurface: 14.5, depthInMuck: 1.2 });
    const viewerAnswer = await call(findsLoader as never, "viewer", `${base()}/finds`);
    expect(viewerAnswer.status).toBe(200);
    const viewerFinds = (await viewerAnswer.json()).finds as Array<Record<string, unknown>>;
    const seen = viewerFinds.find((item) => item.id === findId)!;
    expect(seen.catalogueNumber).toBe("TFS-2026-0001");
    for (const key of ["cell", "position", "depthBelowSurface", "depthInMuck", "diveId", "team"]) {
      for (const item of viewerFinds) expect(Object.keys(item), key).not.toContain(key);
    }
    const detail = (await (await call(findLoader as never, "viewer", `${base()}/finds/${findId}`, { findId: String(findId) })).json()).find;
    expect(Object.keys(detail)).not.toContain("cell");
    expect(Object.keys(detail)).not.toContain("hold");
    expect((await call(findsLoader as never, "outreach", `${base()}/finds`)).status).toBe(403);
    expect((await call(findsLoader as never, "stranger", `${base()}/finds`)).status).toBe(403);
    // A site admin sees locations (the table's "can").
    const admin = (await (await call(findLoader as never, "admin", `${base()}/finds/${findId}`, { findId: String(findId) })).json()).find;
    expect(admin.cell).toBe(cell);
  });

  it("refuses to assign a held cell (409 naming the hold, not the find), and allows it once the monitor lifts the hold", async () => {
    const assign = () => postJson(assignAction as never, "dive-supervisor", `${base()}/assignments`, {}, { date: DATE, team: "Team Heron", cells: [heldCells[0]], hose: "Hose A" });
    const refused = await assign();
    expect(refused.status).toBe(409);
    const answer = await refused.json();
    expect(answer.errors[0].message).toContain(`hold #${holdId}`);
    expect(answer.errors[0].message).not.toContain("TFS-");
    expect(JSON.stringify(answer)).not.toContain("projectile");
    // The dive supervisor sees the hold's cells but not its find.
    const holds = (await (await call(holdsLoader as never, "dive-supervisor", `${base()}/holds`)).json()).holds;
    expect(holds[0]).toEqual({ id: holdId, cells: heldCells, placedAt: expect.any(String), lifted: false });

    const lift = (who: Role, body: unknown) => postJson(liftAction as never, who, `${base()}/holds/${holdId}/lift`, { holdId: String(holdId) }, body);
    expect((await lift("dive-supervisor", { authorisedBy: "Someone" })).status).toBe(403);
    const missing = await lift("resource-monitor", {});
    expect(missing.status).toBe(422);
    expect((await errorsOf(missing))[0].field).toBe("authorisedBy");
    expect((await lift("resource-monitor", { authorisedBy: "R. Okafor, state historic-preservation office", note: "by phone" })).status).toBe(204);
    expect((await assign()).status).toBe(201);
    expect(await AuditEvent.count({ where: { projectId, action: "hold-lifted" } })).toBe(1);
  });

  it("waits for a hold being placed that instant and refuses the cell, never slipping past it (409)", async () => {
    // A find being logged holds the project row's lock while it places its hold; an assignment of
    // a cell of that hold, asked in the same instant, must wait and then see it. (Computed: before
    // the assignment took the same lock, it checked holds while the find's transaction was still
    // open, saw none, and stored the assignment: 201.)
    const target = heldCells[1] ?? heldCells[0]!;
    const { row, col } = parseCellLabel(target)!;
    let assigned: Promise<Response> | null = null;
    let placedHoldId = 0;
    await getSequelize().transaction(async (transaction) => {
      await Project.findByPk(projectId, { lock: transaction.LOCK.UPDATE, transaction });
      assigned = postJson(assignAction as never, "dive-supervisor", `${base()}/assignments`, {}, { date: "2026-06-11", team: "Team Heron", cells: [target], hose: "Hose A" });
      await new Promise((resolve) => setTimeout(resolve, 400));
      const hold = await Hold.create({ projectId, findId, radiusM: 50, radiusSource: "race test", placedAt: new Date(), liftedAt: null }, { transaction });
      await HoldCell.create({ holdId: hold.id, projectId, row, col, label: target }, { transaction });
      placedHoldId = hold.id;
    });
    const answer = await assigned!;
    expect(answer.status).toBe(409);
    expect((await errorsOf(answer))[0]!.message).toContain(`hold #${placedHoldId}`);
    await Hold.update({ liftedAt: new Date(), authorisedBy: "race test" }, { where: { id: placedHoldId } });
  });

  it("records a handover and shows the new holder and place", async () => {
    const response = await postJson(custodyAction as never, "resource-monitor", `${base()}/finds/${findId}/custody`, { findId: String(findId) }, {
      fromName: "Test diver", toName: "Site store keeper", place: "Site store, locker 2", purpose: "to-site-store", handedAt: "2026-06-09T15:00:00-04:00", receiverSignature: "Site store keeper",
    });
    expect(response.status).toBe(201);
    expect((await response.json()).status).toBe("site-store");
    const detail = (await (await call(findLoader as never, "viewer", `${base()}/finds/${findId}`, { findId: String(findId) })).json()).find;
    expect(detail.currentHolder).toEqual({ name: "Site store keeper", place: "Site store, locker 2" });
    expect(detail.custody).toHaveLength(1);
    const early = await postJson(custodyAction as never, "resource-monitor", `${base()}/finds/${findId}/custody`, { findId: String(findId) }, {
      fromName: "A", toName: "B", place: "C", purpose: "to-state-lab", handedAt: "2026-06-01T15:00:00-04:00", receiverSignature: "B",
    });
    expect(early.status).toBe(422);
    expect((await errorsOf(early))[0].field).toBe("handedAt");
  });

  describe("photos", () => {
    let photoId: number;

    it("stores a photo without its EXIF GPS, keeping the position in the record for location roles only", async () => {
      const original = await photoWithGps();
      expect((await sharp(original).metadata()).exif).toBeDefined(); // negative control: the upload does carry EXIF
      const response = await uploadPhoto("resource-monitor", findId, original, "IMG_0001.JPG");
      expect(response.status).toBe(201);
      photoId = (await response.json()).id;
      const stored = await call(photoLoader as never, "resource-monitor", `${base()}/finds/${findId}/photos/${photoId}`, { findId: String(findId), photoId: String(photoId) });
      expect(stored.status).toBe(200);
      expect(stored.headers.get("Content-Type")).toBe("image/jpeg");
      const bytes = Buffer.from(await stored.arrayBuffer());
      const metadata = await sharp(bytes).metadata();
      expect(metadata.exif).toBeUndefined();
      expect(bytes.includes(Buffer.from("GPS"))).toBe(false);
      expect(bytes.includes(Buffer.from("Fieldcam"))).toBe(false);
      expect([metadata.width, metadata.height]).toEqual([640, 480]);
      const thumb = await call(photoLoader as never, "viewer", `${base()}/finds/${findId}/photos/${photoId}?size=thumb`, { findId: String(findId), photoId: String(photoId) });
      expect(thumb.status).toBe(200);
      expect((await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()).width).toBe(320);
      // 29° 12′ 30″ = 29.208333…°; 82° 3′ W = −82.05° (degrees + minutes/60 + seconds/3600).
      const monitorView = (await (await call(findLoader as never, "resource-monitor", `${base()}/finds/${findId}`, { findId: String(findId) })).json()).find;
      expect(monitorView.photos[0].exif.latitude).toBeCloseTo(29 + 12 / 60 + 30 / 3600, 9);
      expect(monitorView.photos[0].exif.longitude).toBeCloseTo(-82.05, 9);
      const viewerView = (await (await call(findLoader as never, "viewer", `${base()}/finds/${findId}`, { findId: String(findId) })).json()).find;
      expect(Object.keys(viewerView.photos[0])).not.toContain("exif");
    });

    it("never sends the bytes to a role that may not see the find, another project's URL or a stranger", async () => {
      for (const who of ["outreach", "stranger"] as const) {
        const response = await call(photoLoader as never, who, `${base()}/finds/${findId}/photos/${photoId}`, { findId: String(findId), photoId: String(photoId) });
        expect(response.status, who).toBe(403);
        expect(response.headers.get("Content-Type"), who).toContain("application/json");
        const text = await response.text();
        expect(text.includes("JFIF") || text.includes("\u00ff\u00d8"), who).toBe(false);
      }
      const request = await requestAs(users.get("resource-monitor")!, `/api/projects/${otherProjectId}/finds/${findId}/photos/${photoId}`);
      const elsewhere = await (photoLoader as Handler)({ request, params: { projectId: String(otherProjectId), findId: String(findId), photoId: String(photoId) }, context: {} } as never);
      expect(elsewhere.status).toBe(403); // not a member of the other project
      const admin = await requestAs(users.get("admin")!, `/api/projects/${otherProjectId}/finds/${findId}/photos/${photoId}`);
      const wrongProject = await (photoLoader as Handler)({ request: admin, params: { projectId: String(otherProjectId), findId: String(findId), photoId: String(photoId) }, context: {} } as never);
      expect(wrongProject.status).toBe(404);
      expect(wrongProject.headers.get("Content-Type")).toContain("application/json");
    });

    it("refuses a 30 MB photo, a file that is not an image and an image with a wrong extension, storing nothing", async () => {
      const rowsBefore = await FindPhoto.count({ where: { findId } });
      const objectsBefore = await objectsOfProject();
      const thirtyMb = Buffer.alloc(30 * 1024 * 1024, 0xab);
      thirtyMb.set(await photoWithGps(), 0);
      const tooLarge = await uploadPhoto("resource-monitor", findId, thirtyMb, "big.jpg");
      expect(tooLarge.status).toBe(413);
      expect((await errorsOf(tooLarge))[0]).toMatchObject({ field: "file", message: expect.stringContaining("20 MB") });

      const notImage = await uploadPhoto("resource-monitor", findId, new TextEncoder().encode("easting,northing,depth\n1,2,3\n"), "notes.jpg", "text/plain");
      expect(notImage.status).toBe(422);
      expect((await errorsOf(notImage))[0]).toMatchObject({ field: "file", message: expect.stringContaining("not an image") });

      const png = await sharp({ create: { width: 32, height: 32, channels: 3, background: "#000" } }).png().toBuffer();
      const misnamed = await uploadPhoto("resource-monitor", findId, png, "scale-and-tag.jpg");
      expect(misnamed.status).toBe(422);
      expect((await errorsOf(misnamed))[0].message).toMatch(/PNG image, but its name ends in "\.jpg"/);

      expect(await FindPhoto.count({ where: { findId } })).toBe(rowsBefore);
      expect((await objectsOfProject()).sort()).toEqual(objectsBefore.sort());
      // Control: the same PNG correctly named is taken.
      expect((await uploadPhoto("resource-monitor", findId, png, "scale-and-tag.png")).status).toBe(201);
      expect((await objectsOfProject()).length).toBe(objectsBefore.length + 2);
    });

    it("lets only finds.log roles add photos", async () => {
      expect((await uploadPhoto("viewer", findId, await photoWithGps(), "a.jpg")).status).toBe(403);
      expect((await uploadPhoto("dive-supervisor", findId, await photoWithGps(), "a.jpg")).status).toBe(403);
    });
  });
});

describe("the catalogue CSV with locations", () => {
  it("is for location roles only, logged in the audit log, and formula-safe", async () => {
    expect((await logFind("resource-monitor", { category: "modern-debris", description: "=HYPERLINK(\"x\")", foundAt: "2026-06-11T08:00:00-04:00", cell: inside[1] })).status).toBe(201);
    expect((await call(csvLoader as never, "viewer", `${base()}/finds.csv`)).status).toBe(403);
    expect((await call(csvLoader as never, "dive-supervisor", `${base()}/finds.csv`)).status).toBe(403);
    const before = await AuditEvent.count({ where: { projectId, action: "finds-exported" } });
    const response = await call(csvLoader as never, "resource-monitor", `${base()}/finds.csv`);
    expect(response.status).toBe(200);
    expect(response.headers.get("Content-Type")).toContain("text/csv");
    const text = await response.text();
    expect(text).toContain("TFS-2026-0001");
    expect(text).toContain(`,"${inside[1]}",`);
    // OWASP CSV injection guidance: a cell starting with "=" is prefixed so no spreadsheet runs it.
    expect(text).not.toMatch(/(^|,)"?=HYPERLINK/m);
    expect(text).toContain(`"'=HYPERLINK(""x"")"`);
    expect(await AuditEvent.count({ where: { projectId, action: "finds-exported" } })).toBe(before + 1);
  });

  it("the printable catalogue likewise: refused to a viewer, and each printing audited", async () => {
    const refused = await call(printableCatalogue as never, "viewer", `/projects/${projectId}/finds/catalogue`).catch((error: unknown) => error);
    expect((refused as Response).status).toBe(403);
    const before = await AuditEvent.count({ where: { projectId, action: "finds-exported" } });
    const sheet = (await call(printableCatalogue as never, "manager", `/projects/${projectId}/finds/catalogue`)) as unknown as { finds: Array<{ catalogueNumber: string; cell?: string }> };
    expect(sheet.finds[0]).toMatchObject({ catalogueNumber: "TFS-2026-0001", cell: expect.any(String) });
    expect(await AuditEvent.count({ where: { projectId, action: "finds-exported" } })).toBe(before + 1);
  });
});

describe("the project's finds settings", () => {
  it("set the catalogue prefix and the hold radius with its source (manager), used by the next find", async () => {
    const patch = (body: unknown) => call(projectAction as never, "manager", base(), {}, { method: "PATCH", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
    const bad = await patch({ finds: { cataloguePrefix: "no spaces!", holdRadiusM: 0 } });
    expect(bad.status).toBe(422);
    expect((await errorsOf(bad)).map((error) => error.field).sort()).toEqual(["finds.cataloguePrefix", "finds.holdRadiusM"]);
    expect((await patch({ finds: { cataloguePrefix: "zx", holdRadiusM: 10, holdRadiusSource: "Test permit condition 7" } })).status).toBe(200);
    const cell = inside[Math.floor(inside.length / 3)];
    const logged = await (await logFind("resource-monitor", { category: "cultural", description: "Sherd", cell, foundAt: "2026-07-01T09:00:00-04:00" })).json();
    expect(logged.catalogueNumber).toMatch(/^ZX-2026-\d{4}$/);
    // 10 m = 10 / (1200/3937) US ft ≈ 32.8 ft on 20 ft cells: every held cell centre within r + half a diagonal.
    const at = parseCellLabel(cell)!;
    const [cx, cy] = cellCentroid(grid, at.row, at.col);
    for (const label of logged.hold.cells) {
      const { row, col } = parseCellLabel(label)!;
      const [x, y] = cellCentroid(grid, row, col);
      expect(Math.hypot(x - cx, y - cy), label).toBeLessThanOrEqual(10 / METRES_PER_US_SURVEY_FOOT + (GRID.cellSizeFt * Math.SQRT2) / 2);
    }
    const holds = (await (await call(holdsLoader as never, "resource-monitor", `${base()}/holds`)).json()).holds;
    expect(holds.find((hold: { id: number }) => hold.id === logged.hold.id)).toMatchObject({ radiusM: 10, radiusSource: "Test permit condition 7" });
    expect((await postJson(liftAction as never, "manager", `${base()}/holds/${logged.hold.id}/lift`, { holdId: String(logged.hold.id) }, { authorisedBy: "Test" })).status).toBe(204);
  });
});

describe("human remains", () => {
  it("place a hold that must be told to the medical examiner, the state archaeologist and the historic-preservation office", async () => {
    const response = await logFind("resource-monitor", { category: "human-remains", description: "Fragment of long bone, possibly human", cell: inside[inside.length - 1], foundAt: "2026-06-10T09:00:00-04:00" });
    expect(response.status).toBe(201);
    const { hold } = await response.json();
    const notices = await HoldNotice.findAll({ where: { holdId: hold.id } });
    expect(notices.map((notice) => notice.agency).sort()).toEqual(["historic-preservation-office", "medical-examiner", "state-archaeologist"]);
  });
});
