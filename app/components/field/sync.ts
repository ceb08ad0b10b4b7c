import { ENTRY_LABELS, fieldOf, findTargetOf } from "./entry-fields";
import {
  markSent, ownersWithWaiting, putEntry, queuedEntries, queuedEntry, releaseSendingLease, sentEntry, takeSendingLease, updateSyncState, type Owner, type QueueEntry, type SentEntry,
} from "./store";

/**
 * Sending the queue: entries go one at a time in the order they were made, each with its client
 * id as the Idempotency-Key header, so a retry after a lost answer returns the record the server
 * already stored (200, same id) instead of storing a second one.
 *
 * What an answer does to an entry:
 * - 200/201: stored; it leaves the queue for the sent list, with the safety notices of the answer.
 * - 401: the session has ended; nothing is marked, the sending stops until the user signs in.
 * - any other 4xx: refused; the entry stays, marked with the server's message, for the user to fix.
 * - 5xx, 408, 429 or no answer at all: it stays waiting and the sending stops (tried again later).
 * A record with photos (a find, a reading, a jar test, a haul ticket) goes in two steps: the record, then each
 * photo to the record's id, each photo with its own key; the record's id is kept on the entry once
 * stored, so a retry sends only what is still missing and never a second record or photo.
 * A handover of a find made on this device waits for that find: it goes to the id the server gave
 * the find, and waits (without holding up the rest) while the find has not been stored.
 * An edit (a tube's or a find's status) is a PATCH with If-Match; 412 leaves it for the user to decide.
 */

export const CLOCK_WARNING_MS = 5 * 60_000;

export type StopReason = "offline" | "signed-out" | "server" | "busy";

export interface SyncReport {
  sent: SentEntry[];
  rejected: QueueEntry[];
  stoppedBy?: StopReason;
  stopMessage?: string;
}

interface Answer {
  status: number;
  body: Record<string, unknown> | null;
  /** Server clock minus device clock (Date header, midpoint of the request). */
  clockOffsetMs?: number;
}

class Unsent extends Error {
  constructor(readonly reason: StopReason, message: string) {
    super(message);
  }
}

/** Names the entry's author to the server, which refuses the entry under another account (app/lib/api/access.server.ts). */
const ENTRY_USER_HEADER = "Firmsand-Entry-User";

async function send(url: string, key: string | null, init: { userId: number; json?: unknown; form?: FormData; method?: "POST" | "PATCH"; ifMatch?: string }): Promise<Answer> {
  const started = Date.now();
  let response: Response;
  try {
    response = await fetch(url, {
      method: init.method ?? "POST",
      credentials: "same-origin",
      headers: {
        Accept: "application/json",
        [ENTRY_USER_HEADER]: String(init.userId),
        ...(key !== null ? { "Idempotency-Key": key } : {}),
        ...(init.ifMatch !== undefined ? { "If-Match": `"${init.ifMatch}"` } : {}),
        ...(init.json !== undefined ? { "Content-Type": "application/json" } : {}),
      },
      body: init.json !== undefined ? JSON.stringify(init.json) : init.form,
    });
  } catch {
    throw new Unsent("offline", "No connection: the entry waits and is sent when the connection returns.");
  }
  const dateHeader = response.headers.get("Date");
  const serverMs = dateHeader ? Date.parse(dateHeader) : Number.NaN;
  // The Date header has whole seconds: the offset is good to about a second, ample for a 5-minute warning.
  const clockOffsetMs = Number.isNaN(serverMs) ? undefined : serverMs + 500 - (started + Date.now()) / 2;
  let body: Record<string, unknown> | null = null;
  try {
    body = (await response.json()) as Record<string, unknown>;
  } catch {
    body = null;
  }
  if (response.status === 401) throw new Unsent("signed-out", "You are signed out: sign in again, then send the queue.");
  if (response.status === 409 && Array.isArray(body?.errors) && (body.errors as Array<{ field?: string }>).some((error) => error.field === ENTRY_USER_HEADER)) {
    throw new Unsent("signed-out", "Another account is signed in on this device: these entries wait for the person who made them to sign in.");
  }
  if (response.status >= 500 || response.status === 408 || response.status === 429) {
    throw new Unsent("server", `The server could not take the entry just now (${response.status}); it waits and is tried again.`);
  }
  return { status: response.status, body, clockOffsetMs };
}

