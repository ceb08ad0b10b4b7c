import { randomBytes, randomUUID } from "node:crypto";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { GRID, WORK_LIMIT } from "../../sample-data/scenario";
import { cellLabel, type CellGrid } from "../../shared/grid/cell-grid";
import {
  DewateringShift, Dive, DiveTeam, Find, FindCustody, FindPhoto, GeotextileTube, Haul, HaulPhoto, IdempotencyKey, JarTest, JarTestPhoto, Project, WaterQualityReadingPhoto, SedimentSample, TubeFill, WaterQualityReading, WildlifeSighting, Zone,
} from "~/lib/db.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { purgeIdempotencyKeys } from "~/lib/api/idempotency.server";
import { addHaulSite } from "~/models/hauls.server";
import { action as assignAction } from "~/routes/api.projects.$projectId.assignments";
import { loader as cellsLoader } from "~/routes/api.projects.$projectId.cells";
import { action as divesAction } from "~/routes/api.projects.$projectId.dives";
import { action as shiftsAction } from "~/routes/api.projects.$projectId.dewatering.shifts";
import { action as tubesAction } from "~/routes/api.projects.$projectId.dewatering.tubes";
import { action as tubeAction, loader as tubeLoader } from "~/routes/api.projects.$projectId.dewatering.tubes.$tubeId";
import { action as fillsAction } from "~/routes/api.projects.$projectId.dewatering.tubes.$tubeId.fills";
import { action as haulsAction } from "~/routes/api.projects.$projectId.hauls";
import { action as haulPhotosAction } from "~/routes/api.projects.$projectId.hauls.$haulId.photos";
import { action as jarTestsAction } from "~/routes/api.projects.$projectId.dewatering.jar-tests";
import { action as jarPhotosAction } from "~/routes/api.projects.$projectId.dewatering.jar-tests.$jarTestId.photos";
import { action as readingsAction } from "~/routes/api.projects.$projectId.water-quality.readings";
import { action as readingPhotosAction } from "~/routes/api.projects.$projectId.water-quality.readings.$readingId.photos";
import { action as stationsAction } from "~/routes/api.projects.$projectId.water-quality.stations";
import { action as sightingsAction } from "~/routes/api.projects.$projectId.wildlife.sightings";
import { action as findsAction } from "~/routes/api.projects.$projectId.finds";
import { action as basketsAction } from "~/routes/api.projects.$projectId.finds.baskets";
import { action as holdNoticesAction } from "~/routes/api.projects.$projectId.holds.$holdId.notices";
import { action as liftAction } from "~/routes/api.projects.$projectId.holds.$holdId.lift";
import { action as photosAction } from "~/routes/api.projects.$projectId.finds.$findId.photos";
import { action as custodyAction } from "~/routes/api.projects.$projectId.finds.$findId.custody";
import { action as findAction, loader as findLoader } from "~/routes/api.projects.$projectId.finds.$findId";
import { action as samplesAction } from "~/routes/api.projects.$projectId.sediment-samples";
import { action as rulesAction } from "~/routes/api.projects.$projectId.water-quality.rules";
import { action as noticeAction } from "~/routes/api.projects.$projectId.stop-work.$eventId.notification";
import { action as resumeAction } from "~/routes/api.projects.$projectId.stop-work.$eventId.resume";
import { Hold, StopWorkEvent } from "~/lib/db.server";
import { addMember, makeUser, requestAs } from "./helpers";

// Exactly-once field writes: every field API takes an Idempotency-Key header; a key sent twice at
// once or again later stores one record and answers the first answer; a key used for another entry
// is refused; a key is its user's own.

afterAll(closeSequelize);

type Handler = (args: never) => Promise<Response>;
type Who = "first" | "second";
let projectId: number;
const users = new Map<Who, number>();
let cell = "";
let tubeId = 0;
let findId = 0;
let haulId = 0;
let jarTestId = 0;
let readingId = 0;
let serial = 0;
const DATE = "2026-11-20";
const base = () => `/api/projects/${projectId}`;

