import { afterAll, beforeAll, describe, expect, it } from "vitest";
import sharp from "sharp";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, MonitoringStation, WaterQualityReading, WaterQualityReadingPhoto, type Role } from "~/lib/db.server";
import { listObjectKeys } from "~/lib/storage/storage.server";
import { action as readingsAction, loader as readingsLoader } from "~/routes/api.projects.$projectId.water-quality.readings";
import { action as readingPhotosAction } from "~/routes/api.projects.$projectId.water-quality.readings.$readingId.photos";
import { loader as readingPhotoLoader } from "~/routes/api.projects.$projectId.water-quality.readings.$readingId.photos.$photoId";
import { action as waterQualityPage, loader as waterQualityPageLoader } from "~/routes/projects.$projectId.water-quality";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// Photos of water-quality readings, through the one way of keeping a photo: the API adds one to a
// reading, the page's reading form carries the reading and its photo at once (a refused photo
// stores nothing of the reading), the stored image has no camera data (no location), and the
// bytes are served only through the app, to members of the project.

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
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;
const upload = (who: Role | "outsider", readingId: number | string, bytes: Uint8Array, fileName: string, type = "image/jpeg", project = projectId) => {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)], { type }), fileName);
  return call(readingPhotosAction as never, who, `/api/projects/${project}/water-quality/readings/${readingId}/photos`, { method: "POST", body: form }, { readingId: String(readingId) }, project);
};

/** A JPEG whose EXIF holds a GPS position and a camera, as a phone writes it. */
const photoWithGps = () =>
  sharp({ create: { width: 640, height: 480, channels: 3, background: "#7d8a66" } })
    .jpeg()
    .withExif({ IFD0: { Make: "Fieldcam", Model: "FC-2" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: "29/1 12/1 30/1", GPSLongitudeRef: "W", GPSLongitude: "82/1 3/1 0/1" } })
    .toBuffer();

const counts = () => Promise.all([WaterQualityReading.count({ where: { projectId } }), WaterQualityReadingPhoto.count({ where: { projectId } })]);
const objects = async () => (await listObjectKeys(`projects/${projectId}/`)).sort();

beforeAll(async () => {
  projectId = (await makeProject("wq-photos")).id;
  otherProjectId = (await makeProject("wq-photos-other")).id;
  for (const role of ["manager", "resource-monitor", "dewatering", "viewer"] as Role[]) {
    const user = await makeUser(`wq-photo-${role}`);
    await addMember(user.id, projectId, role);
    users.set(role, user.id);
  }
  const outsider = await makeUser("wq-photo-outsider");
  await addMember(outsider.id, otherProjectId, "manager");
  users.set("outsider", outsider.id);
  // A background station: its readings are recorded without a rule or a verdict.
  await MonitoringStation.create({ projectId, name: "BG-1 up-current", kind: "background", positionX: null, positionY: null, depthRule: "mid-depth", ruleId: null });
});

async function recordReading(takenAt: string): Promise<number> {
  const response = await call(readingsAction as never, "resource-monitor", `${base()}/water-quality/readings`, {
    method: "POST", body: JSON.stringify({ station: "BG-1 up-current", takenAt, value: 6.2, unit: "NTU" }), headers: { "Content-Type": "application/json" },
  });
  expect(response.status).toBe(201);
  return ((await response.json()) as { id: number }).id;
}

