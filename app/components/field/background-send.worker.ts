import { BACKGROUND_SEND_TAG, sendAllWaiting } from "./sync";

/**
 * The service worker's part of the field queue, bundled alone into `field-send.js` (vite.config.ts)
 * and loaded by the generated worker with importScripts. On a Background Sync `sync` event (the
 * browser fires it when a connection is there, even with every page of the app closed) it sends the
 * same IndexedDB queue the page sends, through the same code: the same Idempotency-Key per entry, the
 * entry's author in Firmsand-Entry-User, and the same Web Lock as the page, so only one of them sends
 * at a time. A run stopped for want of a connection rejects, so the browser tries again later.
 */

interface SyncEvent extends Event {
  readonly tag: string;
  waitUntil(promise: Promise<unknown>): void;
}

const scope = globalThis as unknown as { addEventListener(type: "sync", listener: (event: SyncEvent) => void): void };

scope.addEventListener("sync", (event) => {
  if (event.tag === BACKGROUND_SEND_TAG) event.waitUntil(sendAllWaiting());
});
