import { afterAll, beforeAll, describe, expect, it } from "vitest";
import sharp from "sharp";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, Haul, HaulPhoto, HaulSite, JarTest, JarTestPhoto, Project, type Role } from "~/lib/db.server";
import { listObjectKeys } from "~/lib/storage/storage.server";
import { action as jarTestsAction, loader as jarTestsLoader } from "~/routes/api.projects.$projectId.dewatering.jar-tests";
import { action as jarPhotosAction } from "~/routes/api.projects.$projectId.dewatering.jar-tests.$jarTestId.photos";
import { loader as jarTestLoader } from "~/routes/api.projects.$projectId.dewatering.jar-tests.$jarTestId";
import { loader as jarPhotoLoader } from "~/routes/api.projects.$projectId.dewatering.jar-tests.$jarTestId.photos.$photoId";
import { action as haulsAction, loader as haulsLoader } from "~/routes/api.projects.$projectId.hauls";
import { action as haulPhotosAction } from "~/routes/api.projects.$projectId.hauls.$haulId.photos";
import { loader as haulPhotoLoader } from "~/routes/api.projects.$projectId.hauls.$haulId.photos.$photoId";
import { action as jarTestsPage, loader as jarTestsPageLoader } from "~/routes/projects.$projectId.dewatering.jar-tests";
import { action as haulsPage } from "~/routes/projects.$projectId.dewatering.hauls";
import { action as dewateringPage } from "~/routes/projects.$projectId.dewatering";
import { action as tubesAction, loader as tubesLoader } from "~/routes/api.projects.$projectId.dewatering.tubes";
import { action as fillsAction } from "~/routes/api.projects.$projectId.dewatering.tubes.$tubeId.fills";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";
import { buildMapStyle } from "~/models/map-style.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";

// Jar tests and haul-ticket photos end to end (and the project's near-capacity share for tubes): the bench figures answered by the API, refusals
// that name the field and store nothing, photos kept through the one object store (metadata
// stripped) and served only to members, and the pages' forms that carry a record and its photo at once.

afterAll(closeSequelize);

type Handler = (args: never) => Promise<unknown>;
let projectId = 0;
let otherProjectId = 0;
const users = new Map<Role | "outsider", number>();
const base = () => `/api/projects/${projectId}`;

async function call(handler: Handler, who: Role | "outsider", path: string, init: RequestInit = {}, params: Record<string, string> = {}, project = projectId): Promise<Response> {
  const request = await requestAs(users.get(who)!, path, { ...init, headers: { Origin: ORIGIN, ...(init.headers as Record<string, string> | undefined) } });
  try {
    return (await handler({ request, params: { projectId: String(project), ...params }, context: {} } as never)) as Response;
  } catch (error) {
    if (error instanceof Response) return error;
    throw error;
  }
}
const postJson = (handler: Handler, who: Role, path: string, body: unknown, params: Record<string, string> = {}) =>
  call(handler, who, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } }, params);
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;
const upload = (handler: Handler, who: Role, path: string, params: Record<string, string>, bytes: Uint8Array, fileName: string, type = "image/jpeg") => {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)], { type }), fileName);
  return call(handler, who, path, { method: "POST", body: form }, params);
};

/** A JPEG whose EXIF holds a GPS position and a camera, as a phone writes it. */
const photoWithGps = () =>
  sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a7a55" } })
    .jpeg()
    .withExif({ IFD0: { Make: "Fieldcam", Model: "FC-2" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: "29/1 12/1 30/1", GPSLongitudeRef: "W", GPSLongitude: "82/1 3/1 0/1" } })
    .toBuffer();

const JAR_TEST = {
  date: "2026-10-05", time: "06:40", sampleSource: "main line at the manifold",
  polymer: { product: "Cationic emulsion CE-412", lot: "L-2231", benchStockPercent: 0.1 },
  jarVolumeMl: 1000, raw: { turbidityNtu: 400 },
  jars: [
    { doseMgPerL: 1, settlingMinutes: 10, turbidityNtu: 120, clarity: "turbid" },
    { doseMgPerL: 4, settlingMinutes: 10, turbidityNtu: 12, clarity: "clear" },
    { doseMgPerL: 8, settlingMinutes: 10, turbidityNtu: 35, clarity: "slightly-hazy" },
  ],
  chosenDoseMgPerL: 4,
};

