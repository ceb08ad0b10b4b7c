import { useRef, useState } from "react";
import { Form } from "react-router";

/** The service worker's cache of field pages (vite.config.ts names it): pages rendered with a person's data. */
const FIELD_PAGES_CACHE = "firmsand-field-pages";

/**
 * Sign out, without silently losing field entries: entries this person made on the field page and
 * has not sent yet are counted first, and signing out asks before it deletes them. Signing out then
 * clears this person's queue and kept project data from the device (IndexedDB) and the cached field
 * pages, so the next person on the phone neither sees nor sends them.
 */
export function SignOutForm({ userId }: { userId: number }) {
  const form = useRef<HTMLFormElement>(null);
  const [unsent, setUnsent] = useState<number | null>(null);
  const [busy, setBusy] = useState(false);

  async function clearDevice() {
    try {
      const { forgetUser } = await import("./field/store");
      await forgetUser(userId);
    } catch {
      // No IndexedDB in this browser: nothing was kept.
    }
    if (typeof caches !== "undefined") await caches.delete(FIELD_PAGES_CACHE).catch(() => false);
  }

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    if (busy) return;
    event.preventDefault();
    setBusy(true);
    let count = 0;
    try {
      const { countUnsent } = await import("./field/store");
      count = await countUnsent(userId);
    } catch {
      count = 0;
    }
    if (count > 0) {
      setUnsent(count);
      setBusy(false);
      return;
    }
    await clearDevice();
    form.current?.submit();
  }

  async function confirm() {
    setBusy(true);
    await clearDevice();
    form.current?.submit();
  }

  return (
    <>
      <Form method="post" action="/logout" ref={form} onSubmit={(event) => void onSubmit(event)}>
        <button type="submit" disabled={busy} className="whitespace-nowrap rounded border border-line px-3 py-1 hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon">Sign out</button>
      </Form>
      {unsent !== null ? (
        <div role="alertdialog" aria-modal="true" aria-labelledby="sign-out-heading" aria-describedby="sign-out-text" className="fixed inset-0 z-50 flex items-end justify-center bg-ink/40 p-4 sm:items-center" onKeyDown={(event) => { if (event.key === "Escape") setUnsent(null); }}>
          <div className="w-full max-w-md rounded border-2 border-danger bg-panel p-4 text-base shadow-lg">
            <h2 id="sign-out-heading" className="text-lg font-semibold">{unsent === 1 ? "1 field entry has" : `${unsent} field entries have`} not been sent</h2>
            <p id="sign-out-text" className="mt-2">
              {unsent === 1 ? "It is" : "They are"} kept only on this device. Signing out deletes {unsent === 1 ? "it" : "them"} from this device for good. To keep {unsent === 1 ? "it" : "them"}, stay signed in and send the queue from the field page when there is a connection.
            </p>
            <div className="mt-4 flex flex-wrap gap-3">
              <button type="button" autoFocus className="min-h-12 rounded bg-lagoon px-4 py-2 font-medium text-white hover:bg-lagoon-dark focus-visible:outline-3 focus-visible:outline-offset-2 focus-visible:outline-lagoon" onClick={() => setUnsent(null)}>Stay signed in</button>
              <button type="button" disabled={busy} className="min-h-12 rounded bg-danger px-4 py-2 font-medium text-white hover:opacity-90 focus-visible:outline-3 focus-visible:outline-offset-2 focus-visible:outline-lagoon" onClick={() => void confirm()}>
                Sign out and delete {unsent === 1 ? "it" : `all ${unsent}`}
              </button>
            </div>
          </div>
        </div>
      ) : null}
    </>
  );
}
