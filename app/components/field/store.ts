import { openDB, type DBSchema, type IDBPDatabase } from "idb";
import type { FieldSnapshot } from "~/models/field-snapshot";

/**
 * The field page's storage on the device (IndexedDB, through idb): the project data it needs to
 * take entries with no signal, the queue of entries waiting to be sent, the last entries sent, and
 * when the queue last sent something. IndexedDB outlives a reload, a closed tab and a phone
 * restart; a photo is kept as a Blob until it has been sent. public/offline.html reads the
 * "projects" store by name, so its name and key stay as they are.
 *
 * Entries, the sent list and the sending state belong to the person who made them (`userId`, from
 * the page's data): another person signed in on the same phone never sees or sends them, and
 * signing out clears that person's entries and kept project data (forgetUser).
 */

export const FIELD_DB_NAME = "firmsand-field";

export type EntryKind = "dive" | "reading" | "find" | "find-status" | "custody" | "sighting" | "tube-fill" | "tube-status" | "shift" | "jar-test" | "haul";

/** A form's value naming a find made on this device and not yet sent: "queued:<its entry id>". */
export const QUEUED_PREFIX = "queued:";

export interface QueuedPhoto {
  /** Client id: the photo upload's Idempotency-Key. */
  id: string;
  name: string;
  type: string;
  blob: Blob;
  /** The stored photo's id once sent. */
  sentId?: number;
}

export interface QueueEntry {
  /** crypto.randomUUID(): the record's Idempotency-Key, so a retry never stores it twice. */
  id: string;
  /** Who made it: only this person's page shows and sends it. */
  userId: number;
  projectId: number;
  kind: EntryKind;
  /**
   * The queued entry whose record this one needs (a handover of a find made offline): sent after it,
   * to the id the server gave it (`parentServerId` once known).
   */
  parent?: string;
  parentServerId?: number;
  /** Sending order: entries go in the order they were made. */
  order: number;
  /** The device's clock when the entry was made, with its offset. */
  capturedAt: string;
  /** What the form held (re-opened for editing). */
  form: Record<string, string | boolean>;
  /** The API's JSON body, checked with the server's schema when saved. */
  body: Record<string, unknown>;
  photos: QueuedPhoto[];
  /** Set once the server has stored the record (a find, reading, jar test or ticket whose photos are still to go). */
  serverId?: number;
  /**
   * waiting: to be sent; rejected: the server refused it (message says why), the user fixes it;
   * conflict: an edit of a record that changed on the server meanwhile (412), the user chooses.
   */
  status: "waiting" | "rejected" | "conflict";
  /** An edit's If-Match: the record's version when the edit was made (a tube's or a find's status). */
  ifMatch?: string;
  /** The record as the server has it now, from the 412 answer, shown beside the edit. */
  current?: Record<string, unknown>;
  message?: string;
  fieldErrors?: Record<string, string>;
  attempts: number;
  lastAttemptAt?: string;
  /** The last attempt's outcome was unknown (no answer): the server may have stored it. */
  mayHaveReachedServer?: boolean;
  summary: string;
  /** Safety notices the server answered with while the record's photos were still to go. */
  notices?: string[];
}

export interface SentEntry {
  id: string;
  userId: number;
  projectId: number;
  kind: EntryKind;
  summary: string;
  capturedAt: string;
  sentAt: string;
  serverId: number;
  /** Safety notices from the server's answer (exceedance, stop-work, stand-down, hold, no-decompression). */
  notices: string[];
  /** The answer was 200: the server had it already (a retry after a lost answer). */
  replayed: boolean;
}

export interface SyncState {
  userId: number;
  projectId: number;
  lastSentAt?: string;
  lastAttemptAt?: string;
  /** Server clock minus device clock, from the Date header of the last answer. */
  clockOffsetMs?: number;
  /**
   * Who is sending this person's entries now (a window or the service worker) and until when
   * (epoch ms): the one-sender mark where the browser has no Web Locks (takeSendingLease).
   */
  sendingBy?: string;
  sendingUntil?: number;
}

interface FieldDb extends DBSchema {
  projects: { key: number; value: { projectId: number; userId?: number; snapshot: FieldSnapshot; savedAt: string; project: { name: string } } };
  queue: { key: string; value: QueueEntry; indexes: { byProject: number; byOwner: [number, number] } };
  sent: { key: string; value: SentEntry; indexes: { byProject: number; byOwner: [number, number] } };
  sync: { key: [number, number]; value: SyncState };
}

