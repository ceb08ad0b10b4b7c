import "fake-indexeddb/auto";
import { IDBFactory } from "fake-indexeddb";
import { openDB } from "idb";
import { beforeEach, describe, expect, it } from "vitest";
import {
  claimEntries, closeFieldDb, countUnsent, deleteEntry, deleteWithDependents, dependentsOf, FIELD_DB_NAME, FIELD_DB_VERSION, fieldDb, forgetUser, markSent, ownersWithWaiting,
  putEntry, queuedEntries, queuedEntry, releaseSendingLease, SENDING_LEASE_MS, sentEntries, syncState, takeSendingLease, unownedEntries, type QueueEntry, type SentEntry,
} from "./store";

// The device's store run against fake-indexeddb, an in-memory IndexedDB that follows the
// specification (versions, upgrade transactions, indexes, structured clone of Blobs): what the
// field page and the service worker read and write.

beforeEach(() => {
  closeFieldDb();
  // A fresh, empty IndexedDB for every test: nothing carried over.
  globalThis.indexedDB = new IDBFactory();
});

let counter = 0;
function entry(change: Partial<QueueEntry> = {}): QueueEntry {
  counter += 1;
  return {
    id: `entry-${counter}`, userId: 5, projectId: 1, kind: "reading", order: counter, capturedAt: "2026-12-03T10:42:00-05:00",
    form: { note: `reading ${counter}` }, body: { station: 3, value: 4.2, unit: "NTU", takenAt: "2026-12-03T10:42:00-05:00", note: `reading ${counter}` },
    photos: [], status: "waiting", attempts: 0, summary: `Reading · CP-1 · 4.2 NTU (${counter})`, ...change,
  };
}

function sentOf(queued: QueueEntry, serverId: number, sentAt = "2026-12-03T16:00:00.000Z"): SentEntry {
  return { id: queued.id, userId: queued.userId, projectId: queued.projectId, kind: queued.kind, summary: queued.summary, capturedAt: queued.capturedAt, sentAt, serverId, notices: [], replayed: false };
}

describe("the queue: add, edit, delete", () => {
  it("keeps entries in the order they were made, takes an edit in place, and deletes one", async () => {
    const later = entry({ order: 20 });
    const earlier = entry({ order: 10 });
    await putEntry(later);
    await putEntry(earlier);
    expect((await queuedEntries({ userId: 5, projectId: 1 })).map((queued) => queued.id)).toEqual([earlier.id, later.id]);

    await putEntry({ ...earlier, form: { note: "corrected" }, body: { ...earlier.body, value: 5.1 } });
    const queued = await queuedEntries({ userId: 5, projectId: 1 });
    expect(queued).toHaveLength(2);
    expect(queued[0]).toMatchObject({ id: earlier.id, form: { note: "corrected" }, body: { value: 5.1 } });

    await deleteEntry(earlier);
    expect((await queuedEntries({ userId: 5, projectId: 1 })).map((remaining) => remaining.id)).toEqual([later.id]);
    expect(await queuedEntry(earlier.id)).toBeUndefined();
  });

  it("a stored entry leaves the queue and joins the sent list in one step; a handover waiting for it keeps the find's server id", async () => {
    const find = entry({ kind: "find" });
    const handover = entry({ kind: "custody", parent: find.id, form: { find: `queued:${find.id}` } });
    await putEntry(find);
    await putEntry(handover);
    await markSent(find, sentOf(find, 301));
    expect(await queuedEntry(find.id)).toBeUndefined();
    expect((await sentEntries({ userId: 5, projectId: 1 })).map((sent) => [sent.id, sent.serverId])).toEqual([[find.id, 301]]);
    expect((await queuedEntry(handover.id))?.parentServerId).toBe(301);
    expect((await syncState({ userId: 5, projectId: 1 })).lastSentAt).toBe("2026-12-03T16:00:00.000Z");
  });
});