/** The server's refusal in words, and per form field. */
function refusalOf(answer: Answer, entry?: QueueEntry): { message: string; fieldErrors: Record<string, string> } {
  const errors = Array.isArray(answer.body?.errors) ? (answer.body.errors as Array<{ field?: string; row?: number; message?: string }>) : [];
  const fieldErrors: Record<string, string> = {};
  for (const error of errors) {
    if (error.field && error.message) fieldErrors[entry ? fieldOf(entry.kind, error.field.split("."), entry.form) : error.field.split(".")[0]] ??= error.message;
  }
  const message = errors.map((error) => (error.field ? `${error.field}: ${error.message}` : error.message)).filter(Boolean).join(" ") || `The server refused it (${answer.status}).`;
  return { message, fieldErrors };
}

/**
 * The safety notices an answer carries: the server's `notices` sentences (an exceedance and its
 * stop-work, a stand-down, a hold), and for a dive the no-decompression flag of its answer.
 */
export function noticesOf(kind: QueueEntry["kind"], body: Record<string, unknown> | null): string[] {
  if (!body) return [];
  const notices = Array.isArray(body.notices) ? body.notices.filter((notice): notice is string => typeof notice === "string") : [];
  if (kind === "dive") {
    const dive = body.dive as { noDecompression?: { exceeds: boolean | null } | null } | undefined;
    if (dive?.noDecompression?.exceeds) notices.push(`The logged bottom time is beyond the no-decompression figure for the logged depth. ${String(body.caution ?? "")}`.trim());
  }
  return notices;
}

function recordIdOf(kind: QueueEntry["kind"], body: Record<string, unknown> | null): number | undefined {
  if (!body) return undefined;
  const nested = (key: string) => (body[key] as { id?: number } | undefined)?.id;
  const id = kind === "dive" ? nested("dive")
    : kind === "haul" ? nested("haul")
    : kind === "tube-status" ? nested("tube")
    : kind === "find-status" ? nested("find")
    : kind === "tube-fill" ? (body.tube as { fills?: Array<{ id: number }> } | undefined)?.fills?.reduce((last, fill) => Math.max(last, fill.id), 0)
    : body.id;
  return typeof id === "number" ? id : undefined;
}

/** Where each record goes (a fill to its tube, a handover to its find: `findId` resolved at sending). */
function pathOf(entry: QueueEntry, findId?: number): string {
  switch (entry.kind) {
    case "dive": return "dives";
    case "reading": return "water-quality/readings";
    case "find": return "finds";
    case "find-status": return `finds/${String(entry.form.find)}`;
    case "custody": return `finds/${findId}/custody`;
    case "sighting": return "wildlife/sightings";
    case "tube-fill": return `dewatering/tubes/${String(entry.form.tube)}/fills`;
    case "tube-status": return `dewatering/tubes/${String(entry.form.tube)}`;
    case "shift": return "dewatering/shifts";
    case "jar-test": return "dewatering/jar-tests";
    case "haul": return "hauls";
  }
}

/** Where a stored record's photos go. */
function photoPathOf(entry: QueueEntry, recordId: number): string {
  return entry.kind === "jar-test" ? `dewatering/jar-tests/${recordId}/photos`
    : entry.kind === "haul" ? `hauls/${recordId}/photos`
    : entry.kind === "reading" ? `water-quality/readings/${recordId}/photos`
    : `finds/${recordId}/photos`;
}

const RECORD_NOUN: Partial<Record<QueueEntry["kind"], string>> = { find: "Find", "jar-test": "Jar test", haul: "Haul ticket", reading: "Reading" };

/**
 * A status changed offline (a tube's, a find's): a PATCH with If-Match (the record's version when
 * the change was made). A 412 means the record changed on the server meanwhile: the entry waits for
 * the user to choose between the change and the record as it is now (the answer's `current`).
 */
