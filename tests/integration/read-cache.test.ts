import { afterAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { writeRevision } from "../../db/models/write-revision";
import { AuditEvent, SignInSession, Zone, getSequelize } from "~/lib/db.server";
import { keepRenderedForReader } from "~/lib/cache/document-cache.server";
import { signOut } from "~/lib/auth/session.server";
import * as progressApi from "~/routes/api.projects.$projectId.progress";
import { addMember, makeProject, makeUser, requestAs } from "./helpers";

// The read cache against the real database: which writes move the revision (every model write but
// the ones no cached read shows), and what the progress API and a kept page answer after a write.

afterAll(closeSequelize);

const SQUARE = JSON.stringify({ type: "Polygon", coordinates: [[[0, 0], [0, 10], [10, 10], [10, 0], [0, 0]]] });

describe("the write revision", () => {
  it("moves on every kind of model write and again when a transaction commits", async () => {
    const project = await makeProject("revision");
    let before = writeRevision();
    const zone = await Zone.create({ projectId: project.id, name: "North run", polygonGeoJson: SQUARE, sortOrder: 1 });
    expect(writeRevision()).toBeGreaterThan(before);
    before = writeRevision();
    zone.name = "North run (east)";
    await zone.save();
    expect(writeRevision()).toBeGreaterThan(before);
    before = writeRevision();
    await Zone.update({ sortOrder: 2 }, { where: { id: zone.id } });
    expect(writeRevision()).toBeGreaterThan(before);
    before = writeRevision();
    await Zone.bulkCreate([{ projectId: project.id, name: "Upper run", polygonGeoJson: SQUARE, sortOrder: 3 }]);
    expect(writeRevision()).toBeGreaterThan(before);
    before = writeRevision();
    await Zone.destroy({ where: { projectId: project.id, name: "Upper run" } });
    expect(writeRevision()).toBeGreaterThan(before);

    const transaction = await getSequelize().transaction();
    await Zone.update({ sortOrder: 4 }, { where: { id: zone.id }, transaction });
    const atStatement = writeRevision();
    await transaction.commit();
    expect(writeRevision()).toBeGreaterThan(atStatement);
  });

  it("stays put for the rows no cached read shows: sessions and the audit log", async () => {
    const user = await makeUser("revision-quiet");
    const before = writeRevision();
    await SignInSession.update({ lastSeenAt: new Date() }, { where: { userId: user.id } });
    await AuditEvent.create({ action: "test.read-cache", detail: {}, ip: null, userId: user.id, projectId: null });
    expect(writeRevision()).toBe(before);
  });
});

describe("the progress API", () => {
  it("answers the kept figures until a write, then the new ones", async () => {
    const project = await makeProject("progress-cache");
    const manager = await makeUser("progress-cache-manager");
    await addMember(manager.id, project.id, "manager");
    const read = async () => (await (await progressApi.loader({ request: await requestAs(manager.id, `/api/projects/${project.id}/progress`), params: { projectId: String(project.id) } } as never)).json()) as { zones: Array<{ name: string }> };
    expect((await read()).zones).toEqual([]);
    await Zone.create({ projectId: project.id, name: "Spring pool", polygonGeoJson: SQUARE, sortOrder: 1 });
    expect((await read()).zones.map((zone) => zone.name)).toEqual(["Spring pool"]);
  });
});

describe("a page kept per reader", () => {
  const KIND = "x-firmsand-request-kind"; // set by app/serve.mjs on every request
  const asDocument = (userId: number, path: string) => requestAs(userId, path, { headers: { [KIND]: "document" } });
  function page(body: string, init: ResponseInit = {}) {
    let calls = 0;
    return { next: async () => { calls++; return new Response(`${body} ${calls}`, { status: 200, headers: { "Content-Type": "text/html" }, ...init }); }, get calls() { return calls; } };
  }

  it("renders once per reader, session and URL while nothing is written", async () => {
    const reader = await makeUser("kept-page-reader");
    const request = await asDocument(reader.id, "/projects/1");
    const render = page("overview");
    const first = await keepRenderedForReader({ request }, render.next);
    const second = await keepRenderedForReader({ request: new Request(request) }, render.next);
    expect(await first.text()).toBe("overview 1");
    expect(await second.text()).toBe("overview 1");
    expect(second.headers.get("Content-Type")).toBe("text/html");
    expect(render.calls).toBe(1);
    // Another session of the same reader, another URL, another reader: each rendered for itself.
    await keepRenderedForReader({ request: await asDocument(reader.id, "/projects/1") }, render.next);
    await keepRenderedForReader({ request: new Request(request.url + "?zone=2", { headers: request.headers }) }, render.next);
    const other = await makeUser("kept-page-other");
    expect(await (await keepRenderedForReader({ request: await asDocument(other.id, "/projects/1") }, render.next)).text()).toBe("overview 4");
    expect(render.calls).toBe(4);
  });

  it("keeps a page's document and its data (a navigation inside the app, same URL here) apart, and keeps nothing the production server did not mark", async () => {
    const reader = await makeUser("kept-page-kinds");
    const document = await asDocument(reader.id, "/projects/5");
    const data = new Request(document.url, { headers: { Cookie: document.headers.get("Cookie")!, [KIND]: "data" } });
    const unmarked = new Request(document.url, { headers: { Cookie: document.headers.get("Cookie")! } });
    const render = page("answer");
    expect(await (await keepRenderedForReader({ request: document }, render.next)).text()).toBe("answer 1");
    expect(await (await keepRenderedForReader({ request: data }, render.next)).text()).toBe("answer 2");
    expect(await (await keepRenderedForReader({ request: new Request(document) }, render.next)).text()).toBe("answer 1");
    expect(await (await keepRenderedForReader({ request: new Request(data) }, render.next)).text()).toBe("answer 2");
    await keepRenderedForReader({ request: unmarked }, render.next);
    await keepRenderedForReader({ request: new Request(unmarked) }, render.next);
    expect(render.calls).toBe(4);
  });

  it("renders again after any write", async () => {
    const reader = await makeUser("kept-page-write");
    const request = await asDocument(reader.id, "/projects/2");
    const render = page("overview");
    await keepRenderedForReader({ request }, render.next);
    await makeProject("kept-page-write");
    expect(await (await keepRenderedForReader({ request: new Request(request) }, render.next)).text()).toBe("overview 2");
  });

  it("keeps nothing for a session that ended, a signed-out reader, a refusal or an answer that sets a cookie", async () => {
    const reader = await makeUser("kept-page-ended");
    const request = await asDocument(reader.id, "/projects/3");
    const render = page("overview");
    await keepRenderedForReader({ request }, render.next);
    await signOut(new Request(request));
    expect(await (await keepRenderedForReader({ request: new Request(request) }, render.next)).text()).toBe("overview 2");

    const anonymous = page("sign in");
    await keepRenderedForReader({ request: new Request("http://127.0.0.1:3999/projects/3", { headers: { [KIND]: "document" } }) }, anonymous.next);
    await keepRenderedForReader({ request: new Request("http://127.0.0.1:3999/projects/3", { headers: { [KIND]: "document" } }) }, anonymous.next);
    expect(anonymous.calls).toBe(2);

    const live = await asDocument(reader.id, "/projects/4");
    const refused = page("not yours", { status: 403 });
    await keepRenderedForReader({ request: live }, refused.next);
    await keepRenderedForReader({ request: new Request(live) }, refused.next);
    expect(refused.calls).toBe(2);
    const cookie = page("refreshed", { headers: { "Content-Type": "text/html", "Set-Cookie": "a=b" } });
    await keepRenderedForReader({ request: live }, cookie.next);
    await keepRenderedForReader({ request: new Request(live) }, cookie.next);
    expect(cookie.calls).toBe(2);
  });
});