/** The store's version: 1 kept entries with no owner; 2 keeps each entry's author (userId). */
export const FIELD_DB_VERSION = 2;

let opened: Promise<IDBPDatabase<FieldDb>> | null = null;

export function fieldDb(): Promise<IDBPDatabase<FieldDb>> {
  opened ??= openDB<FieldDb>(FIELD_DB_NAME, FIELD_DB_VERSION, {
    upgrade(db, oldVersion, _newVersion, transaction) {
      if (oldVersion < 1) {
        db.createObjectStore("projects", { keyPath: "projectId" });
        db.createObjectStore("queue", { keyPath: "id" }).createIndex("byProject", "projectId");
        db.createObjectStore("sent", { keyPath: "id" }).createIndex("byProject", "projectId");
      }
      // Version 2: entries belong to a person. Entries kept before have no author: they stay in
      // the queue as they were, outside every person's list (the byOwner index leaves out a row
      // without userId), until someone signed in says they are theirs or deletes them
      // (unownedEntries, claimEntries); none is ever sent under a name it was not given. The
      // sending state is kept per person and project.
      transaction.objectStore("queue").createIndex("byOwner", ["userId", "projectId"]);
      transaction.objectStore("sent").createIndex("byOwner", ["userId", "projectId"]);
      if (db.objectStoreNames.contains("sync")) db.deleteObjectStore("sync");
      db.createObjectStore("sync", { keyPath: ["userId", "projectId"] });
    },
    // Another tab holds an older version open: let it go so this one can open.
    blocking() {
      closeFieldDb();
    },
  });
  return opened;
}

/** Closes this context's connection (the next call opens it again): a newer version waits on it, and tests reopen the store. */
export function closeFieldDb(): void {
  void opened?.then((db) => db.close()).catch(() => {});
  opened = null;
}

/** Tells the other tabs of this device that the queue changed. */
const channel = typeof BroadcastChannel === "undefined" ? null : new BroadcastChannel("firmsand-field");
export function announceChange(projectId: number) {
  channel?.postMessage({ projectId });
}
export function onChange(listener: (projectId: number) => void): () => void {
  if (!channel) return () => {};
  const handler = (event: MessageEvent<{ projectId: number }>) => listener(event.data.projectId);
  channel.addEventListener("message", handler);
  return () => channel.removeEventListener("message", handler);
}

export async function saveSnapshot(snapshot: FieldSnapshot): Promise<void> {
  const db = await fieldDb();
  await db.put("projects", { projectId: snapshot.project.id, userId: snapshot.user.id, snapshot, savedAt: new Date().toISOString(), project: { name: snapshot.project.name } });
}

export async function keptSnapshot(projectId: number): Promise<{ snapshot: FieldSnapshot; savedAt: string } | undefined> {
  const kept = await (await fieldDb()).get("projects", projectId);
  // A copy from before entries were kept per person carries no user: it cannot say whose it is.
  return kept?.snapshot.user ? kept : undefined;
}

/** Who owns the queue, and for which project. */
export interface Owner {
  userId: number;
  projectId: number;
}

export async function queuedEntries(owner: Owner): Promise<QueueEntry[]> {
  const entries = await (await fieldDb()).getAllFromIndex("queue", "byOwner", [owner.userId, owner.projectId]);
  return entries.sort((a, b) => a.order - b.order);
}

/** One queued entry by its id (a handover's find made on this device). */
export async function queuedEntry(id: string): Promise<QueueEntry | undefined> {
  return (await fieldDb()).get("queue", id);
}

/** A sent entry by its id: the server id of a record the queue sent. */
export async function sentEntry(id: string): Promise<SentEntry | undefined> {
  return (await fieldDb()).get("sent", id);
}

/** How many entries this person has waiting on this device, in every project (sign-out asks first). */
export async function countUnsent(userId: number): Promise<number> {
  const all = await (await fieldDb()).getAll("queue");
  return all.filter((entry) => entry.userId === userId).length;
}

export async function sentEntries(owner: Owner, limit = 20): Promise<SentEntry[]> {
  const entries = await (await fieldDb()).getAllFromIndex("sent", "byOwner", [owner.userId, owner.projectId]);
  return entries.sort((a, b) => b.sentAt.localeCompare(a.sentAt)).slice(0, limit);
}