describe("each person's entries are their own", () => {
  it("another person on the same device neither lists nor counts them, and signing out removes only the leaver's", async () => {
    const mine = entry({ userId: 5 });
    const theirs = entry({ userId: 8 });
    const mineElsewhere = entry({ userId: 5, projectId: 2 });
    for (const queued of [mine, theirs, mineElsewhere]) await putEntry(queued);

    expect((await queuedEntries({ userId: 5, projectId: 1 })).map((queued) => queued.id)).toEqual([mine.id]);
    expect((await queuedEntries({ userId: 8, projectId: 1 })).map((queued) => queued.id)).toEqual([theirs.id]);
    expect(await countUnsent(5)).toBe(2);
    expect(await countUnsent(8)).toBe(1);
    expect(await ownersWithWaiting()).toEqual(expect.arrayContaining([{ userId: 5, projectId: 1 }, { userId: 8, projectId: 1 }, { userId: 5, projectId: 2 }]));

    expect(await forgetUser(5)).toBe(2);
    expect(await countUnsent(5)).toBe(0);
    expect((await queuedEntries({ userId: 8, projectId: 1 })).map((queued) => queued.id)).toEqual([theirs.id]);
  });
});

describe("the store outlives the page", () => {
  it("an entry and its photo's bytes are there after the store is closed and opened again (a reload, a closed tab)", async () => {
    const bytes = new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3, 4]);
    const find = entry({ kind: "find", photos: [{ id: "photo-1", name: "can.jpg", type: "image/jpeg", blob: new Blob([bytes], { type: "image/jpeg" }) }] });
    await putEntry(find);
    const first = await fieldDb();
    closeFieldDb();
    const second = await fieldDb();
    expect(second).not.toBe(first);
    const [kept] = await queuedEntries({ userId: 5, projectId: 1 });
    expect(kept.id).toBe(find.id);
    expect(kept.photos[0].blob).toBeInstanceOf(Blob);
    expect(new Uint8Array(await kept.photos[0].blob.arrayBuffer())).toEqual(bytes);
  });

  it("a reading's photo is kept as a Blob with the reading, and its sent mark survives while another photo still waits", async () => {
    const first = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 9, 8, 7]);
    const second = new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 5, 5]);
    const withPhotos = entry({
      kind: "reading",
      photos: [
        { id: "reading-photo-1", name: "bottle.png", type: "image/png", blob: new Blob([first], { type: "image/png" }) },
        { id: "reading-photo-2", name: "meter.jpg", type: "image/jpeg", blob: new Blob([second], { type: "image/jpeg" }) },
      ],
    });
    await putEntry(withPhotos);
    // Stored on the server with its first photo; the second still to go.
    await putEntry({ ...withPhotos, serverId: 71, photos: [{ ...withPhotos.photos[0], sentId: 9 }, withPhotos.photos[1]] });
    closeFieldDb();
    const kept = (await queuedEntry(withPhotos.id))!;
    expect(kept.kind).toBe("reading");
    expect(kept.serverId).toBe(71);
    expect(kept.photos.map((photo) => [photo.id, photo.name, photo.type, photo.sentId])).toEqual([["reading-photo-1", "bottle.png", "image/png", 9], ["reading-photo-2", "meter.jpg", "image/jpeg", undefined]]);
    expect(kept.photos[1].blob).toBeInstanceOf(Blob);
    expect(new Uint8Array(await kept.photos[1].blob.arrayBuffer())).toEqual(second);
  });
});

/** The store as version 1 laid it out: no owner on entries, no byOwner index, sending state by project. */
async function openVersion1() {
  return openDB(FIELD_DB_NAME, 1, {
    upgrade(db) {
      db.createObjectStore("projects", { keyPath: "projectId" });
      db.createObjectStore("queue", { keyPath: "id" }).createIndex("byProject", "projectId");
      db.createObjectStore("sent", { keyPath: "id" }).createIndex("byProject", "projectId");
      db.createObjectStore("sync", { keyPath: "projectId" });
    },
  });
}

function withoutOwner(queued: QueueEntry): Omit<QueueEntry, "userId"> {
  const { userId: _userId, ...rest } = queued;
  return rest;
}

