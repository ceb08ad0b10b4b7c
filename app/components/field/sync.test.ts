import "fake-indexeddb/auto";
import { IDBFactory } from "fake-indexeddb";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { closeFieldDb, deleteEntry, putEntry, queuedEntries, queuedEntry, sentEntries, type QueueEntry } from "./store";
import { sendAllWaiting, sendQueue } from "./sync";

// The sender the page and the service worker share, against fake-indexeddb and a stand-in for
// fetch that answers as the server's API does (201 stored, 200 replayed for a key it has seen,
// 409 for an entry whose author is not the one signed in). No browser: no Web Locks here, so the
// one-sender rule is the store's sending mark.

interface Call {
  url: string;
  method: string;
  key: string | null;
  author: string | null;
}

/** The server as the sender sees it: one record per Idempotency-Key, whoever is signed in. */
function fakeServer(signedIn: number) {
  const calls: Call[] = [];
  const stored = new Map<string, number>();
  let nextId = 500;
  let gate: Promise<void> = Promise.resolve();
  let dropNext = 0;
  const fetch = vi.fn(async (input: string | URL | Request, init: RequestInit = {}) => {
    const headers = new Headers(init.headers);
    const call = { url: String(input), method: init.method ?? "GET", key: headers.get("Idempotency-Key"), author: headers.get("Firmsand-Entry-User") };
    calls.push(call);
    await gate;
    const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { "Content-Type": "application/json", Date: new Date().toUTCString() } });
    if (call.author !== String(signedIn)) return json(409, { errors: [{ field: "Firmsand-Entry-User", message: "This entry was made by another account." }] });
    const replayed = call.key !== null && stored.has(call.key);
    const id = replayed ? stored.get(call.key!)! : nextId++;
    if (call.key !== null) stored.set(call.key, id);
    if (dropNext > 0) {
      // Stored, but the answer is lost on the way back.
      dropNext -= 1;
      throw new TypeError("Failed to fetch");
    }
    return json(replayed ? 200 : 201, { id });
  });
  return {
    fetch, calls, stored,
    hold() {
      let release!: () => void;
      gate = new Promise((resolve) => (release = resolve));
      return release;
    },
    loseNextAnswer() {
      dropNext += 1;
    },
  };
}

let counter = 0;
function reading(change: Partial<QueueEntry> = {}): QueueEntry {
  counter += 1;
  return {
    id: `reading-${counter}`, userId: 5, projectId: 1, kind: "reading", order: counter, capturedAt: "2026-12-03T10:42:00-05:00", form: {},
    body: { station: 3, value: 4.2, unit: "NTU", takenAt: "2026-12-03T10:42:00-05:00" }, photos: [], status: "waiting", attempts: 0, summary: `Reading ${counter}`, ...change,
  };
}

beforeEach(() => {
  closeFieldDb();
  globalThis.indexedDB = new IDBFactory();
});
afterEach(() => {
  vi.unstubAllGlobals();
});