async function sendEdit(entry: QueueEntry, noteClock: (offsetMs: number) => void): Promise<SentEntry | QueueEntry> {
  const working: QueueEntry = { ...entry, attempts: entry.attempts + 1, lastAttemptAt: new Date().toISOString() };
  let answer: Answer;
  try {
    answer = await send(`/api/projects/${entry.projectId}/${pathOf(entry)}`, null, { userId: entry.userId, method: "PATCH", json: entry.body, ifMatch: entry.ifMatch });
  } catch (error) {
    if (error instanceof Unsent) await putEntry({ ...working, status: "waiting", message: error.message });
    throw error;
  }
  if (answer.clockOffsetMs !== undefined) noteClock(answer.clockOffsetMs);
  if (answer.status === 412 && answer.body?.current) {
    // The server's sentence alone: the header it names (If-Match) means nothing to the user.
    const errors = Array.isArray(answer.body.errors) ? (answer.body.errors as Array<{ message?: string }>) : [];
    const message = errors.map((error) => error.message).filter(Boolean).join(" ") || "The record was changed on the server since this change was made.";
    const conflicted: QueueEntry = { ...working, status: "conflict", current: answer.body.current as Record<string, unknown>, message };
    await putEntry(conflicted);
    return conflicted;
  }
  if (answer.status >= 400) {
    const refused: QueueEntry = { ...working, status: "rejected", ...refusalOf(answer, entry) };
    await putEntry(refused);
    return refused;
  }
  const sent: SentEntry = {
    id: entry.id, userId: entry.userId, projectId: entry.projectId, kind: entry.kind, summary: entry.summary, capturedAt: entry.capturedAt,
    sentAt: new Date().toISOString(), serverId: recordIdOf(entry.kind, answer.body) ?? Number(entry.kind === "tube-status" ? entry.form.tube : entry.form.find),
    notices: noticesOf(entry.kind, answer.body), replayed: false,
  };
  await markSent(entry, sent);
  return sent;
}

/** Not sent in this run: the entry waits for the record it needs (a find not yet stored). */
class Deferred extends Error {}

/**
 * The find a handover goes to: a find the server has, or a find made on this device once the server
 * has stored it (from the entry, or the sent list). Throws Deferred while that find waits, and
 * refuses the handover when its find was deleted from the queue unsent.
 */
async function findIdFor(entry: QueueEntry): Promise<number | QueueEntry> {
  const target = findTargetOf(entry.form);
  if (target && "findId" in target) return target.findId;
  if (entry.parentServerId !== undefined) return entry.parentServerId;
  const parentId = entry.parent ?? (target && "entryId" in target ? target.entryId : undefined);
  if (parentId === undefined) return { ...entry, status: "rejected", message: "The handover names no find: choose the find.", fieldErrors: { find: "choose the find" } };
  const parent = await queuedEntry(parentId);
  const serverId = parent?.serverId ?? (await sentEntry(parentId))?.serverId;
  if (serverId !== undefined) return serverId;
  if (parent) {
    const message = parent.status === "waiting" ? "Waits for its find to be sent first." : "Waits for its find, which is not stored yet: deal with the find's entry first.";
    if (entry.message !== message) await putEntry({ ...entry, message });
    throw new Deferred();
  }
  return { ...entry, status: "rejected", message: "The find this handover is for was deleted from the queue before it was sent: choose the find again.", fieldErrors: { find: "choose the find again" } };
}