async function send(handler: Handler, who: Who, path: string, params: Record<string, string>, body: BodyInit, headers: Record<string, string>): Promise<Response> {
  const request = await requestAs(users.get(who)!, path, { method: "POST", body, headers });
  return handler({ request, params: { projectId: String(projectId), ...params }, context: {} } as never);
}
const sendJson = (handler: Handler, who: Who, path: string, params: Record<string, string>, body: unknown, key?: string) =>
  send(handler, who, path, params, JSON.stringify(body), { "Content-Type": "application/json", ...(key === undefined ? {} : { "Idempotency-Key": key }) });

/** A small JPEG of one colour: a different colour is a different photo (colours far enough apart that the JPEG bytes differ too). */
const jpeg = (colour: string) => sharp({ create: { width: 64, height: 48, channels: 3, background: colour } }).jpeg().toBuffer();

interface FieldApi {
  name: string;
  /** Sends one entry; `variant` changes it so it is a different entry (and passes the record's own unique rules). */
  post(who: Who, key: string, variant: number): Promise<Response>;
  /** The records of this kind stored on the project. */
  count(): Promise<number>;
}

const json = (name: string, handler: Handler, path: () => string, params: () => Record<string, string>, body: (variant: number) => unknown, model: { count(options: unknown): Promise<number> }): FieldApi => ({
  name,
  post: (who, key, variant) => sendJson(handler, who, path(), params(), body(variant), key),
  count: () => model.count({ where: { projectId } }),
});

/** A photo upload: a different colour is a different entry. */
const photo = (name: string, handler: Handler, path: () => string, params: () => Record<string, string>, model: { count(options: unknown): Promise<number> }): FieldApi => ({
  name,
  async post(who, key, variant) {
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array(await jpeg(`#${((0x102030 + variant * 0x0b1713) & 0xffffff).toString(16).padStart(6, "0")}`))], { type: "image/jpeg" }), "photo.jpg");
    return send(handler, who, path(), params(), form, { "Idempotency-Key": key });
  },
  count: () => model.count({ where: { projectId } }),
});

const APIS: FieldApi[] = [
  json("POST dives", divesAction as never, () => `${base()}/dives`, () => ({}), (variant) => ({ date: DATE, team: "Team Heron", diver: "Ana Reyes", bottomMinutes: 30 + variant, maxDepth: 12, cells: [cell] }), Dive),
  json("POST dewatering/shifts", shiftsAction as never, () => `${base()}/dewatering/shifts`, () => ({}), (variant) => ({ date: DATE, start: "07:00", end: "15:00", pumpHours: 8, slurryFlow: { value: 900 + variant, unit: "gpm" }, solidsByWeight: 0.2, solidsSpecificGravity: 2.6 }), DewateringShift),
  json("POST dewatering/tubes", tubesAction as never, () => `${base()}/dewatering/tubes`, () => ({}), (variant) => ({ name: `T-${variant}`, circumference: 30, length: 100, capacityDryMassPerLength: 5 }), GeotextileTube),
  json("POST dewatering/tubes/<id>/fills", fillsAction as never, () => `${base()}/dewatering/tubes/${tubeId}/fills`, () => ({ tubeId: String(tubeId) }), (variant) => ({ date: DATE, drySolids: 1 + variant / 1000 }), TubeFill),
  json("POST hauls", haulsAction as never, () => `${base()}/hauls`, () => ({}), (variant) => ({ date: DATE, ticketNumber: `TK-${variant}`, truck: "Truck 3", site: "Tallgrass Farm", load: { value: 20, unit: "short-ton" }, cakeSolidsByWeight: 0.3 }), Haul),
  json("POST water-quality/readings", readingsAction as never, () => `${base()}/water-quality/readings`, () => ({}), (variant) => ({ station: "BG-1", takenAt: "2026-11-20T09:00:00-05:00", value: 5 + variant / 100, unit: "NTU" }), WaterQualityReading),
  json("POST wildlife/sightings", sightingsAction as never, () => `${base()}/wildlife/sightings`, () => ({}), (variant) => ({ species: "Manatee", seenAt: "2026-11-20T10:00:00-05:00", distance: 500 + variant, observer: "Ned Carrow" }), WildlifeSighting),
  json("POST finds", findsAction as never, () => `${base()}/finds`, () => ({}), (variant) => ({ category: "modern-debris", description: `Aluminium can ${variant}`, foundAt: "2026-11-20T11:00:00-05:00" }), Find),
  json("POST finds/baskets", basketsAction as never, () => `${base()}/finds/baskets`, () => ({}), (variant) => ({ lines: [{ category: "modern-debris", description: `Bottle caps ${variant}`, count: 3 + variant }], foundAt: "2026-11-20T11:30:00-05:00" }), Find),
  json("POST finds/<id>/custody", custodyAction as never, () => `${base()}/finds/${findId}/custody`, () => ({ findId: String(findId) }), (variant) => ({ fromName: "Ana Reyes", toName: `Keeper ${variant}`, place: "Site store", purpose: "to-site-store", handedAt: "2026-11-20T15:00:00-05:00", receiverSignature: `Keeper ${variant}` }), FindCustody),
  json("POST sediment-samples", samplesAction as never, () => `${base()}/sediment-samples`, () => ({}), (variant) => ({ date: DATE, percentSolids: 9, dryBulkDensity: { value: 15, unit: "lb/ft3" }, totalNitrogenMgKg: 12_000, totalPhosphorusMgKg: 800, lab: "Bayline Laboratories", reportNumber: `BL-${variant}` }), SedimentSample),
  json("POST dewatering/jar-tests", jarTestsAction as never, () => `${base()}/dewatering/jar-tests`, () => ({}), (variant) => ({ date: DATE, polymer: { product: "Cationic emulsion", benchStockPercent: 0.1 }, jars: [{ doseMgPerL: 5 + variant / 100, settlingMinutes: 10, clarity: "clear" }] }), JarTest),
  photo("POST finds/<id>/photos", photosAction as never, () => `${base()}/finds/${findId}/photos`, () => ({ findId: String(findId) }), FindPhoto),
  photo("POST hauls/<id>/photos", haulPhotosAction as never, () => `${base()}/hauls/${haulId}/photos`, () => ({ haulId: String(haulId) }), HaulPhoto),
  photo("POST dewatering/jar-tests/<id>/photos", jarPhotosAction as never, () => `${base()}/dewatering/jar-tests/${jarTestId}/photos`, () => ({ jarTestId: String(jarTestId) }), JarTestPhoto),
  photo("POST water-quality/readings/<id>/photos", readingPhotosAction as never, () => `${base()}/water-quality/readings/${readingId}/photos`, () => ({ readingId: String(readingId) }), WaterQualityReadingPhoto),
];

