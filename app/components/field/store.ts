import { openDB, type DBSchema, type IDBPDatabase } from "idb";
import type { FieldSnapshot } from "~/models/field-snapshot";

/**
 * The field page's storage on the device (IndexedDB, through idb): the project data it needs to
 * take entries with no signal, the queue of entries waiting to be sent, the last entries sent, and
 * when the queue last sent something. IndexedDB outlives a reload, a closed tab and a phone
 * restart; a photo is kept as a Blob until it has been sent. public/offline.html reads the
 * "projects" store by name, so its name and key stay as they are.
 */

export const FIELD_DB_NAME = "firmsand-field";

export type EntryKind = "dive" | "reading" | "find" | "sighting" | "tube-fill" | "tube-status";

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
  projectId: number;
  kind: EntryKind;
  /** Sending order: entries go in the order they were made. */
  order: number;
  /** The device's clock when the entry was made, with its offset. */
  capturedAt: string;
  /** What the form held (re-opened for editing). */
  form: Record<string, string | boolean>;
  /** The API's JSON body, checked with the server's schema when saved. */
  body: Record<string, unknown>;
  photos: QueuedPhoto[];
  /** Set once the server has stored the record (a find whose photos are still to go). */
  serverId?: number;
  /**
   * waiting: to be sent; rejected: the server refused it (message says why), the user fixes it;
   * conflict: an edit of a record that changed on the server meanwhile (412), the user chooses.
   */
  status: "waiting" | "rejected" | "conflict";
  /** An edit's If-Match: the record's version when the edit was made (a tube's status). */
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
  /** Safety notices the server answered with while a find's photos were still to go. */
  notices?: string[];
}

export interface SentEntry {
  id: string;
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
  projectId: number;
  lastSentAt?: string;
  lastAttemptAt?: string;
  /** Server clock minus device clock, from the Date header of the last answer. */
  clockOffsetMs?: number;
}

interface FieldDb extends DBSchema {
  projects: { key: number; value: { projectId: number; snapshot: FieldSnapshot; savedAt: string; project: { name: string } } };
  queue: { key: string; value: QueueEntry; indexes: { byProject: number } };
  sent: { key: string; value: SentEntry; indexes: { byProject: number } };
  sync: { key: number; value: SyncState };
}

let opened: Promise<IDBPDatabase<FieldDb>> | null = null;

export function fieldDb(): Promise<IDBPDatabase<FieldDb>> {
  opened ??= openDB<FieldDb>(FIELD_DB_NAME, 1, {
    upgrade(db) {
      db.createObjectStore("projects", { keyPath: "projectId" });
      db.createObjectStore("queue", { keyPath: "id" }).createIndex("byProject", "projectId");
      db.createObjectStore("sent", { keyPath: "id" }).createIndex("byProject", "projectId");
      db.createObjectStore("sync", { keyPath: "projectId" });
    },
    // Another tab holds an older version open: let it go so this one can open.
    blocking() {
      void opened?.then((db) => db.close());
      opened = null;
    },
  });
  return opened;
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
  await db.put("projects", { projectId: snapshot.project.id, snapshot, savedAt: new Date().toISOString(), project: { name: snapshot.project.name } });
}

export async function keptSnapshot(projectId: number): Promise<{ snapshot: FieldSnapshot; savedAt: string } | undefined> {
  return (await fieldDb()).get("projects", projectId);
}

export async function queuedEntries(projectId: number): Promise<QueueEntry[]> {
  const entries = await (await fieldDb()).getAllFromIndex("queue", "byProject", projectId);
  return entries.sort((a, b) => a.order - b.order);
}

export async function sentEntries(projectId: number, limit = 20): Promise<SentEntry[]> {
  const entries = await (await fieldDb()).getAllFromIndex("sent", "byProject", projectId);
  return entries.sort((a, b) => b.sentAt.localeCompare(a.sentAt)).slice(0, limit);
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
  const state = (await transaction.objectStore("sync").get(entry.projectId)) ?? { projectId: entry.projectId };
  await transaction.objectStore("sync").put({ ...state, lastSentAt: sent.sentAt });
  // The sent list is a recent history, not an archive: the server holds the records.
  const older = (await transaction.objectStore("sent").index("byProject").getAll(entry.projectId)).sort((a, b) => b.sentAt.localeCompare(a.sentAt)).slice(50);
  for (const old of older) await transaction.objectStore("sent").delete(old.id);
  await transaction.done;
  announceChange(entry.projectId);
}

export async function syncState(projectId: number): Promise<SyncState> {
  return (await (await fieldDb()).get("sync", projectId)) ?? { projectId };
}

export async function updateSyncState(projectId: number, change: Partial<SyncState>): Promise<void> {
  const db = await fieldDb();
  const transaction = db.transaction("sync", "readwrite");
  const state = (await transaction.store.get(projectId)) ?? { projectId };
  await transaction.store.put({ ...state, ...change, projectId });
  await transaction.done;
}

/** The next sending position: after every entry made so far on this device. */
export async function nextOrder(): Promise<number> {
  const all = await (await fieldDb()).getAll("queue");
  return Math.max(Date.now(), ...all.map((entry) => entry.order + 1));
}