/** Sends one entry; returns the sent record, or the entry marked refused. Throws Unsent to stop the run. */
async function sendEntry(entry: QueueEntry, noteClock: (offsetMs: number) => void): Promise<SentEntry | QueueEntry> {
  if (entry.kind === "tube-status" || entry.kind === "find-status") return sendEdit(entry, noteClock);
  const base = `/api/projects/${entry.projectId}`;
  let findId: number | undefined;
  if (entry.kind === "custody") {
    const resolved = await findIdFor(entry);
    if (typeof resolved !== "number") {
      await putEntry(resolved);
      return resolved;
    }
    findId = resolved;
    if (entry.parentServerId !== resolved && entry.parent !== undefined) await putEntry({ ...entry, parentServerId: resolved });
  }
  const attempted = { ...entry, attempts: entry.attempts + 1, lastAttemptAt: new Date().toISOString() };
  let working: QueueEntry = attempted;
  let notices: string[] = [];
  let replayed = false;
  try {
    if (working.serverId === undefined) {
      // Marked before the request: if no answer comes, the server may have stored it (the key makes a retry safe).
      working = { ...working, mayHaveReachedServer: true };
      await putEntry(working);
      const answer = await send(`${base}/${pathOf(entry, findId)}`, entry.id, { userId: entry.userId, json: entry.body });
      if (answer.clockOffsetMs !== undefined) noteClock(answer.clockOffsetMs);
      if (answer.status >= 400) {
        const refused: QueueEntry = { ...working, status: "rejected", ...refusalOf(answer, entry), mayHaveReachedServer: false };
        await putEntry(refused);
        return refused;
      }
      const serverId = recordIdOf(entry.kind, answer.body);
      if (serverId === undefined) throw new Unsent("server", "The server's answer named no record; the entry waits and is tried again.");
      notices = noticesOf(entry.kind, answer.body);
      replayed = answer.status === 200;
      working = { ...working, serverId, mayHaveReachedServer: false, notices: [...(working.notices ?? []), ...notices] };
      await putEntry(working);
    }
    for (const [index, photo] of working.photos.entries()) {
      if (photo.sentId !== undefined) continue;
      const form = new FormData();
      form.append("file", photo.blob, photo.name);
      const answer = await send(`${base}/${photoPathOf(working, working.serverId!)}`, photo.id, { userId: entry.userId, form });
      if (answer.status >= 400) {
        const { message, fieldErrors } = refusalOf(answer);
        const refused: QueueEntry = { ...working, status: "rejected", message: `${RECORD_NOUN[entry.kind] ?? "The record"} #${working.serverId} is stored; its photo "${photo.name}" was refused: ${message}`, fieldErrors };
        await putEntry(refused);
        return refused;
      }
      const photos = [...working.photos];
      photos[index] = { ...photo, sentId: typeof answer.body?.id === "number" ? answer.body.id : -1 };
      working = { ...working, photos };
      await putEntry(working);
    }
  } catch (error) {
    if (error instanceof Unsent) {
      await putEntry({ ...working, status: "waiting", message: error.message });
    }
    throw error;
  }
  const sent: SentEntry = {
    id: entry.id, userId: entry.userId, projectId: entry.projectId, kind: entry.kind, summary: entry.summary, capturedAt: entry.capturedAt,
    sentAt: new Date().toISOString(), serverId: working.serverId!, notices: working.notices ?? notices, replayed,
  };
  await markSent(entry, sent);
  return sent;
}

let running: Promise<SyncReport> | null = null;

/** The Web Locks name for sending one person's entries in a project: the page's windows and the service worker ask for the same. */
export function sendLockName(owner: Owner): string {
  return `firmsand-field-send-${owner.userId}-${owner.projectId}`;
}

/**
 * Sends every waiting entry of this person in the project, in order. One run at a time in this
 * context, and one sender per person and project on the device: the page's windows and the service
 * worker's background sending take the same Web Lock, so two never send the same entry at once. A
 * browser without Web Locks uses a mark with a lease in the store instead (takeSendingLease),
 * renewed before each entry; a run that finds another sender's mark stops at once ("busy").
 * `locks` is the context's LockManager (null: use the mark).
 */