beforeAll(async () => {
  const project = await Project.create({
    name: "Exactly-once test", slug: `idem-${randomBytes(4).toString("hex")}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
    gridOriginE: GRID.originEastingFt, gridOriginN: GRID.originNorthingFt, cellSize: GRID.cellSizeFt, rasterResolution: 1, maxEdge: 40,
    tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, workLimitGeoJson: JSON.stringify(WORK_LIMIT), minTeamSize: 2, findCataloguePrefix: "IDM",
  });
  projectId = project.id;
  await Zone.create({ projectId, name: "Zone A", sortOrder: 0, polygonGeoJson: JSON.stringify(WORK_LIMIT) });
  await DiveTeam.create({ projectId, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "Ana Reyes", email: "idem-a@example.org", duty: "diver" }, { name: "Bo Lind", email: "idem-b@example.org", duty: "tender" }] });
  for (const who of ["first", "second"] as Who[]) {
    const user = await makeUser(`idem-${who}`);
    await addMember(user.id, projectId, "manager");
    users.set(who, user.id);
  }
  const cells = (await (await cellsLoader({ request: await requestAs(users.get("first")!, `${base()}/cells`), params: { projectId: String(projectId) }, context: {} } as never)).json()) as { grid: CellGrid; status: number[] };
  const index = cells.status.findIndex((code) => code >= 0);
  cell = cellLabel(Math.floor(index / cells.grid.cols) + cells.grid.firstRow, (index % cells.grid.cols) + cells.grid.firstCol);
  expect((await sendJson(assignAction as never, "first", `${base()}/assignments`, {}, { date: DATE, team: "Team Heron", cells: [cell], hose: "Hose A" })).status).toBe(201);
  expect((await sendJson(stationsAction as never, "first", `${base()}/water-quality/stations`, {}, { name: "BG-1", kind: "background" })).status).toBe(201);
  await addHaulSite(presentProject(project), { id: users.get("first")! } as never, { name: "Tallgrass Farm", kind: "reuse", permitNumber: "AG-2026-114" });
  tubeId = (await (await sendJson(tubesAction as never, "first", `${base()}/dewatering/tubes`, {}, { name: "Fill tube", circumference: 30, length: 100, capacityDryMassPerLength: 50 })).json()).tube.id;
  findId = (await (await sendJson(findsAction as never, "first", `${base()}/finds`, {}, { category: "modern-debris", description: "Bottle", foundAt: "2026-11-20T08:00:00-05:00" })).json()).id;
  haulId = (await (await sendJson(haulsAction as never, "first", `${base()}/hauls`, {}, { date: DATE, ticketNumber: "TK-PHOTO", truck: "Truck 3", site: "Tallgrass Farm", load: { value: 20, unit: "short-ton" }, cakeSolidsByWeight: 0.3 })).json()).haul.id;
  jarTestId = (await (await sendJson(jarTestsAction as never, "first", `${base()}/dewatering/jar-tests`, {}, { date: DATE, polymer: { product: "Cationic emulsion", benchStockPercent: 0.1 }, jars: [{ doseMgPerL: 4, settlingMinutes: 10, clarity: "hazy" }] })).json()).id;
  readingId = (await (await sendJson(readingsAction as never, "first", `${base()}/water-quality/readings`, {}, { station: "BG-1", takenAt: "2026-11-20T08:00:00-05:00", value: 4.5, unit: "NTU" })).json()).id;
});

describe.each(APIS)("$name with an Idempotency-Key", (api) => {
  it("stores one record when the same key is sent twice at once; both answers carry it", async () => {
    const key = randomUUID();
    const variant = ++serial;
    const before = await api.count();
    const answers = await Promise.all([api.post("first", key, variant), api.post("first", key, variant)]);
    expect(answers.map((answer) => answer.status).sort()).toEqual([200, 201]);
    const [one, two] = await Promise.all(answers.map((answer) => answer.text()));
    expect(two).toBe(one);
    expect(await api.count()).toBe(before + 1);
    expect(answers.find((answer) => answer.status === 200)!.headers.get("Idempotency-Replayed")).toBe("true");
  });

  it("answers a retry sent later with 200 and the first answer, storing nothing new", async () => {
    const key = `retry-${randomUUID()}`;
    const variant = ++serial;
    const first = await api.post("first", key, variant);
    expect(first.status).toBe(201);
    const firstBody = await first.text();
    const before = await api.count();
    const again = await api.post("first", key, variant);
    expect(again.status).toBe(200);
    expect(await again.text()).toBe(firstBody);
    expect(await api.count()).toBe(before);
  });

  it("refuses the key for a different entry (422 naming the header) and stores nothing", async () => {
    const key = `other-${randomUUID()}`;
    expect((await api.post("first", key, ++serial)).status).toBe(201);
    const before = await api.count();
    const refused = await api.post("first", key, ++serial);
    expect(refused.status).toBe(422);
    const { errors } = (await refused.json()) as { errors: Array<{ field: string; message: string }> };
    expect(errors[0].field).toBe("Idempotency-Key");
    expect(errors[0].message).toMatch(/already used for a different entry/);
    expect(await api.count()).toBe(before);
  });

  it("keeps each user's keys apart: another user's same key stores their own record", async () => {
    const key = `shared-${randomUUID()}`;
    const variant = ++serial;
    const mine = await api.post("first", key, variant);
    expect(mine.status).toBe(201);
    const before = await api.count();
    const theirs = await api.post("second", key, variant + 200);
    expect(theirs.status).toBe(201);
    expect(await theirs.text()).not.toBe(await mine.text());
    expect(await api.count()).toBe(before + 1);
  });
});

describe("the Idempotency-Key header", () => {
  it("is refused when malformed (422 naming the header), before anything is stored", async () => {
    for (const bad of ["", "has space", "x".repeat(101), "ünïcode"]) {
      const before = await Dive.count({ where: { projectId } });
      const response = await sendJson(divesAction as never, "first", `${base()}/dives`, {}, { date: DATE, team: "Team Heron", diver: "Ana Reyes", bottomMinutes: 20, maxDepth: 10, cells: [cell] }, bad);
      expect(response.status, JSON.stringify(bad)).toBe(422);
      expect(((await response.json()) as { errors: Array<{ field: string }> }).errors[0].field).toBe("Idempotency-Key");
      expect(await Dive.count({ where: { projectId } })).toBe(before);
    }
  });

  it("keeps nothing for a refused entry, so the fixed entry may use the same key", async () => {
    const key = randomUUID();
    const refused = await sendJson(divesAction as never, "first", `${base()}/dives`, {}, { date: DATE, team: "Team Heron", diver: "Nobody Known", bottomMinutes: 20, maxDepth: 10, cells: [cell] }, key);
    expect(refused.status).toBe(422);
    expect(await IdempotencyKey.count({ where: { idemKey: key } })).toBe(0);
    const fixed = await sendJson(divesAction as never, "first", `${base()}/dives`, {}, { date: DATE, team: "Team Heron", diver: "Ana Reyes", bottomMinutes: 21, maxDepth: 10, cells: [cell] }, key);
    expect(fixed.status).toBe(201);
    const row = await IdempotencyKey.findOne({ where: { idemKey: key } });
    expect(row?.recordId).toBe(((await fixed.json()) as { dive: { id: number } }).dive.id);
  });

  it("is purged after 30 days by one range delete", async () => {
    const key = `old-${randomUUID()}`;
    expect((await APIS[7].post("first", key, ++serial)).status).toBe(201);
    await IdempotencyKey.update({ createdAt: new Date(Date.now() - 31 * 86_400_000) }, { where: { idemKey: key } });
    expect(await purgeIdempotencyKeys()).toBeGreaterThanOrEqual(1);
    expect(await IdempotencyKey.count({ where: { idemKey: key } })).toBe(0);
  });
});

describe("the entry's author (Firmsand-Entry-User)", () => {
  const sighting = { species: "Manatee", seenAt: "2026-11-20T10:00:00-05:00", distance: 777, observer: "Ned Carrow" };
  const post = (author: number) =>
    send(sightingsAction as never, "first", `${base()}/wildlife/sightings`, {}, JSON.stringify(sighting), { "Content-Type": "application/json", "Idempotency-Key": randomUUID(), "Firmsand-Entry-User": String(author) });

  it("refuses an entry made on the device by another account than the one signed in (409 naming the header), storing nothing", async () => {
    const before = await WildlifeSighting.count({ where: { projectId } });
    const refused = await post(users.get("second")!);
    expect(refused.status).toBe(409);
    expect(((await refused.json()) as { errors: Array<{ field: string }> }).errors[0].field).toBe("Firmsand-Entry-User");
    expect(await WildlifeSighting.count({ where: { projectId } })).toBe(before);
    // The author's own entry goes through.
    expect((await post(users.get("first")!)).status).toBe(201);
    expect(await WildlifeSighting.count({ where: { projectId } })).toBe(before + 1);
  });
});

describe("If-Match on an edit made offline", () => {
  const patchTube = async (who: Who, id: number, status: string, ifMatch?: string) => {
    const request = await requestAs(users.get(who)!, `${base()}/dewatering/tubes/${id}`, {
      method: "PATCH", body: JSON.stringify({ status }), headers: { "Content-Type": "application/json", ...(ifMatch === undefined ? {} : { "If-Match": ifMatch }) },
    });
    return tubeAction({ request, params: { projectId: String(projectId), tubeId: String(id) }, context: {} } as never);
  };

  it("refuses a tube edit against a version changed since (412 with the current tube), and takes the current one", async () => {
    const id = (await (await sendJson(tubesAction as never, "first", `${base()}/dewatering/tubes`, {}, { name: "Offline tube", circumference: 30, length: 100, capacityDryMassPerLength: 50 })).json()).tube.id as number;
    const seen = await tubeLoader({ request: await requestAs(users.get("second")!, `${base()}/dewatering/tubes/${id}`), params: { projectId: String(projectId), tubeId: String(id) }, context: {} } as never);
    const etag = seen.headers.get("ETag")!;
    const version = ((await seen.json()) as { tube: { version: string } }).tube.version;
    expect(etag).toBe(`"${version}"`);

    // The first user changes the tube meanwhile, sending the version they saw.
    const changed = await patchTube("first", id, "dewatering", etag);
    expect(changed.status).toBe(200);
    expect(changed.headers.get("ETag")).not.toBe(etag);

    // The second user's offline edit, made on the older version, is refused with the record as it is now.
    const stale = await patchTube("second", id, "ready-to-open", etag);
    expect(stale.status).toBe(412);
    const refused = (await stale.json()) as { errors: Array<{ field: string; message: string }>; current: { status: string; version: string } };
    expect(refused.errors[0].field).toBe("If-Match");
    expect(refused.current.status).toBe("dewatering");
    expect(`"${refused.current.version}"`).toBe(changed.headers.get("ETag"));
    expect((await GeotextileTube.findByPk(id))!.status).toBe("dewatering");

    // Sent again on the current version it goes through; without If-Match an edit behaves as before.
    expect((await patchTube("second", id, "ready-to-open", `"${refused.current.version}"`)).status).toBe(200);
    expect((await patchTube("second", id, "opened")).status).toBe(200);
  });

  it("refuses a find's status edit against a version changed since (412 with the current find); a handover counts as a change", async () => {
    const id = (await (await sendJson(findsAction as never, "first", `${base()}/finds`, {}, { category: "faunal", description: "Deer antler tine", foundAt: "2026-11-20T09:00:00-05:00" })).json()).id as number;
    const params = { projectId: String(projectId), findId: String(id) };
    const patchFind = async (who: Who, body: unknown, ifMatch?: string) =>
      findAction({ request: await requestAs(users.get(who)!, `${base()}/finds/${id}`, { method: "PATCH", body: JSON.stringify(body), headers: { "Content-Type": "application/json", ...(ifMatch ? { "If-Match": ifMatch } : {}) } }), params, context: {} } as never);
    const seen = await findLoader({ request: await requestAs(users.get("second")!, `${base()}/finds/${id}`), params, context: {} } as never);
    const etag = seen.headers.get("ETag")!;
    expect(etag).toBe(`"${((await seen.json()) as { find: { version: string } }).find.version}"`);
    // Meanwhile the first user hands the find over to the site store (its status moves on).
    expect((await sendJson(custodyAction as never, "first", `${base()}/finds/${id}/custody`, { findId: String(id) }, { fromName: "Ana Reyes", toName: "Store keeper", place: "Site store", purpose: "to-site-store", handedAt: "2026-11-20T12:00:00-05:00", receiverSignature: "Store keeper" })).status).toBe(201);
    const stale = await patchFind("second", { status: "released", note: "Returned to the lake bed" }, etag);
    expect(stale.status).toBe(412);
    const refused = (await stale.json()) as { errors: Array<{ field: string }>; current: { status: string; version: string; custody: unknown[] } };
    expect(refused.errors[0].field).toBe("If-Match");
    expect(refused.current.status).toBe("site-store");
    expect(refused.current.custody).toHaveLength(1);
    expect((await Find.findByPk(id))!.status).toBe("site-store");
    const applied = await patchFind("second", { status: "released", note: "Returned to the lake bed" }, `"${refused.current.version}"`);
    expect(applied.status).toBe(200);
    expect(((await applied.json()) as { find: { status: string } }).find.status).toBe("released");
    expect(applied.headers.get("ETag")).not.toBe(`"${refused.current.version}"`);
  });

  it("counts a fill as a change: an edit on the version from before the fill is refused", async () => {
    const seen = await tubeLoader({ request: await requestAs(users.get("first")!, `${base()}/dewatering/tubes/${tubeId}`), params: { projectId: String(projectId), tubeId: String(tubeId) }, context: {} } as never);
    const etag = seen.headers.get("ETag")!;
    expect((await sendJson(fillsAction as never, "second", `${base()}/dewatering/tubes/${tubeId}/fills`, { tubeId: String(tubeId) }, { date: DATE, drySolids: 2 })).status).toBe(201);
    expect((await patchTube("first", tubeId, "dewatering", etag)).status).toBe(412);
  });
});

describe("the stop-work acts with an Idempotency-Key", () => {
  it("answers a resent agency notice and resumption with the first answer; a different notice under the key is refused", async () => {
    expect((await sendJson(rulesAction as never, "first", `${base()}/water-quality/rules`, {}, { kind: "absolute", limit: 50, source: "Permit test condition" })).status).toBe(201);
    expect((await sendJson(stationsAction as never, "first", `${base()}/water-quality/stations`, {}, { name: "CP-1", kind: "compliance" })).status).toBe(201);
    const exceeding = await sendJson(readingsAction as never, "first", `${base()}/water-quality/readings`, {}, { station: "CP-1", takenAt: "2026-11-21T09:00:00-05:00", value: 80, unit: "NTU" }, randomUUID());
    const reading = (await exceeding.json()) as { stopWork: { id: number }; notices: string[] };
    expect(reading.notices.join(" ")).toMatch(new RegExp(`Stop-work event #${reading.stopWork.id} is open`));
    const eventId = String(reading.stopWork.id);
    const notice = { notifiedAt: "2026-11-21T09:30:00-05:00", to: "District office", how: "telephone" };
    const noticeKey = randomUUID();
    const sendNotice = (body: unknown) => sendJson(noticeAction as never, "first", `${base()}/stop-work/${eventId}/notification`, { eventId }, body, noticeKey);
    const [a, b] = await Promise.all([sendNotice(notice), sendNotice(notice)]);
    expect([a.status, b.status].sort()).toEqual([200, 200]);
    expect([a.headers.get("Idempotency-Replayed"), b.headers.get("Idempotency-Replayed")].filter(Boolean)).toEqual(["true"]);
    expect(await a.text()).toBe(await b.text());
    expect((await sendNotice({ ...notice, to: "Someone else" })).status).toBe(422);

    const within = await sendJson(readingsAction as never, "first", `${base()}/water-quality/readings`, {}, { station: "CP-1", takenAt: "2026-11-21T11:00:00-05:00", value: 20, unit: "NTU" });
    expect(within.status).toBe(201);
    const resumeKey = randomUUID();
    const resume = () => sendJson(resumeAction as never, "first", `${base()}/stop-work/${eventId}/resume`, { eventId }, { note: "Resample within the limit" }, resumeKey);
    const first = await resume();
    expect(first.status).toBe(200);
    // Without the key a second resumption is a 409; with it the phone's resend gets the first answer.
    const again = await resume();
    expect(again.status).toBe(200);
    expect(again.headers.get("Idempotency-Replayed")).toBe("true");
    expect(await again.text()).toBe(await first.text());
    expect((await StopWorkEvent.findByPk(Number(eventId)))!.resumedAt).not.toBeNull();
  });
});