describe("upgrading the store from version 1 (entries with no author)", () => {
  it("keeps every entry; none joins anyone's queue or the background sending until a person claims it", async () => {
    const find = entry({ kind: "find", order: 1 });
    const handover = entry({ kind: "custody", order: 2, form: { find: `queued:${find.id}` } }); // version 1 named its find in the form only
    const reading = entry({ order: 3 });
    const otherProject = entry({ projectId: 2, order: 4 });
    const v1 = await openVersion1();
    for (const queued of [find, handover, reading, otherProject]) await v1.put("queue", withoutOwner(queued));
    await v1.put("sent", withoutOwner(entry()) as never);
    await v1.put("sync", { projectId: 1, lastSentAt: "2026-11-30T12:00:00.000Z" });
    v1.close();

    const db = await fieldDb();
    expect(db.version).toBe(FIELD_DB_VERSION);
    expect([...db.objectStoreNames].sort()).toEqual(["projects", "queue", "sent", "sync"]);
    expect(await db.count("queue")).toBe(4);
    expect((await unownedEntries(1)).map((queued) => queued.id)).toEqual([find.id, handover.id, reading.id]);
    expect(await queuedEntries({ userId: 5, projectId: 1 })).toEqual([]);
    expect(await ownersWithWaiting()).toEqual([]);
    expect(await countUnsent(5)).toBe(0);

    // Claiming the handover takes the find it is for with it: neither can be sent alone.
    expect((await claimEntries({ userId: 5, projectId: 1 }, [handover.id])).sort()).toEqual([find.id, handover.id].sort());
    expect((await queuedEntries({ userId: 5, projectId: 1 })).map((queued) => queued.id)).toEqual([find.id, handover.id]);
    expect((await unownedEntries(1)).map((queued) => queued.id)).toEqual([reading.id]);
    expect(await ownersWithWaiting()).toEqual([{ userId: 5, projectId: 1 }]);
    // Another person's claim does not reach entries already claimed.
    expect(await claimEntries({ userId: 8, projectId: 1 }, [find.id])).toEqual([]);

    // One nobody wants is deleted; the other project's stays for whoever made it.
    await deleteWithDependents((await unownedEntries(1))[0]);
    expect(await unownedEntries(1)).toEqual([]);
    expect((await unownedEntries(2)).map((queued) => queued.id)).toEqual([otherProject.id]);
  });

  it("a store already at version 2 opens without an upgrade and keeps what it holds", async () => {
    await putEntry(entry());
    closeFieldDb();
    expect(await (await fieldDb()).count("queue")).toBe(1);
  });
});

describe("a find and the handovers that need it", () => {
  it("finds the dependants through parent and through the form's queued find, and deletes them with the find in one step", async () => {
    const find = entry({ kind: "find" });
    const byParent = entry({ kind: "custody", parent: find.id, form: { find: `queued:${find.id}` } });
    const byForm = entry({ kind: "custody", form: { find: `queued:${find.id}` } });
    const unrelated = entry({ kind: "custody", form: { find: "11" } });
    const someoneElses = entry({ kind: "custody", userId: 8, form: { find: `queued:${find.id}` } });
    for (const queued of [find, byParent, byForm, unrelated, someoneElses]) await putEntry(queued);

    const mine = await queuedEntries({ userId: 5, projectId: 1 });
    expect(dependentsOf(find.id, mine).map((dependent) => dependent.id).sort()).toEqual([byParent.id, byForm.id].sort());
    expect(dependentsOf(unrelated.id, mine)).toEqual([]);

    expect((await deleteWithDependents(find)).sort()).toEqual([find.id, byParent.id, byForm.id].sort());
    expect((await queuedEntries({ userId: 5, projectId: 1 })).map((queued) => queued.id)).toEqual([unrelated.id]);
    expect(await queuedEntry(someoneElses.id)).toBeDefined();
  });
});

describe("one sender at a time without Web Locks: the sending mark", () => {
  it("is refused to a second sender while the first holds it, renewed by its holder, and free once given up or run out", async () => {
    const owner = { userId: 5, projectId: 1 };
    const now = Date.parse("2026-12-03T16:00:00Z");
    expect(await takeSendingLease(owner, "page", now)).toBe(true);
    expect(await takeSendingLease(owner, "worker", now + 1000)).toBe(false);
    expect(await takeSendingLease(owner, "page", now + 60_000)).toBe(true); // renewed
    expect(await takeSendingLease(owner, "worker", now + 60_000 + SENDING_LEASE_MS - 1)).toBe(false);
    expect(await takeSendingLease(owner, "worker", now + 60_000 + SENDING_LEASE_MS + 1)).toBe(true); // the page was closed mid-run: its mark ran out
    await releaseSendingLease(owner, "page"); // not the holder: changes nothing
    expect(await takeSendingLease(owner, "page", now + 120_000 + SENDING_LEASE_MS)).toBe(false);
    await releaseSendingLease(owner, "worker");
    expect(await takeSendingLease(owner, "page", now + 120_000 + SENDING_LEASE_MS)).toBe(true);
    // Another person's mark is their own.
    expect(await takeSendingLease({ userId: 8, projectId: 1 }, "worker", now)).toBe(true);
  });
});