describe("reading photos through the API", () => {
  let readingId = 0;

  it("keeps a photo of a reading without its camera data, served to members only", async () => {
    readingId = await recordReading("2026-10-05T09:00:00-04:00");
    const response = await upload("resource-monitor", readingId, await photoWithGps(), "bg-1.jpg");
    expect(response.status).toBe(201);
    const { id: photoId } = (await response.json()) as { id: number };
    expect(response.headers.get("Location")).toBe(`${base()}/water-quality/readings/${readingId}/photos/${photoId}`);
    const photoParams = { readingId: String(readingId), photoId: String(photoId) };
    const full = await call(readingPhotoLoader as never, "viewer", `${base()}/water-quality/readings/${readingId}/photos/${photoId}`, {}, photoParams);
    expect(full.status).toBe(200);
    expect(full.headers.get("Content-Type")).toBe("image/jpeg");
    expect(full.headers.get("Cache-Control")).toBe("private, no-store");
    const stored = await sharp(Buffer.from(await full.arrayBuffer())).metadata();
    expect([stored.width, stored.height, stored.exif]).toEqual([640, 480, undefined]); // memory: sharp writes no EXIF (so no GPS position) without withMetadata()
    const thumb = await call(readingPhotoLoader as never, "viewer", `${base()}/water-quality/readings/${readingId}/photos/${photoId}?size=thumb`, {}, photoParams);
    expect((await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()).width).toBe(320);
    expect((await call(readingPhotoLoader as never, "viewer", `${base()}/water-quality/readings/${readingId}/photos/${photoId}?size=huge`, {}, photoParams)).status).toBe(400);
    // Not a member: refused; another project's address for the same photo finds nothing, even for a manager there.
    expect((await call(readingPhotoLoader as never, "outsider", `${base()}/water-quality/readings/${readingId}/photos/${photoId}`, {}, photoParams)).status).toBe(403);
    expect((await call(readingPhotoLoader as never, "outsider", `/api/projects/${otherProjectId}/water-quality/readings/${readingId}/photos/${photoId}`, {}, photoParams, otherProjectId)).status).toBe(404);
    // The photo under another reading's address of the same project finds nothing either.
    const otherReading = await recordReading("2026-10-05T10:00:00-04:00");
    expect((await call(readingPhotoLoader as never, "viewer", `${base()}/water-quality/readings/${otherReading}/photos/${photoId}`, {}, { readingId: String(otherReading), photoId: String(photoId) })).status).toBe(404);
    // The objects sit under the project's water-quality folder; the camera's data stays in the record only, never listed.
    expect((await objects()).filter((key) => key.startsWith(`projects/${projectId}/water-quality/readings/`))).toHaveLength(2);
    const listed = (await (await call(readingsLoader as never, "viewer", `${base()}/water-quality/readings?from=2026-10-05&to=2026-10-05`)).json()) as { readings: Array<{ id: number; photos: Array<Record<string, unknown>> }> };
    const shown = listed.readings.find((reading) => reading.id === readingId)!;
    expect(shown.photos).toEqual([expect.objectContaining({ id: photoId, originalFileName: "bg-1.jpg", widthPx: 640, heightPx: 480 })]);
    expect(Object.keys(shown.photos[0])).not.toContain("exif");
    expect(listed.readings.find((reading) => reading.id === otherReading)!.photos).toEqual([]);
    expect(await AuditEvent.count({ where: { projectId, action: "water-quality-reading-photo-added" } })).toBe(1);
  });

  it("refuses a file that is not an image, a misnamed image, a viewer's photo, an unknown reading and a JSON body, storing nothing", async () => {
    const before = [await counts(), await objects()];
    const text = await upload("dewatering", readingId, new TextEncoder().encode("ntu\n6.2\n"), "bg-1.jpg", "text/plain");
    expect(text.status).toBe(422);
    expect((await errorsOf(text))[0]).toMatchObject({ field: "file", message: expect.stringContaining("not an image") });
    const png = await sharp({ create: { width: 32, height: 32, channels: 3, background: "#000" } }).png().toBuffer();
    const misnamed = await upload("dewatering", readingId, png, "bg-1.jpg");
    expect(misnamed.status).toBe(422);
    expect((await errorsOf(misnamed))[0].message).toMatch(/PNG image, but its name ends in "\.jpg"/);
    expect((await upload("viewer", readingId, await photoWithGps(), "a.jpg")).status).toBe(403);
    const unknown = await upload("dewatering", 999_999_999, await photoWithGps(), "a.jpg");
    expect(unknown.status).toBe(404);
    expect((await errorsOf(unknown))[0].field).toBe("readingId");
    // Another project's reading, sent to that project's address by a manager there: not found.
    expect((await upload("outsider", readingId, await photoWithGps(), "a.jpg", "image/jpeg", otherProjectId)).status).toBe(404);
    const json = await call(readingPhotosAction as never, "dewatering", `${base()}/water-quality/readings/${readingId}/photos`, { method: "POST", body: "{}", headers: { "Content-Type": "application/json" } }, { readingId: String(readingId) });
    expect(json.status).toBe(415);
    const none = await call(readingPhotosAction as never, "dewatering", `${base()}/water-quality/readings/${readingId}/photos`, { method: "POST", body: (() => { const form = new FormData(); form.set("note", "no photo"); return form; })() }, { readingId: String(readingId) });
    expect(none.status).toBe(422);
    expect((await errorsOf(none))[0].field).toBe("file");
    expect([await counts(), await objects()]).toEqual(before);
  });
});