const counts = () => Promise.all([JarTest.count({ where: { projectId } }), JarTestPhoto.count({ where: { projectId } }), Haul.count({ where: { projectId } }), HaulPhoto.count({ where: { projectId } })]);
const objects = () => listObjectKeys(`projects/${projectId}/`);

beforeAll(async () => {
  projectId = (await makeProject("jar-tests")).id;
  otherProjectId = (await makeProject("jar-tests-other")).id;
  await Project.update({ cakeSolidsByWeight: 0.3 }, { where: { id: projectId } });
  for (const role of ["manager", "dewatering", "viewer", "surveyor"] as Role[]) {
    const user = await makeUser(`jar-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
  const outsider = await makeUser("jar-outsider");
  await addMember(outsider.id, otherProjectId, "manager");
  users.set("outsider", outsider.id);
  await HaulSite.create({ projectId, name: "Cedar Bend farm", kind: "reuse", permitNumber: "SA-2026-114" });
});

describe("jar tests through the API", () => {
  let jarTestId = 0;

  it("records a jar test for the dewatering operator (201) with each jar's bench stock and turbidity removed", async () => {
    const response = await postJson(jarTestsAction as never, "dewatering", `${base()}/dewatering/jar-tests`, JAR_TEST);
    expect(response.status).toBe(201);
    const body = await response.json();
    jarTestId = body.id;
    // published: 1 mL of a 0.1 % stock in a 1-litre jar doses 1 mg/L, so 4 and 8 mg/L take 4 and 8 mL (computed)
    expect(body.jarTest.jars.map((jar: { stockMl: number }) => jar.stockMl)).toEqual([1, 4, 8]);
    // computed: (400 − 12) ÷ 400 = 97 %
    expect(body.jarTest.jars[1].turbidityRemoval).toBeCloseTo(0.97, 12);
    expect(body.jarTest).toMatchObject({ chosenDoseMgPerL: 4, clearestAtLowestDose: 4, time: "06:40", polymer: { lot: "L-2231" }, photos: [] });
    expect(body.caution).toMatch(/safety data sheet and the site's safety plan/);
    expect(await AuditEvent.count({ where: { projectId, action: "jar-test-recorded" } })).toBe(1);
  });

  it("answers the first test again for a repeated idempotency key, storing it once", async () => {
    const again = { ...JAR_TEST, date: "2026-10-06", idempotencyKey: "bench-phone-0001" };
    const first = await postJson(jarTestsAction as never, "manager", `${base()}/dewatering/jar-tests`, again);
    const second = await postJson(jarTestsAction as never, "manager", `${base()}/dewatering/jar-tests`, again);
    expect([first.status, second.status]).toEqual([201, 200]);
    expect((await second.json()).id).toBe((await first.json()).id);
    expect(await JarTest.count({ where: { projectId, testDate: "2026-10-06" } })).toBe(1);
  });

  const refusals: Array<[string, Record<string, unknown>, string]> = [
    ["a dose of −1", { jars: [{ ...JAR_TEST.jars[0], doseMgPerL: -1 }] }, "jars.0.doseMgPerL"],
    ["a bench stock of 0 %", { polymer: { ...JAR_TEST.polymer, benchStockPercent: 0 } }, "polymer.benchStockPercent"],
    ["no dosed jar", { jars: [] }, "jars"],
    ["a clarity that is not one of the words", { jars: [{ ...JAR_TEST.jars[0], clarity: "murky" }] }, "jars.0.clarity"],
    ["a negative turbidity", { raw: { turbidityNtu: -3 } }, "raw.turbidityNtu"],
    ["a settling time of 0", { jars: [{ ...JAR_TEST.jars[0], settlingMinutes: 0 }] }, "jars.0.settlingMinutes"],
    ["a chosen dose of 0", { chosenDoseMgPerL: 0 }, "chosenDoseMgPerL"],
    ["a time that is not HH:MM", { time: "7am" }, "time"],
    ["no product", { polymer: { benchStockPercent: 0.1 } }, "polymer.product"],
    ["nine jars", { jars: Array.from({ length: 9 }, () => JAR_TEST.jars[0]) }, "jars"],
  ];
  for (const [name, change, field] of refusals) {
    it(`refuses ${name} with 422 naming ${field}, storing nothing`, async () => {
      const before = await counts();
      const response = await postJson(jarTestsAction as never, "dewatering", `${base()}/dewatering/jar-tests`, { ...JAR_TEST, ...change });
      expect(response.status).toBe(422);
      expect((await errorsOf(response)).map((error) => error.field)).toContain(field);
      expect(await counts()).toEqual(before);
    });
  }

  it("lets every member read the tests by dates, and only the operator and the manager write", async () => {
    expect((await postJson(jarTestsAction as never, "viewer", `${base()}/dewatering/jar-tests`, JAR_TEST)).status).toBe(403);
    expect((await postJson(jarTestsAction as never, "surveyor", `${base()}/dewatering/jar-tests`, JAR_TEST)).status).toBe(403);
    const list = await call(jarTestsLoader as never, "viewer", `${base()}/dewatering/jar-tests?from=2026-10-05&to=2026-10-05`);
    expect(list.status).toBe(200);
    expect(((await list.json()).jarTests as Array<{ id: number }>).map((test) => test.id)).toEqual([jarTestId]);
    expect((await call(jarTestsLoader as never, "outsider", `${base()}/dewatering/jar-tests`)).status).toBe(403);
    expect((await call(jarTestsLoader as never, "viewer", `${base()}/dewatering/jar-tests?from=5 October`)).status).toBe(400);
  });

  it("answers one test by its id as the list gives it, and 404 naming jarTestId for none", async () => {
    const listed = ((await (await call(jarTestsLoader as never, "viewer", `${base()}/dewatering/jar-tests`)).json()).jarTests as Array<{ id: number }>).find((test) => test.id === jarTestId);
    const one = await call(jarTestLoader as never, "viewer", `${base()}/dewatering/jar-tests/${jarTestId}`, {}, { jarTestId: String(jarTestId) });
    expect(one.status).toBe(200);
    expect((await one.json()).jarTest).toEqual(listed);
    for (const id of ["999999999", "abc"]) {
      const missing = await call(jarTestLoader as never, "viewer", `${base()}/dewatering/jar-tests/${id}`, {}, { jarTestId: id });
      expect(missing.status).toBe(404);
      expect((await errorsOf(missing))[0].field).toBe("jarTestId");
    }
  });

  it("keeps a photo of the jars without its camera data, served to members only", async () => {
    const params = { jarTestId: String(jarTestId) };
    const response = await upload(jarPhotosAction as never, "dewatering", `${base()}/dewatering/jar-tests/${jarTestId}/photos`, params, await photoWithGps(), "jars.jpg");
    expect(response.status).toBe(201);
    const { id: photoId } = await response.json();
    expect(response.headers.get("Location")).toBe(`${base()}/dewatering/jar-tests/${jarTestId}/photos/${photoId}`);
    const photoParams = { ...params, photoId: String(photoId) };
    const full = await call(jarPhotoLoader as never, "viewer", `${base()}/dewatering/jar-tests/${jarTestId}/photos/${photoId}`, {}, photoParams);
    expect(full.status).toBe(200);
    expect(full.headers.get("Content-Type")).toBe("image/jpeg");
    expect(full.headers.get("Cache-Control")).toBe("private, no-store");
    const stored = await sharp(Buffer.from(await full.arrayBuffer())).metadata();
    expect([stored.width, stored.height, stored.exif]).toEqual([640, 480, undefined]); // memory: sharp writes no EXIF without withMetadata()
    const thumb = await call(jarPhotoLoader as never, "viewer", `${base()}/dewatering/jar-tests/${jarTestId}/photos/${photoId}?size=thumb`, {}, photoParams);
    expect((await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()).width).toBe(320);
    expect((await call(jarPhotoLoader as never, "outsider", `${base()}/dewatering/jar-tests/${jarTestId}/photos/${photoId}`, {}, photoParams)).status).toBe(403);
    // Another project's address for the same photo finds nothing, even for a manager there.
    expect((await call(jarPhotoLoader as never, "outsider", `/api/projects/${otherProjectId}/dewatering/jar-tests/${jarTestId}/photos/${photoId}`, {}, photoParams, otherProjectId)).status).toBe(404);
    const listed = await (await call(jarTestsLoader as never, "viewer", `${base()}/dewatering/jar-tests?from=2026-10-05&to=2026-10-05`)).json();
    expect(listed.jarTests[0].photos).toEqual([expect.objectContaining({ id: photoId, originalFileName: "jars.jpg", widthPx: 640 })]);
    expect(Object.keys(listed.jarTests[0].photos[0])).not.toContain("exif");
  });

  it("refuses a file that is not an image, a viewer's photo and an unknown test, storing nothing", async () => {
    const params = { jarTestId: String(jarTestId) };
    const before = [await counts(), (await objects()).sort()];
    const text = await upload(jarPhotosAction as never, "dewatering", `${base()}/dewatering/jar-tests/${jarTestId}/photos`, params, new TextEncoder().encode("dose,ntu\n4,12\n"), "jars.jpg", "text/plain");
    expect(text.status).toBe(422);
    expect((await errorsOf(text))[0]).toMatchObject({ field: "file", message: expect.stringContaining("not an image") });
    expect((await upload(jarPhotosAction as never, "viewer", `${base()}/dewatering/jar-tests/${jarTestId}/photos`, params, await photoWithGps(), "a.jpg")).status).toBe(403);
    expect((await upload(jarPhotosAction as never, "dewatering", `${base()}/dewatering/jar-tests/999999999/photos`, { jarTestId: "999999999" }, await photoWithGps(), "a.jpg")).status).toBe(404);
    const json = await call(jarPhotosAction as never, "dewatering", `${base()}/dewatering/jar-tests/${jarTestId}/photos`, { method: "POST", body: "{}", headers: { "Content-Type": "application/json" } }, params);
    expect(json.status).toBe(415);
    expect([await counts(), (await objects()).sort()]).toEqual(before);
  });
});

describe("haul-ticket photos", () => {
  let haulId = 0;
  it("keeps a photo of a ticket and lists it with the ticket", async () => {
    const created = await postJson(haulsAction as never, "dewatering", `${base()}/hauls`, { date: "2026-10-05", ticketNumber: "S-10021", truck: "Truck 4", site: "Cedar Bend farm", load: { value: 20, unit: "short-ton" } });
    expect(created.status).toBe(201);
    haulId = (await created.json()).haul.id;
    const params = { haulId: String(haulId) };
    const response = await upload(haulPhotosAction as never, "dewatering", `${base()}/hauls/${haulId}/photos`, params, await photoWithGps(), "ticket.jpg");
    expect(response.status).toBe(201);
    const { id: photoId } = await response.json();
    const listed = await (await call(haulsLoader as never, "viewer", `${base()}/hauls`)).json();
    expect(listed.hauls.find((haul: { id: number }) => haul.id === haulId).photos).toEqual([expect.objectContaining({ id: photoId, originalFileName: "ticket.jpg" })]);
    const bytes = await call(haulPhotoLoader as never, "viewer", `${base()}/hauls/${haulId}/photos/${photoId}`, {}, { ...params, photoId: String(photoId) });
    expect(bytes.status).toBe(200);
    expect((await sharp(Buffer.from(await bytes.arrayBuffer())).metadata()).exif).toBeUndefined();
    expect(await AuditEvent.count({ where: { projectId, action: "haul-photo-added" } })).toBe(1);
    expect((await call(haulPhotoLoader as never, "viewer", `${base()}/hauls/${haulId}/photos/${photoId}?size=huge`, {}, { ...params, photoId: String(photoId) })).status).toBe(400);
  });

  it("refuses a viewer's photo (403), a misnamed image (422) and a photo of another project's ticket (404)", async () => {
    const params = { haulId: String(haulId) };
    const before = [await counts(), (await objects()).sort()];
    expect((await upload(haulPhotosAction as never, "viewer", `${base()}/hauls/${haulId}/photos`, params, await photoWithGps(), "t.jpg")).status).toBe(403);
    const png = await sharp({ create: { width: 32, height: 32, channels: 3, background: "#000" } }).png().toBuffer();
    const misnamed = await upload(haulPhotosAction as never, "dewatering", `${base()}/hauls/${haulId}/photos`, params, png, "ticket.jpg");
    expect(misnamed.status).toBe(422);
    expect((await errorsOf(misnamed))[0].message).toMatch(/PNG image, but its name ends in "\.jpg"/);
    const elsewhere = await call(haulPhotosAction as never, "outsider", `/api/projects/${otherProjectId}/hauls/${haulId}/photos`, { method: "POST", body: (() => { const form = new FormData(); form.set("file", new Blob([png], { type: "image/png" }), "t.png"); return form; })() }, params, otherProjectId);
    expect(elsewhere.status).toBe(404);
    expect([await counts(), (await objects()).sort()]).toEqual(before);
  });
});

describe("the pages' forms carry the record and its photo at once", () => {
  const statusOf = (answer: unknown) => (answer as { init?: { status?: number } } | null)?.init?.status ?? 200;
  async function postPage(handler: Handler, path: string, form: FormData) {
    const request = await requestAs(users.get("dewatering")!, path, { method: "POST", body: form, headers: { Origin: ORIGIN } });
    const answer = await handler({ request, params: { projectId: String(projectId) }, context: {} } as never);
    return { status: statusOf(answer), body: ((answer as { data?: unknown }).data ?? answer) as { errors: Record<string, string>; notice: string | null } };
  }
  const jarForm = (entries: Record<string, string>, file?: { bytes: Uint8Array; name: string; type: string }) => {
    const form = new FormData();
    for (const [name, value] of Object.entries({
      intent: "jar-test", date: "2026-10-07", time: "", sampleSource: "", polymerProduct: "CE-412", polymerLot: "", benchStockPercent: "0.1", jarVolumeMl: "1000", rawNtu: "300", settlingMinutes: "10",
      "jar-0-dose": "2", "jar-0-ntu": "40", "jar-0-clarity": "hazy", "jar-1-dose": "", "jar-1-ntu": "", "jar-1-clarity": "", "jar-2-dose": "5", "jar-2-ntu": "", "jar-2-clarity": "clear", chosenDose: "5", notes: "", ...entries,
    })) form.set(name, value);
    form.set("file", file ? new Blob([new Uint8Array(file.bytes)], { type: file.type }) : new Blob([], { type: "application/octet-stream" }), file?.name ?? "");
    return form;
  };

  it("records a jar test with its photo from the page, leaving out the blank jar", async () => {
    const { status, body } = await postPage(jarTestsPage as never, `/projects/${projectId}/dewatering/jar-tests`, jarForm({}, { bytes: await photoWithGps(), name: "bench.jpg", type: "image/jpeg" }));
    expect(status).toBe(200);
    expect(body.notice).toBe("Recorded the jar test of 2026-10-07: 2 dosed jars, dose chosen 5 mg/L, with its photo.");
    const test = await JarTest.findOne({ where: { projectId, testDate: "2026-10-07" }, include: [{ model: JarTestPhoto, as: "photos" }] });
    expect(test!.jars.map((jar) => jar.doseMgPerL)).toEqual([2, 5]);
    expect(test!.photos).toHaveLength(1);
    const page = await jarTestsPageLoader({ request: await requestAs(users.get("viewer")!, `/projects/${projectId}/dewatering/jar-tests`), params: { projectId: String(projectId) }, context: {} } as never);
    expect(page.canLog).toBe(false);
    expect(page.caution).toMatch(/safety data sheet/);
  });

  it("names the jar row of a bad dose and stores nothing when the photo is refused", async () => {
    const before = [await counts(), (await objects()).sort()];
    const bad = await postPage(jarTestsPage as never, `/projects/${projectId}/dewatering/jar-tests`, jarForm({ "jar-2-dose": "-5" }));
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.errors)).toEqual(["jar-2-dose"]);
    const notImage = await postPage(jarTestsPage as never, `/projects/${projectId}/dewatering/jar-tests`, jarForm({ date: "2026-10-08" }, { bytes: new TextEncoder().encode("not a photo"), name: "bench.jpg", type: "image/jpeg" }));
    expect(notImage.status).toBe(400);
    expect(notImage.body.errors.file).toMatch(/not an image/);
    expect([await counts(), (await objects()).sort()]).toEqual(before);
  });

  it("enters a haul ticket with its photo from the hauls page", async () => {
    const form = new FormData();
    for (const [name, value] of Object.entries({ intent: "haul", date: "2026-10-07", ticketNumber: "S-10022", truck: "Truck 4", site: "Cedar Bend farm", loadValue: "18", loadUnit: "short-ton", cakeSolidsPercent: "", notes: "" })) form.set(name, value);
    form.set("file", new Blob([new Uint8Array(await photoWithGps())], { type: "image/jpeg" }), "ticket-10022.jpg");
    const { status, body } = await postPage(haulsPage as never, `/projects/${projectId}/dewatering/hauls`, form);
    expect(status).toBe(200);
    // computed: 18 wet short tons × the project default 30 % cake solids
    expect(body.notice).toBe("Recorded ticket S-10022: 5.4 dry short tons, with its photo.");
    const haul = await Haul.findOne({ where: { projectId, ticketNumber: "S-10022" }, include: [{ model: HaulPhoto, as: "photos" }] });
    expect(haul!.photos).toHaveLength(1);
  });

  it("adds a photo to a ticket already entered, and asks for the photo when none was chosen", async () => {
    const haul = (await Haul.findOne({ where: { projectId, ticketNumber: "S-10022" } }))!;
    const form = (file: Blob | null) => {
      const body = new FormData();
      body.set("intent", "photo");
      body.set("haulId", String(haul.id));
      body.set("file", file ?? new Blob([], { type: "application/octet-stream" }), file ? "back-of-ticket.jpg" : "");
      return body;
    };
    const missing = await postPage(haulsPage as never, `/projects/${projectId}/dewatering/hauls`, form(null));
    expect(missing.status).toBe(400);
    expect(missing.body.errors.file).toBe("Choose a photo of the ticket.");
    const added = await postPage(haulsPage as never, `/projects/${projectId}/dewatering/hauls`, form(new Blob([new Uint8Array(await photoWithGps())], { type: "image/jpeg" })));
    expect(added.body.notice).toBe("Added the ticket's photo.");
    expect(await HaulPhoto.count({ where: { haulId: haul.id } })).toBe(2);
  });
});

describe("the project's near-capacity share for tubes", () => {
  async function postSettings(who: Role, fields: Record<string, string>) {
    const request = await requestAs(users.get(who)!, `/projects/${projectId}/dewatering`, { method: "POST", body: new URLSearchParams({ intent: "settings", ...fields }), headers: { Origin: ORIGIN, "Content-Type": "application/x-www-form-urlencoded" } });
    try {
      const answer = await dewateringPage({ request, params: { projectId: String(projectId) }, context: {} } as never);
      return { status: (answer as { init?: { status?: number } }).init?.status ?? 200, body: ((answer as { data?: unknown }).data ?? answer) as { errors: Record<string, string> } };
    } catch (error) {
      if (error instanceof Response) return { status: error.status, body: { errors: {} } };
      throw error;
    }
  }

  it("flags a tube at the share the manager set, 90 % until then", async () => {
    const tube = await (await postJson(tubesAction as never, "dewatering", `${base()}/dewatering/tubes`, { name: "NC-1", circumference: 30, length: 100, capacityDryMassPerLength: 0.5 })).json();
    // computed: 46 of 0.5 × 100 = 50 dry short tons is 92 %
    const fill = await postJson(fillsAction as never, "dewatering", `${base()}/dewatering/tubes/${tube.tube.id}/fills`, { date: "2026-10-09", drySolids: 46 }, { tubeId: String(tube.tube.id) });
    expect((await fill.json()).tube).toMatchObject({ nearCapacity: true });
    const refused = await postSettings("manager", { solidsSpecificGravity: "2.65", cakeSolidsPercent: "30", nearCapacityPercent: "40" });
    expect(refused.status).toBe(400);
    expect(refused.body.errors.nearCapacityPercent).toMatch(/50 % of its capacity or more/);
    expect((await postSettings("dewatering", { solidsSpecificGravity: "2.65", cakeSolidsPercent: "30", nearCapacityPercent: "95" })).status).toBe(403);
    expect((await Project.findByPk(projectId))!.tubeNearCapacityShare).toBe(0.9);
    expect((await postSettings("manager", { solidsSpecificGravity: "2.65", cakeSolidsPercent: "30", nearCapacityPercent: "95" })).status).toBe(200);
    const register = await (await call(tubesLoader as never, "viewer", `${base()}/dewatering/tubes`)).json();
    expect(register.nearCapacityShare).toBe(0.95);
    expect(register.tubes.find((entry: { name: string }) => entry.name === "NC-1")).toMatchObject({ nearCapacity: false });
    expect(await AuditEvent.count({ where: { projectId, action: "dewatering-settings-changed" } })).toBe(1);
  });
});

describe("tube positions on the map", () => {
  it("draws a placed tube on the project's map along its bearing, and only a placed one", async () => {
    const bearingOnly = await postJson(tubesAction as never, "dewatering", `${base()}/dewatering/tubes`, { name: "MAP-0", circumference: 60, length: 150, capacityDryMassPerLength: 1.1, bearingDegrees: 90 });
    expect(bearingOnly.status).toBe(422);
    expect((await errorsOf(bearingOnly)).map((error) => error.field)).toEqual(["position"]);
    const placed = await postJson(tubesAction as never, "dewatering", `${base()}/dewatering/tubes`, { name: "MAP-1", circumference: 60, length: 150, capacityDryMassPerLength: 1.1, position: { x: 600_500, y: 1_600_400 }, bearingDegrees: 90 });
    expect(placed.status).toBe(201);
    expect((await placed.json()).tube).toMatchObject({ position: { x: 600_500, y: 1_600_400 }, bearingDegrees: 90 });
    const style = await buildMapStyle(presentProject((await Project.findByPk(projectId))!)) as unknown as { sources: { tubes: { data: { features: Array<{ properties: { name: string }; geometry: { coordinates: number[][] } }> } } }; layers: Array<{ id: string }> };
    const features = style.sources.tubes.data.features;
    expect(features.map((feature) => feature.properties.name)).toEqual(["MAP-1"]);
    // computed: 150 ft east–west through the centre, each end taken to lon/lat by the project's CRS (EPSG:2237)
    const crs = createCrs(resolveCrsDefinition("EPSG:2237").definition);
    const [west, east] = features[0].geometry.coordinates;
    const expectedWest = crs.toLonLat(600_425, 1_600_400);
    const expectedEast = crs.toLonLat(600_575, 1_600_400);
    expect(west[0]).toBeCloseTo(expectedWest[0], 9);
    expect(west[1]).toBeCloseTo(expectedWest[1], 9);
    expect(east[0]).toBeCloseTo(expectedEast[0], 9);
    expect(east[0]).toBeGreaterThan(west[0]);
    expect(style.layers.map((layer) => layer.id)).toEqual(expect.arrayContaining(["tubes", "tube-labels"]));
  });
});
