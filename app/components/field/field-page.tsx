import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { StopWorkBanner } from "~/components/stop-work-banner";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { FIND_STATUS_LABELS, type FindStatus } from "../../../shared/finds/finds";
import { dateTimeFormat } from "../../../shared/local-time";
import { blankForm, deviceIso, ENTRY_LABELS, findTargetOf, recordTimeOf, summaryOf } from "./entries";
import { EntryForm, type EntryDraft } from "./entry-form";
import { bigButton } from "./inputs";
import {
  claimEntries, deleteEntry, deleteWithDependents, dependentsOf, keptSnapshot, nextOrder, onChange, putEntry, queuedEntries, QUEUED_PREFIX, saveSnapshot, sentEntries, syncState,
  unownedEntries, type EntryKind, type QueueEntry, type SentEntry, type SyncState,
} from "./store";
import { askForBackgroundSend, checkClock, CLOCK_WARNING_MS, sendQueue, type SyncReport } from "./sync";

/** "10:42" today, "3 Dec 10:42" another day: the device's clock. */
export function shortTime(iso: string | undefined): string {
  if (!iso) return "";
  const date = new Date(iso);
  const today = new Date().toDateString() === date.toDateString();
  return dateTimeFormat("en-GB", today ? { hour: "2-digit", minute: "2-digit", hourCycle: "h23" } : { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(date);
}

function useOnline(): boolean {
  const [online, setOnline] = useState(true);
  useEffect(() => {
    const update = () => setOnline(navigator.onLine);
    update();
    window.addEventListener("online", update);
    window.addEventListener("offline", update);
    return () => {
      window.removeEventListener("online", update);
      window.removeEventListener("offline", update);
    };
  }, []);
  return online;
}

/** The service worker's cache of field pages (vite.config.ts names it). */
const FIELD_PAGES_CACHE = "firmsand-field-pages";

/**
 * Registers the service worker that keeps the app's files on the device, and keeps this page in its
 * cache: the worker stores a field page each time it is opened with signal, but not the visit that
 * installed it (nor one reached by a link inside the app), so the page puts itself there once the
 * worker is running. True once the page would open again without a connection.
 */
function useOfflineReady(online: boolean): boolean | null {
  const [ready, setReady] = useState<boolean | null>(null);
  useEffect(() => {
    if (!("serviceWorker" in navigator) || !("caches" in window)) {
      setReady(false);
      return;
    }
    let cancelled = false;
    navigator.serviceWorker.register("/sw.js", { scope: "/" }).catch(() => setReady(false));
    void navigator.serviceWorker.ready.then(async () => {
      const cache = await caches.open(FIELD_PAGES_CACHE);
      if (online && !(await cache.match(location.pathname))) await cache.add(location.pathname).catch(() => {});
      if (!cancelled) setReady(Boolean(await cache.match(location.pathname)));
    });
    return () => {
      cancelled = true;
    };
  }, [online]);
  return ready;
}

function minutesApart(offsetMs: number): string {
  const minutes = Math.round(Math.abs(offsetMs) / 60_000);
  return minutes >= 120 ? `${Math.round(minutes / 60)} hours` : `${minutes} minutes`;
}

type Row = [label: string, value: React.ReactNode];

/** What each side of a conflict shows: the edit as made (with what the page saw then) and the record as the server has it now. */
function conflictRows(entry: QueueEntry, snapshot: FieldSnapshot): { mine: Row[]; theirs: Row[] } {
  if (entry.kind === "find-status") {
    const current = entry.current as { status?: FindStatus; currentHolder?: { name: string; place: string }; accessionNumber?: string | null; statusNote?: string | null; custody?: unknown[] };
    const seen = snapshot.finds.find((find) => String(find.id) === entry.form.find);
    const label = (status: unknown) => FIND_STATUS_LABELS[status as FindStatus] ?? String(status ?? "?");
    return {
      mine: [
        ["Status", <>{label(seen?.status)} → <strong>{label(entry.body.status)}</strong></>],
        ["Held by", seen ? `${seen.currentHolder.name}, ${seen.currentHolder.place}` : "?"],
        ["Accession number", String(entry.body.accessionNumber ?? "–")],
        ["Note", String(entry.body.note ?? "–")],
      ],
      theirs: [
        ["Status", <strong>{label(current.status)}</strong>],
        ["Held by", current.currentHolder ? `${current.currentHolder.name}, ${current.currentHolder.place}` : "?"],
        ["Accession number", current.accessionNumber ?? "–"],
        ["Note", current.statusNote ?? "–"],
      ],
    };
  }
  const current = entry.current as { status?: string; fillLevel?: number; fills?: unknown[] };
  const seen = snapshot.tubes.find((tube) => String(tube.id) === entry.form.tube);
  return {
    mine: [
      ["Status", <>{seen?.status ?? "?"} → <strong>{String(entry.body.status)}</strong></>],
      ["Fill level seen", <span className="figures">{seen ? `${Math.round(seen.fillLevel * 100)} %` : "?"}</span>],
    ],
    theirs: [
      ["Status", <strong>{current.status ?? "?"}</strong>],
      ["Fill level", <span className="figures">{current.fillLevel !== undefined ? `${Math.round(current.fillLevel * 100)} %` : "?"}{current.fills ? ` (${current.fills.length} fills)` : ""}</span>],
    ],
  };
}

/**
 * An edit made offline whose record changed on the server meanwhile (412): the edit and the record
 * as it is now, side by side; the user keeps one (a tube's status, a find's status).
 */
function ConflictChoice({ entry, snapshot, onChoose }: { entry: QueueEntry; snapshot: FieldSnapshot; onChoose: (choice: "mine" | "theirs") => void }) {
  const { mine, theirs } = conflictRows(entry, snapshot);
  const list = (rows: Row[]) => (
    <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1">
      {rows.map(([label, value]) => <div key={label} className="contents"><dt className="text-muted">{label}</dt><dd className="break-words">{value}</dd></div>)}
    </dl>
  );
  return (
    <div className="mt-2">
      <p className="text-sm">{entry.message}</p>
      <div className="mt-2 grid gap-3 sm:grid-cols-2">
        <section aria-label="Your change" className="rounded border-2 border-lagoon p-3">
          <h3 className="font-semibold">Your change (made <time className="figures" dateTime={entry.capturedAt}>{shortTime(entry.capturedAt)}</time>)</h3>
          {list(mine)}
        </section>
        <section aria-label="On the server now" className="rounded border-2 border-caution p-3">
          <h3 className="font-semibold">On the server now</h3>
          {list(theirs)}
        </section>
      </div>
      <div className="mt-2 flex flex-wrap gap-3">
        <button type="button" className={bigButton.primary} onClick={() => onChoose("mine")}>Send my change</button>
        <button type="button" className={bigButton.plain} onClick={() => onChoose("theirs")}>Keep the server's and drop mine</button>
      </div>
    </div>
  );
}

/**
 * Deleting a waiting entry asks first. A find that waiting handovers need names them: without the
 * find they cannot be sent, so the choice is to delete the find with its handovers, or keep them all.
 */
function ConfirmDelete({ entry, dependents, onDone }: { entry: QueueEntry; dependents: QueueEntry[]; onDone: () => void }) {
  const [busy, setBusy] = useState(false);
  const remove = async (action: () => Promise<unknown>) => {
    setBusy(true);
    try {
      await action();
    } finally {
      setBusy(false);
      onDone();
    }
  };
  if (dependents.length === 0) {
    return (
      <div role="group" aria-label="Confirm delete" className="mt-2 flex flex-wrap items-center gap-3">
        <span>Delete this entry? It has not been sent{entry.serverId !== undefined ? " in full" : ""} and cannot be recovered.</span>
        <button type="button" className={bigButton.danger} disabled={busy} onClick={() => void remove(() => deleteEntry(entry))}>Delete entry</button>
        <button type="button" className={bigButton.plain} autoFocus onClick={onDone}>Keep it</button>
      </div>
    );
  }
  const handovers = dependents.length === 1 ? "its handover" : `its ${dependents.length} handovers`;
  return (
    <div role="group" aria-label="Confirm delete" className="mt-2 rounded border-2 border-caution p-3">
      <p className="font-medium">
        {dependents.length === 1 ? "A handover waiting in the queue is for this find" : `${dependents.length} handovers waiting in the queue are for this find`}: without the find {dependents.length === 1 ? "it" : "they"} cannot be sent.
      </p>
      <ul className="mt-1 list-disc pl-5">
        {dependents.map((dependent) => <li key={dependent.id}>{dependent.summary}</li>)}
      </ul>
      <p className="mt-1 text-sm">Delete the find and {handovers} together, or keep {dependents.length === 1 ? "both" : "them all"}. None has been sent{entry.serverId !== undefined ? " in full" : ""}; deleted entries cannot be recovered.</p>
      <div className="mt-2 flex flex-wrap gap-3">
        <button type="button" className={bigButton.danger} disabled={busy} onClick={() => void remove(() => deleteWithDependents(entry))}>Delete the find and {handovers}</button>
        <button type="button" className={bigButton.plain} autoFocus onClick={onDone}>Keep them</button>
      </div>
    </div>
  );
}

/**
 * Entries kept on this device before Firmsand recorded who made each one: nobody's name is put on
 * them until the person signed in says they are theirs (sent under that name) or deletes them.
 */
function UnownedEntries({ entries, userName, onClaim, onChanged }: { entries: QueueEntry[]; userName: string; onClaim: (ids: string[]) => Promise<void>; onChanged: () => void }) {
  const [confirmDelete, setConfirmDelete] = useState<string | null>(null);
  return (
    <section aria-labelledby="unowned-heading" className="mt-4 rounded border-2 border-caution bg-panel p-4">
      <h2 id="unowned-heading" className="text-lg font-semibold">Entries from before the update: whose are these?</h2>
      <p className="mt-1">
        {entries.length === 1 ? "This entry was" : `These ${entries.length} entries were`} kept on this device before Firmsand noted who made each entry. {entries.length === 1 ? "It has" : "They have"} not been sent and will not be until someone says whose {entries.length === 1 ? "it is" : "they are"}.
        Claim only what you made: it is then sent under your name, {userName}. Leave someone else's for them to claim when they sign in on this device.
      </p>
      <p className="mt-1 text-sm text-muted">A handover and the find it is for go together.</p>
      <ol className="mt-3 space-y-3" aria-label="Entries from before the update">
        {entries.map((entry) => (
          <li key={entry.id} className="rounded border-2 border-line p-3" data-unowned-id={entry.id}>
            <p className="font-medium">{entry.summary}</p>
            <p className="text-sm text-muted">
              Made <time className="figures" dateTime={entry.capturedAt}>{shortTime(entry.capturedAt)}</time>
              {entry.photos.length ? ` · ${entry.photos.length} photo${entry.photos.length > 1 ? "s" : ""}` : ""}
            </p>
            {confirmDelete === entry.id ? (
              <ConfirmDelete entry={entry} dependents={dependentsOf(entry.id, entries)} onDone={() => { setConfirmDelete(null); onChanged(); }} />
            ) : (
              <div className="mt-2 flex flex-wrap gap-3">
                <button type="button" className={bigButton.primary} onClick={() => void onClaim([entry.id])}>Mine: send it under my name<span className="sr-only"> ({entry.summary})</span></button>
                <button type="button" className={bigButton.plain} onClick={() => setConfirmDelete(entry.id)}>Delete<span className="sr-only"> {entry.summary}</span></button>
              </div>
            )}
          </li>
        ))}
      </ol>
      {entries.length > 1 ? (
        <button type="button" className={`${bigButton.plain} mt-3`} onClick={() => void onClaim(entries.map((entry) => entry.id))}>{entries.length === 2 ? "Both are mine" : `All ${entries.length} are mine`}</button>
      ) : null}
    </section>
  );
}

interface FieldPageProps {
  snapshot: FieldSnapshot;
  /** "server": fresh from the server now; "device": the copy this device kept. */
  source: "server" | "device";
}

/**
 * The field page: entries are made here with or without signal, kept in the device's queue and sent
 * in order when the connection returns (or on "Send now"), each exactly once.
 */
export function FieldPage({ snapshot, source }: FieldPageProps) {
  const projectId = snapshot.project.id;
  const userId = snapshot.user.id;
  const owner = useMemo(() => ({ userId, projectId }), [userId, projectId]);
  const online = useOnline();
  const offlineReady = useOfflineReady(online);
  const permission = {
    dive: "dives", reading: "readings", find: "finds", "find-status": "finds", custody: "finds", sighting: "sightings",
    "tube-fill": "tubes", "tube-status": "tubes", shift: "tubes", "jar-test": "tubes", haul: "tubes",
  } as const;
  const kinds = (["dive", "reading", "find", "custody", "find-status", "sighting", "shift", "jar-test", "haul", "tube-fill", "tube-status"] as const).filter((kind) => snapshot.may[permission[kind]]);
  const [kind, setKind] = useState<EntryKind | null>(kinds[0] ?? null);
  const [formKey, setFormKey] = useState(0);
  const [entries, setEntries] = useState<QueueEntry[] | null>(null);
  const [unowned, setUnowned] = useState<QueueEntry[]>([]);
  const [sent, setSent] = useState<SentEntry[]>([]);
  const [state, setState] = useState<SyncState>({ userId, projectId });
  const [editing, setEditing] = useState<QueueEntry | null>(null);
  const [confirmDelete, setConfirmDelete] = useState<string | null>(null);
  const [sending, setSending] = useState(false);
  const [lastRun, setLastRun] = useState<SyncReport | null>(null);
  const [savedNote, setSavedNote] = useState<string | null>(null);
  const [storageError, setStorageError] = useState<string | null>(null);
  const queueHeading = useRef<HTMLHeadingElement>(null);

  const refresh = useCallback(async () => {
    try {
      const [queued, recent, sync, ownerless] = await Promise.all([queuedEntries(owner), sentEntries(owner), syncState(owner), unownedEntries(projectId)]);
      setEntries(queued);
      setUnowned(ownerless);
      setSent(recent);
      setState(sync);
    } catch (error) {
      setStorageError(`This device's storage cannot be read (${error instanceof Error ? error.message : "unknown error"}): entries cannot be kept offline in this browser.`);
    }
  }, [owner, projectId]);

  // The project data used offline is the copy saved on each load with signal.
  useEffect(() => {
    // A page the service worker kept carries the data it was rendered with: never let it replace a newer copy.
    if (source === "server") {
      void keptSnapshot(projectId)
        .then((kept) => (!kept || kept.snapshot.takenAt < snapshot.takenAt ? saveSnapshot(snapshot) : undefined))
        .catch(() => {});
    }
  }, [projectId, snapshot, source]);

  useEffect(() => {
    void refresh();
    return onChange((changed) => {
      if (changed === projectId) void refresh();
    });
  }, [projectId, refresh]);

  const send = useCallback(async () => {
    setSending(true);
    try {
      const report = await sendQueue(owner, () => void refresh());
      setLastRun(report);
      // No connection or no working server: the browser sends in the background once there is, even with the page closed.
      if (report.stoppedBy === "offline" || report.stoppedBy === "server") void askForBackgroundSend();
      if (!report.stoppedBy && report.sent.length === 0 && report.rejected.length === 0) await checkClock(owner);
    } finally {
      setSending(false);
      await refresh();
    }
  }, [owner, refresh]);

  // Send when the connection returns, when the page opens with signal, and every minute while entries wait
  // (a phone can say it is online while no data gets through).
  useEffect(() => {
    const onOnline = () => void send();
    window.addEventListener("online", onOnline);
    if (navigator.onLine) void send();
    const timer = window.setInterval(() => {
      if (!navigator.onLine) return;
      void queuedEntries(owner).then((queued) => {
        if (queued.some((entry) => entry.status === "waiting")) void send();
      });
    }, 60_000);
    return () => {
      window.removeEventListener("online", onOnline);
      window.clearInterval(timer);
    };
  }, [owner, send]);

  async function save(entryKind: EntryKind, draft: EntryDraft, existing: QueueEntry | null) {
    const now = new Date();
    // A status change is checked against the tube as this page last saw it (If-Match); an entry keeps the version it was made against.
    const versionOf = (target: string | boolean | undefined) =>
      entryKind === "tube-status" ? snapshot.tubes.find((tube) => String(tube.id) === target)?.version
        : entryKind === "find-status" ? snapshot.finds.find((find) => String(find.id) === target)?.version : undefined;
    const targetField = entryKind === "tube-status" ? "tube" : "find";
    const ifMatch = entryKind !== "tube-status" && entryKind !== "find-status" ? undefined
      : existing && existing.form[targetField] === draft.form[targetField] ? existing.ifMatch : versionOf(draft.form[targetField]);
    // A handover of a find made on this device and not yet sent: sent after that find, to its id.
    const target = entryKind === "custody" ? findTargetOf(draft.form) : null;
    const parent = target && "entryId" in target ? target.entryId : undefined;
    const findLabel = findChoices.find((choice) => choice.value === draft.form.find)?.short;
    const summary = summaryOf(entryKind, draft.body, snapshot, draft.form, findLabel);
    const entry: QueueEntry = existing
      ? {
          ...existing, form: draft.form, body: existing.serverId !== undefined ? existing.body : draft.body, photos: draft.photos, status: "waiting", message: undefined, fieldErrors: undefined,
          ifMatch, current: undefined, parent, parentServerId: parent === existing.parent ? existing.parentServerId : undefined, summary: existing.serverId !== undefined ? existing.summary : summary,
        }
      : {
          id: crypto.randomUUID(), userId, projectId, kind: entryKind, parent, order: await nextOrder(), capturedAt: recordTimeOf(entryKind, draft.body) ?? deviceIso(now),
          form: draft.form, body: draft.body, photos: draft.photos, status: "waiting", attempts: 0, ifMatch, summary,
        };
    if (existing && existing.serverId === undefined) entry.capturedAt = recordTimeOf(entryKind, draft.body) ?? existing.capturedAt;
    try {
      await putEntry(entry);
    } catch (error) {
      setStorageError(`The entry could not be kept on this device (${error instanceof Error ? error.message : "storage refused"}). Free some space on the phone and save again; the form still holds it.`);
      throw error;
    }
    setEditing(null);
    if (!navigator.onLine) void askForBackgroundSend();
    setSavedNote(`${ENTRY_LABELS[entryKind]} saved to the queue${navigator.onLine ? "; sending…" : "; it will be sent when there is a connection"}.`);
    setFormKey((value) => value + 1);
    await refresh();
    queueHeading.current?.focus();
    if (navigator.onLine) void send();
  }

  const waiting = entries?.filter((entry) => entry.status === "waiting") ?? [];
  // The finds a handover may name: the project's, those sent from here since, and those still in this device's queue.
  const findChoices = useMemo(() => {
    const known = new Set(snapshot.finds.map((find) => find.id));
    return [
      ...(entries ?? []).filter((entry) => entry.kind === "find").map((entry) => ({ value: `${QUEUED_PREFIX}${entry.id}`, label: `Not yet sent: ${entry.summary.replace(/^Find · /, "")}`, short: `new find "${String(entry.body.description ?? "").slice(0, 40)}"` })),
      ...sent.filter((entry) => entry.kind === "find" && !known.has(entry.serverId)).map((entry) => ({ value: String(entry.serverId), label: `#${entry.serverId} (sent from here): ${entry.summary.replace(/^Find · /, "")}`, short: `find #${entry.serverId}` })),
      ...snapshot.finds.map((find) => ({ value: String(find.id), label: `${find.catalogueNumber} · ${find.description.slice(0, 50)} (${FIND_STATUS_LABELS[find.status as FindStatus] ?? find.status})`, short: find.catalogueNumber })),
    ];
  }, [entries, sent, snapshot.finds]);
  const rejected = entries?.filter((entry) => entry.status === "rejected") ?? [];
  const conflicts = entries?.filter((entry) => entry.status === "conflict") ?? [];

  /** The user's choice on a conflict: send the change over the record as it is now, or drop it. */
  async function resolve(entry: QueueEntry, choice: "mine" | "theirs") {
    if (choice === "theirs") await deleteEntry(entry);
    else await putEntry({ ...entry, status: "waiting", ifMatch: String(entry.current?.version ?? entry.ifMatch), current: undefined, message: undefined });
    await refresh();
    if (choice === "mine" && navigator.onLine) void send();
  }
  const notices = lastRun?.sent.filter((entry) => entry.notices.length > 0) ?? [];
  const clockOff = state.clockOffsetMs !== undefined && Math.abs(state.clockOffsetMs) > CLOCK_WARNING_MS;

  return (
    <main className="mx-auto max-w-3xl px-4 py-4 sm:px-6">
      <nav aria-label="Project" className="mb-2 text-sm">
        <a className="text-lagoon underline" href={`/projects/${projectId}`}>{snapshot.project.name}: project pages</a>
      </nav>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold">{snapshot.project.name} · field entry</h1>
        <p className={`rounded px-3 py-1 font-medium ${online ? "bg-ok text-white" : "bg-caution text-white"}`} role="status">{online ? "Online" : "Offline"}</p>
      </div>
      <p className="mt-1 text-sm text-muted">
        Project data as of <time className="figures" dateTime={snapshot.takenAt}>{shortTime(snapshot.takenAt)}</time>
        {source === "device" || !online ? " (the copy kept on this device: teams, stations, holds and stoppages may have changed since)" : ""}. Times are this device's clock.
        {offlineReady === true ? " This page opens on this device without a connection." : offlineReady === false ? " This browser cannot keep the page for use without a connection; entries made here are still kept while it stays open." : ""}
      </p>
      <div className="mt-3">
        <StopWorkBanner projectId={projectId} stopWork={snapshot.stoppages.stopWork} standDowns={snapshot.stoppages.standDowns} nowMs={snapshot.stoppages.nowMs} timeZone={snapshot.stoppages.timeZone} />
      </div>
      {storageError ? <p role="alert" className="mt-3 rounded border-2 border-danger bg-panel p-3 font-medium text-danger">{storageError}</p> : null}
      {clockOff ? (
        <p role="alert" className="mt-3 rounded border-2 border-caution bg-panel p-3">
          <strong>This device's clock is {minutesApart(state.clockOffsetMs!)} {state.clockOffsetMs! > 0 ? "behind" : "ahead of"} the server's.</strong> Entries keep the time you give them; check the times of entries made meanwhile and set the phone's clock.
        </p>
      ) : null}
      {notices.length > 0 ? (
        <section role="alert" aria-labelledby="notices-heading" className="mt-3 rounded border-2 border-danger bg-panel p-3">
          <h2 id="notices-heading" className="font-semibold text-danger">Safety notices from the server</h2>
          <ul className="mt-2 space-y-2">
            {notices.flatMap((entry) => entry.notices.map((notice) => <li key={`${entry.id}-${notice}`}><span className="font-medium">{entry.summary}:</span> {notice}</li>))}
          </ul>
          <p className="mt-2 text-sm">Follow the permit, the safety plan and the project's procedure; the notice is information, the people in charge decide.</p>
        </section>
      ) : null}

      {unowned.length > 0 ? (
        <UnownedEntries
          entries={unowned}
          userName={snapshot.user.name}
          onClaim={async (ids) => {
            const claimed = await claimEntries(owner, ids);
            setSavedNote(`${claimed.length} ${claimed.length === 1 ? "entry" : "entries"} from before the update now yours${navigator.onLine ? "; sending…" : "; sent when there is a connection"}.`);
            await refresh();
            queueHeading.current?.focus();
            if (navigator.onLine) void send();
            else void askForBackgroundSend();
          }}
          onChanged={() => void refresh()}
        />
      ) : null}

      <section aria-labelledby="queue-heading" className="mt-4 rounded border border-line bg-panel p-4">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="queue-heading" ref={queueHeading} tabIndex={-1} className="text-lg font-semibold">
            {entries === null ? "Reading the queue…" : `${waiting.length} waiting to send`}
            {rejected.length ? `, ${rejected.length} refused` : ""}
            {conflicts.length ? `, ${conflicts.length} to decide` : ""}
            {entries === null ? "" : state.lastSentAt ? <>; last sent <time className="figures" dateTime={state.lastSentAt}>{shortTime(state.lastSentAt)}</time></> : "; nothing sent yet"}
          </h2>
          <button type="button" className={bigButton.primary} onClick={() => void send()} disabled={sending || waiting.length === 0}>{sending ? "Sending…" : "Send now"}</button>
        </div>
        {savedNote ? <p role="status" className="mt-2">{savedNote}</p> : null}
        {lastRun?.stoppedBy ? <p role="status" className="mt-2 text-caution">{lastRun.stopMessage}</p> : null}
        {entries && entries.length > 0 ? (
          <ol className="mt-3 space-y-3" aria-label="Entries in the queue, in sending order">
            {entries.map((entry) => (
              <li key={entry.id} className={`rounded border-2 p-3 ${entry.status === "rejected" ? "border-danger" : "border-line"}`} data-entry-id={entry.id}>
                <p className="font-medium">{entry.summary}</p>
                <p className="text-sm text-muted">
                  {entry.status === "rejected" ? "Refused by the server" : entry.status === "conflict" ? "Changed on the server meanwhile: choose" : entry.serverId !== undefined ? `Stored as #${entry.serverId}; photos waiting` : "Waiting"} · made <time className="figures" dateTime={entry.capturedAt}>{shortTime(entry.capturedAt)}</time>
                  {entry.photos.length ? ` · ${entry.photos.length} photo${entry.photos.length > 1 ? "s" : ""}` : ""}
                  {entry.attempts ? ` · ${entry.attempts} attempt${entry.attempts > 1 ? "s" : ""}` : ""}
                </p>
                {entry.status === "rejected" && entry.message ? <p className="mt-1 font-medium text-danger">{entry.message}</p> : null}
                {entry.status === "waiting" && entry.message && entry.message !== lastRun?.stopMessage ? <p className="mt-1 text-sm">{entry.message}</p> : null}
                {entry.status === "conflict" && entry.current ? (
                  <ConflictChoice entry={entry} snapshot={snapshot} onChoose={(choice) => void resolve(entry, choice)} />
                ) : confirmDelete === entry.id ? (
                  <ConfirmDelete entry={entry} dependents={dependentsOf(entry.id, entries)} onDone={() => { setConfirmDelete(null); void refresh(); }} />
                ) : (
                  <div className="mt-2 flex flex-wrap gap-3">
                    <button type="button" className={bigButton.plain} onClick={() => setEditing(entry)}>{entry.status === "rejected" ? "Fix" : "Edit"}<span className="sr-only"> {entry.summary}</span></button>
                    <button type="button" className={bigButton.plain} onClick={() => setConfirmDelete(entry.id)}>Delete<span className="sr-only"> {entry.summary}</span></button>
                  </div>
                )}
              </li>
            ))}
          </ol>
        ) : entries ? <p className="mt-2 text-muted">Nothing waiting: every entry made on this device has been sent.</p> : null}
      </section>

      {editing ? (
        <section aria-label="Change a waiting entry" className="mt-4 rounded border-2 border-lagoon bg-panel p-4">
          {editing.mayHaveReachedServer ? <p className="mb-3 rounded bg-paper p-2 text-sm">Its last sending got no answer: if the server stored it then, the stored version stands and a change made now is not applied.</p> : null}
          <EntryForm
            key={editing.id}
            kind={editing.kind}
            snapshot={snapshot}
            initial={editing.form}
            initialPhotos={editing.photos}
            findChoices={findChoices}
            serverErrors={editing.fieldErrors}
            locked={editing.serverId !== undefined}
            editing
            onSave={(draft) => save(editing.kind, draft, editing)}
            onCancel={() => setEditing(null)}
          />
        </section>
      ) : null}

      {!editing && kinds.length > 0 && kind ? (
        <section aria-label="New entry" className="mt-4">
          <div role="group" aria-label="What to enter" className="grid grid-cols-2 gap-2 sm:grid-cols-3">
            {kinds.map((candidate) => (
              <button key={candidate} type="button" aria-pressed={candidate === kind} className={candidate === kind ? bigButton.primary : bigButton.plain} onClick={() => { setKind(candidate); setSavedNote(null); }}>
                {ENTRY_LABELS[candidate]}
              </button>
            ))}
          </div>
          <div className="mt-4 rounded border border-line bg-panel p-4">
            <EntryForm key={`${kind}-${formKey}`} kind={kind} snapshot={snapshot} findChoices={findChoices} initial={blankForm(kind, snapshot, new Date())} editing={false} onSave={(draft) => save(kind, draft, null)} />
          </div>
        </section>
      ) : null}
      {kinds.length === 0 ? <p className="mt-4">Your role on this project enters no field records (dive logs, readings, finds, sightings or dewatering records). The project's pages show what has been recorded.</p> : null}

      {sent.length > 0 ? (
        <section aria-labelledby="sent-heading" className="mt-6">
          <h2 id="sent-heading" className="text-lg font-semibold">Sent from this device</h2>
          <ul className="mt-2 space-y-2">
            {sent.map((entry) => (
              <li key={entry.id} className="rounded border border-line bg-panel p-3" data-sent-id={entry.id}>
                <p>{entry.summary} · <span className="figures">#{entry.serverId}</span></p>
                <p className="text-sm text-muted">Sent <time className="figures" dateTime={entry.sentAt}>{shortTime(entry.sentAt)}</time>{entry.replayed ? " (the server had it already: stored once)" : ""}</p>
                {entry.notices.map((notice) => <p key={notice} className="mt-1 font-medium text-danger">{notice}</p>)}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </main>
  );
}