describe("the service worker's background sending", () => {
  it("sends every waiting entry once, each with its own Idempotency-Key and its author's name, and leaves entries with no author alone", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const first = reading();
    const second = reading();
    await putEntry(first);
    await putEntry(second);
    await putEntry({ ...reading(), userId: undefined as unknown as number }); // kept before entries had an author

    const reports = await sendAllWaiting(null);
    expect(reports).toHaveLength(1);
    expect(reports[0].sent.map((sent) => [sent.id, sent.serverId])).toEqual([[first.id, 500], [second.id, 501]]);
    expect(server.calls.map((call) => [call.url, call.method, call.key, call.author])).toEqual([
      ["/api/projects/1/water-quality/readings", "POST", first.id, "5"],
      ["/api/projects/1/water-quality/readings", "POST", second.id, "5"],
    ]);
    expect(await queuedEntries({ userId: 5, projectId: 1 })).toEqual([]);
    expect((await sentEntries({ userId: 5, projectId: 1 })).map((sent) => sent.id).sort()).toEqual([first.id, second.id].sort());
  });

  it("a lost answer: the run fails so the browser tries again, and the retry with the same key stores nothing twice", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const lost = reading();
    await putEntry(lost);
    server.loseNextAnswer();
    await expect(sendAllWaiting(null)).rejects.toThrow(/No connection/);
    expect(await queuedEntry(lost.id)).toMatchObject({ status: "waiting", mayHaveReachedServer: true, attempts: 1 });

    const [report] = await sendAllWaiting(null);
    expect(report.sent).toMatchObject([{ id: lost.id, serverId: 500, replayed: true }]);
    expect(server.calls.map((call) => call.key)).toEqual([lost.id, lost.id]);
    expect(server.stored.size).toBe(1);
  });

  it("an entry whose author is not the one signed in waits for them, and the browser is not asked to try again", async () => {
    const server = fakeServer(8);
    vi.stubGlobal("fetch", server.fetch);
    const waiting = reading();
    await putEntry(waiting);
    const [report] = await sendAllWaiting(null);
    expect(report.stoppedBy).toBe("signed-out");
    expect(await queuedEntry(waiting.id)).toMatchObject({ status: "waiting" });
    expect(server.stored.size).toBe(0);
  });

  it("a handover of a find made offline goes after the find, to the id the server gave it", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const find = reading({ kind: "find", body: { category: "modern-debris", description: "a can", foundAt: "2026-12-03T10:42:00-05:00" } });
    const handover = reading({ kind: "custody", parent: find.id, form: { find: `queued:${find.id}` }, body: { fromName: "A", toName: "B", place: "lab", purpose: "to-state-lab", handedAt: "2026-12-03T11:00:00-05:00", receiverSignature: "B" } });
    await putEntry(find);
    await putEntry(handover);
    await sendAllWaiting(null);
    expect(server.calls.map((call) => call.url)).toEqual(["/api/projects/1/finds", "/api/projects/1/finds/500/custody"]);
  });

  it("a reading's photo goes after the reading, to the id the server gave it, with the photo's own key; a lost answer resends only the photo", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const withPhoto = reading({ photos: [{ id: "photo-of-jar", name: "sample.jpg", type: "image/jpeg", blob: new Blob([new Uint8Array([0xff, 0xd8, 0xff, 0xe0])], { type: "image/jpeg" }) }] });
    await putEntry(withPhoto);
    // The reading is stored (500), then the photo's answer is lost: the reading keeps its id, the photo waits.
    const original = server.fetch.getMockImplementation()!;
    server.fetch.mockImplementationOnce(original).mockImplementationOnce(async (input, init) => {
      server.loseNextAnswer();
      return original(input, init);
    });
    await expect(sendAllWaiting(null)).rejects.toThrow(/No connection/);
    expect(await queuedEntry(withPhoto.id)).toMatchObject({ status: "waiting", serverId: 500 });
    const [report] = await sendAllWaiting(null);
    expect(report.sent).toMatchObject([{ id: withPhoto.id, serverId: 500 }]);
    expect(server.calls.map((call) => [call.url, call.key])).toEqual([
      ["/api/projects/1/water-quality/readings", withPhoto.id],
      ["/api/projects/1/water-quality/readings/500/photos", "photo-of-jar"],
      ["/api/projects/1/water-quality/readings/500/photos", "photo-of-jar"],
    ]);
    // One reading and one photo stored: the retry replayed the photo's key.
    expect(server.stored.size).toBe(2);
  });
});

describe("one sender at a time: the page and the worker never send the same entries at once", () => {
  it("while one context sends, another finds the mark taken and stops; nothing is sent twice", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const entries = [reading(), reading(), reading()];
    for (const queued of entries) await putEntry(queued);

    // Two contexts (the page and the service worker) each with their own copy of the modules, as in a browser.
    vi.resetModules();
    const worker = await import("./sync");
    const release = server.hold();
    const pageRun = sendQueue({ userId: 5, projectId: 1 }, () => {}, null);
    await vi.waitFor(() => expect(server.calls).toHaveLength(1));
    const workerRun = await worker.sendQueue({ userId: 5, projectId: 1 }, () => {}, null);
    expect(workerRun).toMatchObject({ sent: [], stoppedBy: "busy" });
    release();
    const page = await pageRun;
    expect(page.sent.map((sent) => sent.id)).toEqual(entries.map((queued) => queued.id));
    expect(server.calls.map((call) => call.key)).toEqual(entries.map((queued) => queued.id));

    // Once the first is done, the mark is free again.
    await putEntry(reading());
    const later = await worker.sendQueue({ userId: 5, projectId: 1 }, () => {}, null);
    expect(later.sent).toHaveLength(1);
    expect(later.stoppedBy).toBeUndefined();
  });

  it("an entry deleted while the run was under way is not sent", async () => {
    const server = fakeServer(5);
    vi.stubGlobal("fetch", server.fetch);
    const first = reading();
    const second = reading();
    await putEntry(first);
    await putEntry(second);
    const release = server.hold();
    const run = sendQueue({ userId: 5, projectId: 1 }, () => {}, null);
    await vi.waitFor(() => expect(server.calls).toHaveLength(1));
    await deleteEntry(second);
    release();
    expect((await run).sent.map((sent) => sent.id)).toEqual([first.id]);
    expect(server.calls.map((call) => call.key)).toEqual([first.id]);
  });
});