/** The queued entry a handover needs (its find made on this device): `parent`, or the "queued:<id>" its form names. */
export function parentOf(entry: Pick<QueueEntry, "parent" | "form">): string | undefined {
  if (entry.parent !== undefined) return entry.parent;
  const find = entry.form.find;
  return typeof find === "string" && find.startsWith(QUEUED_PREFIX) ? find.slice(QUEUED_PREFIX.length) : undefined;
}

/** The entries among `entries` that need `id` to be sent first, and those that need them, and so on. */
export function dependentsOf<T extends Pick<QueueEntry, "id" | "parent" | "form">>(id: string, entries: T[]): T[] {
  const found: T[] = [];
  const wanted = new Set([id]);
  for (let grew = true; grew; ) {
    grew = false;
    for (const entry of entries) {
      const parent = parentOf(entry);
      if (parent !== undefined && wanted.has(parent) && !wanted.has(entry.id)) {
        wanted.add(entry.id);
        found.push(entry);
        grew = true;
      }
    }
  }
  return found;
}

/**
 * Entries kept on this device before entries had an author (store version 1) for a project, in
 * sending order. Nobody can say whose they are but the people who made them: the page shows them
 * apart ("whose are these?") and sends none until a person signed in claims them.
 */
export async function unownedEntries(projectId: number): Promise<QueueEntry[]> {
  const entries = await (await fieldDb()).getAllFromIndex("queue", "byProject", projectId);
  return entries.filter((entry) => entry.userId === undefined).sort((a, b) => a.order - b.order);
}

/**
 * The person signed in says these entries without an author are theirs: they join that person's
 * queue and are sent under their name. An entry goes with those it is linked to (a handover and the
 * find it needs), since neither can be sent without the other. Returns the ids claimed.
 */
export async function claimEntries(owner: Owner, ids: string[]): Promise<string[]> {
  const db = await fieldDb();
  const transaction = db.transaction("queue", "readwrite");
  const unowned = (await transaction.store.index("byProject").getAll(owner.projectId)).filter((entry) => entry.userId === undefined);
  const byId = new Map(unowned.map((entry) => [entry.id, entry]));
  const claimed = new Set<string>();
  const add = (id: string) => {
    const entry = byId.get(id);
    if (!entry || claimed.has(id)) return;
    claimed.add(id);
    const parent = parentOf(entry);
    if (parent !== undefined) add(parent);
    for (const dependent of dependentsOf(id, unowned)) add(dependent.id);
  };
  for (const id of ids) add(id);
  for (const id of claimed) await transaction.store.put({ ...byId.get(id)!, userId: owner.userId });
  await transaction.done;
  announceChange(owner.projectId);
  return [...claimed];
}

/**
 * Deletes a waiting entry and every waiting entry that needs it (a find and its handovers), in one
 * transaction. Returns the ids deleted.
 */
export async function deleteWithDependents(entry: QueueEntry): Promise<string[]> {
  const db = await fieldDb();
  const transaction = db.transaction("queue", "readwrite");
  const sameProject = await transaction.store.index("byProject").getAll(entry.projectId);
  const ids = [entry.id, ...dependentsOf(entry.id, sameProject.filter((other) => other.userId === entry.userId)).map((dependent) => dependent.id)];
  for (const id of ids) await transaction.store.delete(id);
  await transaction.done;
  announceChange(entry.projectId);
  return ids;
}

export async function putEntry(entry: QueueEntry): Promise<void> {
  await (await fieldDb()).put("queue", entry);
  announceChange(entry.projectId);
}

export async function deleteEntry(entry: QueueEntry): Promise<void> {
  await (await fieldDb()).delete("queue", entry.id);
  announceChange(entry.projectId);
}

/** A stored entry leaves the queue and joins the sent list in one transaction: it is never in both or neither. */
export async function markSent(entry: QueueEntry, sent: SentEntry): Promise<void> {
  const db = await fieldDb();
  const transaction = db.transaction(["queue", "sent", "sync"], "readwrite");
  await transaction.objectStore("queue").delete(entry.id);
  await transaction.objectStore("sent").put(sent);
  const key: [number, number] = [entry.userId, entry.projectId];
  const state = (await transaction.objectStore("sync").get(key)) ?? { userId: entry.userId, projectId: entry.projectId };
  await transaction.objectStore("sync").put({ ...state, lastSentAt: sent.sentAt });
  // Entries that need this record (a handover of this find) keep its server id.
  for (const dependent of await transaction.objectStore("queue").index("byOwner").getAll(key)) {
    if (dependent.parent === entry.id) await transaction.objectStore("queue").put({ ...dependent, parentServerId: sent.serverId });
  }
  // The sent list is a recent history, not an archive: the server holds the records.
  const older = (await transaction.objectStore("sent").index("byOwner").getAll(key)).sort((a, b) => b.sentAt.localeCompare(a.sentAt)).slice(50);
  for (const old of older) await transaction.objectStore("sent").delete(old.id);
  await transaction.done;
  announceChange(entry.projectId);
}