export function sendQueue(owner: Owner, onProgress: (report: SyncReport) => void = () => {}, locks: LockManager | null = typeof navigator !== "undefined" && navigator.locks ? navigator.locks : null): Promise<SyncReport> {
  running ??= (async () => {
    const holder = crypto.randomUUID();
    const run = async (leased: boolean) => {
      const report: SyncReport = { sent: [], rejected: [] };
      let clockOffsetMs: number | undefined;
      const entries = (await queuedEntries(owner)).filter((entry) => entry.status === "waiting");
      await updateSyncState(owner, { lastAttemptAt: new Date().toISOString() });
      for (const listed of entries) {
        try {
          if (leased && !(await takeSendingLease(owner, holder))) throw new Unsent("busy", BUSY_MESSAGE);
          // Read again: sending an earlier entry may have given this one its find's id, or the user deleted it meanwhile.
          const entry = await queuedEntry(listed.id);
          if (!entry || entry.status !== "waiting") continue;
          const outcome = await sendEntry(entry, (offset) => (clockOffsetMs = offset));
          if ("sentAt" in outcome) report.sent.push(outcome);
          else report.rejected.push(outcome);
        } catch (error) {
          if (error instanceof Deferred) continue;
          if (!(error instanceof Unsent)) throw error;
          report.stoppedBy = error.reason;
          report.stopMessage = error.message;
          break;
        } finally {
          onProgress(report);
        }
      }
      if (clockOffsetMs !== undefined) await updateSyncState(owner, { clockOffsetMs });
      return report;
    };
    try {
      if (locks) return await locks.request(sendLockName(owner), () => run(false));
      if (!(await takeSendingLease(owner, holder))) return { sent: [], rejected: [], stoppedBy: "busy", stopMessage: BUSY_MESSAGE } satisfies SyncReport;
      try {
        return await run(true);
      } finally {
        await releaseSendingLease(owner, holder);
      }
    } finally {
      running = null;
    }
  })();
  return running;
}

const BUSY_MESSAGE = "These entries are being sent by another window of this app or in the background; this page shows them as they go.";

/** The tag the page registers and the service worker's `sync` event answers (Background Sync). */
export const BACKGROUND_SEND_TAG = "firmsand-field-send";

/**
 * What the service worker does on a `sync` event: sends the waiting entries of every person and
 * project on the device, each under its author's name (Firmsand-Entry-User), so an entry whose
 * author is not the one signed in now is refused by the server and waits for them. Throws when a run
 * stopped for want of a connection or a working server, so the browser tries again later; a run
 * stopped because its author is signed out, or because another sender has the entries, is done.
 */
export async function sendAllWaiting(locks: LockManager | null = typeof navigator !== "undefined" && navigator.locks ? navigator.locks : null): Promise<SyncReport[]> {
  const reports: SyncReport[] = [];
  let retry: string | undefined;
  for (const owner of await ownersWithWaiting()) {
    const report = await sendQueue(owner, () => {}, locks);
    reports.push(report);
    if (report.stoppedBy === "offline" || report.stoppedBy === "server") retry = report.stopMessage;
  }
  if (retry !== undefined) throw new Error(retry);
  return reports;
}

/**
 * Asks the browser to send the queue in the background when a connection is there, even once the
 * page is closed (Background Sync, in Chromium-based browsers). Where there is none, the page sends
 * when it is next opened with signal. True when the browser took the request.
 */
export async function askForBackgroundSend(): Promise<boolean> {
  if (typeof navigator === "undefined" || !("serviceWorker" in navigator)) return false;
  try {
    const registration = (await navigator.serviceWorker.getRegistration()) as (ServiceWorkerRegistration & { sync?: { register(tag: string): Promise<void> } }) | undefined;
    if (!registration?.active || !registration.sync) return false;
    await registration.sync.register(BACKGROUND_SEND_TAG);
    return true;
  } catch {
    // Refused (permission, a browser setting): the page sends when it is open.
    return false;
  }
}

export function describeKind(entry: { kind: QueueEntry["kind"] }): string {
  return ENTRY_LABELS[entry.kind];
}

/** Asks the server for its clock (the health check's Date header) when there is nothing to send. */
export async function checkClock(owner: Owner): Promise<number | undefined> {
  const started = Date.now();
  try {
    const response = await fetch("/healthz", { method: "GET", cache: "no-store" });
    // Read to the end, so the request is over (an unread body keeps it open).
    await response.arrayBuffer();
    const header = response.headers.get("Date");
    if (!header) return undefined;
    const offset = Date.parse(header) + 500 - (started + Date.now()) / 2;
    await updateSyncState(owner, { clockOffsetMs: offset });
    return offset;
  } catch {
    return undefined;
  }
}