describe("the hold acts with an Idempotency-Key", () => {
  it("answers a resent agency notice (sent twice at once) and a resent lift with the first answer; another notice under the key is refused", async () => {
    const cultural = await sendJson(findsAction as never, "first", `${base()}/finds`, {}, { category: "cultural", description: "Bone pin", cell, foundAt: "2026-11-20T09:00:00-05:00" });
    const holdId = String(((await cultural.json()) as { hold: { id: number } }).hold.id);
    const noticeKey = randomUUID();
    const notice = { agency: "historic-preservation-office", toldAt: "2026-11-20T09:40:00-05:00", note: "by telephone" };
    const sendNotice = (body: unknown) => sendJson(holdNoticesAction as never, "first", `${base()}/holds/${holdId}/notices`, { holdId }, body, noticeKey);
    const [a, b] = await Promise.all([sendNotice(notice), sendNotice(notice)]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(await a.text()).toBe(await b.text());
    expect((await sendNotice({ ...notice, note: "by letter" })).status).toBe(422);

    const liftKey = randomUUID();
    const lift = () => sendJson(liftAction as never, "first", `${base()}/holds/${holdId}/lift`, { holdId }, { authorisedBy: "State office", liftedAt: "2026-11-20T15:00:00-05:00" }, liftKey);
    expect((await lift()).status).toBe(204);
    // Without the key a second lift is a 409; with it the phone's resend gets the first answer.
    const again = await lift();
    expect(again.status).toBe(200);
    expect(again.headers.get("Idempotency-Replayed")).toBe("true");
    expect((await Hold.findByPk(Number(holdId)))!.liftedAt!.toISOString()).toBe("2026-11-20T20:00:00.000Z");
  });
});