export async function syncState(owner: Owner): Promise<SyncState> {
  return (await (await fieldDb()).get("sync", [owner.userId, owner.projectId])) ?? { ...owner };
}

export async function updateSyncState(owner: Owner, change: Partial<SyncState>): Promise<void> {
  const db = await fieldDb();
  const transaction = db.transaction("sync", "readwrite");
  const state = (await transaction.store.get([owner.userId, owner.projectId])) ?? { ...owner };
  await transaction.store.put({ ...state, ...change, userId: owner.userId, projectId: owner.projectId });
  await transaction.done;
}

/** How long a sender's mark holds without being renewed: a sender renews it before each entry, and a closed page's mark runs out. */
export const SENDING_LEASE_MS = 90_000;

/**
 * Takes (or renews) the mark that says `holder` is sending this person's entries in this project;
 * false while another sender's mark has not run out. Read and written in one transaction, so two
 * senders asking at once cannot both get it.
 */
export async function takeSendingLease(owner: Owner, holder: string, now = Date.now()): Promise<boolean> {
  const db = await fieldDb();
  const transaction = db.transaction("sync", "readwrite");
  const state = (await transaction.store.get([owner.userId, owner.projectId])) ?? { ...owner };
  const held = state.sendingBy !== undefined && state.sendingBy !== holder && (state.sendingUntil ?? 0) > now;
  if (!held) await transaction.store.put({ ...state, sendingBy: holder, sendingUntil: now + SENDING_LEASE_MS });
  await transaction.done;
  return !held;
}

/** Gives the mark up (only the holder's own). */
export async function releaseSendingLease(owner: Owner, holder: string): Promise<void> {
  const db = await fieldDb();
  const transaction = db.transaction("sync", "readwrite");
  const state = await transaction.store.get([owner.userId, owner.projectId]);
  if (state?.sendingBy === holder) await transaction.store.put({ ...state, sendingBy: undefined, sendingUntil: undefined });
  await transaction.done;
}

/** Every person and project with entries waiting to be sent on this device (what the service worker sends in the background). */
export async function ownersWithWaiting(): Promise<Owner[]> {
  const all = await (await fieldDb()).getAll("queue");
  const owners = new Map<string, Owner>();
  for (const entry of all) {
    if (entry.userId !== undefined && entry.status === "waiting") owners.set(`${entry.userId}:${entry.projectId}`, { userId: entry.userId, projectId: entry.projectId });
  }
  return [...owners.values()];
}

/** The next sending position: after every entry made so far on this device. */
export async function nextOrder(): Promise<number> {
  const all = await (await fieldDb()).getAll("queue");
  return Math.max(Date.now(), ...all.map((entry) => entry.order + 1));
}

/**
 * Signing out: this person's waiting entries, sent list, sending state and kept project data
 * leave the device, in one transaction. Returns how many waiting entries were removed.
 */
export async function forgetUser(userId: number): Promise<number> {
  const db = await fieldDb();
  const transaction = db.transaction(["projects", "queue", "sent", "sync"], "readwrite");
  let removed = 0;
  for (const entry of await transaction.objectStore("queue").getAll()) {
    if (entry.userId === userId) {
      await transaction.objectStore("queue").delete(entry.id);
      removed += 1;
    }
  }
  for (const entry of await transaction.objectStore("sent").getAll()) {
    if (entry.userId === userId) await transaction.objectStore("sent").delete(entry.id);
  }
  for (const state of await transaction.objectStore("sync").getAll()) {
    if (state.userId === userId) await transaction.objectStore("sync").delete([state.userId, state.projectId]);
  }
  for (const kept of await transaction.objectStore("projects").getAll()) {
    if (kept.userId === userId || kept.snapshot.user === undefined) await transaction.objectStore("projects").delete(kept.projectId);
  }
  await transaction.done;
  return removed;
}