describe("the reading form carries the reading and its photo at once", () => {
  const statusOf = (answer: unknown) => (answer as { init?: { status?: number } } | null)?.init?.status ?? 200;
  async function postPage(who: Role, form: FormData) {
    const request = await requestAs(users.get(who)!, `/projects/${projectId}/water-quality`, { method: "POST", body: form, headers: { Origin: ORIGIN } });
    try {
      const answer = await waterQualityPage({ request, params: { projectId: String(projectId) }, context: {} } as never);
      return { status: statusOf(answer), body: ((answer as { data?: unknown }).data ?? answer) as { errors: Record<string, string>; notice: string | null } };
    } catch (error) {
      if (error instanceof Response) return { status: error.status, body: { errors: {}, notice: null } };
      throw error;
    }
  }
  const readingForm = (entries: Record<string, string>, file?: { bytes: Uint8Array; name: string; type: string }) => {
    const form = new FormData();
    for (const [name, value] of Object.entries({
      intent: "reading", station: "BG-1 up-current", takenAt: "2026-10-06T08:15", value: "7.4", unit: "NTU", depth: "", instrument: "Turbidimeter T-2", calibratedAt: "",
      sampledBy: "", ph: "", dissolvedOxygen: "", temperature: "", note: "", idempotencyKey: crypto.randomUUID(), ...entries,
    })) form.set(name, value);
    // As a browser sends a form whose file input was left empty: a part with no name and no bytes.
    form.set("file", file ? new Blob([new Uint8Array(file.bytes)], { type: file.type }) : new Blob([], { type: "application/octet-stream" }), file?.name ?? "");
    return form;
  };

  it("records a reading with its photo from the page, and one without", async () => {
    const withPhoto = await postPage("dewatering", readingForm({}, { bytes: await photoWithGps(), name: "meter.jpg", type: "image/jpeg" }));
    expect(withPhoto.status).toBe(200);
    expect(withPhoto.body.notice).toBe("Reading saved with its photo.");
    const reading = await WaterQualityReading.findOne({ where: { projectId, localDay: "2026-10-06" }, include: [{ model: WaterQualityReadingPhoto, as: "photos" }] });
    expect(reading!.value).toBe(7.4);
    expect(reading!.photos!.map((photo) => photo.originalFileName)).toEqual(["meter.jpg"]);
    // The camera's position is kept in the record (as for the other photos), never in the stored image.
    expect(reading!.photos![0].exif).toMatchObject({ camera: expect.stringContaining("Fieldcam") });
    const without = await postPage("dewatering", readingForm({ takenAt: "2026-10-06T09:15", value: "6.9" }));
    expect(without.status).toBe(200);
    expect(without.body.notice).toBe("Reading saved.");
    const page = (await waterQualityPageLoader({ request: await requestAs(users.get("viewer")!, `/projects/${projectId}/water-quality`), params: { projectId: String(projectId) }, context: {} } as never)) as { canRecord: boolean; readings: Array<{ value: number; photos: unknown[] }> };
    expect(page.canRecord).toBe(false);
    expect(page.readings.find((shown) => shown.value === 7.4)!.photos).toHaveLength(1);
  });

  it("stores nothing of the reading when its photo is refused, and names the photo field", async () => {
    const before = [await counts(), await objects()];
    const notImage = await postPage("dewatering", readingForm({ takenAt: "2026-10-06T10:15" }, { bytes: new TextEncoder().encode("not a photo"), name: "meter.jpg", type: "image/jpeg" }));
    expect(notImage.status).toBe(400);
    expect(notImage.body.errors.file).toMatch(/not an image/);
    const empty = await postPage("dewatering", readingForm({ takenAt: "2026-10-06T10:20" }, { bytes: new Uint8Array(0), name: "meter.jpg", type: "image/jpeg" }));
    expect(empty.status).toBe(400);
    expect(empty.body.errors.file).toBe(`"meter.jpg" is an empty file; choose the photo again.`);
    // A bad reading with a good photo: the reading's field is named, and the photo is not kept either.
    const badValue = await postPage("dewatering", readingForm({ takenAt: "2026-10-06T10:25", value: "-3" }, { bytes: await photoWithGps(), name: "meter.jpg", type: "image/jpeg" }));
    expect(badValue.status).toBe(400);
    expect(Object.keys(badValue.body.errors)).toEqual(["value"]);
    // A viewer's multipart form is refused before the photo is read.
    expect((await postPage("viewer", readingForm({ takenAt: "2026-10-06T10:30" }, { bytes: await photoWithGps(), name: "meter.jpg", type: "image/jpeg" }))).status).toBe(403);
    expect([await counts(), await objects()]).toEqual(before);
  });
});
