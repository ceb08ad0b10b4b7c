import sharp from "sharp";
import { request as playwrightRequest, type APIRequestContext, type Page } from "@playwright/test";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInWithPassword, DEMO_PASSWORD, test } from "./fixtures";

// The field page without signal, in the manager's hands (who may enter every kind of record): the
// page opens offline once visited, entries wait in the device's queue through a reload, and go to
// the server once each when the connection returns; a lost answer is retried without a second
// record; a refused entry stays with the server's words. Every test marks its records with a
// text of its own, so the count it checks through the API is its own records only.
// The dives go on the demo's plan of 2026-11-12 (Team Gar, cell AH2): a past day with a plan.

const DIVE_DAY = "2026-11-12";
const DIVE_TEAM = "Team Gar";
const DIVE_CELL = "AH2";
const DIVE_DIVER = "Florian Bexley";

let projectId = 0;
let api: APIRequestContext;

test.beforeAll(async ({ baseURL }) => {
  api = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(api, baseURL!);
});
test.afterAll(async () => {
  await api.dispose();
});

function marker(label: string): string {
  return `${label}-${Date.now().toString(36)}-${Math.floor(Math.random() * 1e6)}`;
}

async function openFieldPage(page: Page) {
  await signInWithPassword(page, DEMO_ACCOUNTS.manager, DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/projects$/);
  await page.goto(`/projects/${projectId}/field`);
  await expect(page.getByRole("heading", { level: 1, name: /field entry/ })).toBeVisible();
  // The queue's count is read from the device once the page's scripts run: the buttons work from then on
  // (a click on the server's HTML before that did nothing, and a CI run under load timed out on it).
  await expect(page.getByRole("heading", { level: 2, name: /^\d+ waiting to send/ })).toBeVisible();
}

async function enterDive(page: Page, note: string, cells = DIVE_CELL) {
  await page.getByRole("button", { name: "Dive log entry", exact: true }).click();
  await page.getByLabel("Day of the dive").fill(DIVE_DAY);
  await page.getByLabel("Team", { exact: true }).selectOption({ label: DIVE_TEAM });
  await page.getByLabel("Diver", { exact: true }).fill(DIVE_DIVER);
  await page.getByLabel("Bottom time (minutes)").fill("35");
  await page.getByLabel(/Maximum depth/).fill("7.5");
  await page.getByLabel("Cells worked").fill(cells);
  await page.getByLabel("Notes", { exact: true }).fill(note);
  await page.getByRole("button", { name: "Save to the queue" }).click();
}

async function enterReading(page: Page, note: string, takenAt: string) {
  await page.getByRole("button", { name: "Turbidity reading", exact: true }).click();
  await page.getByLabel("Station", { exact: true }).selectOption({ label: "OF-1 return outfall (outfall)" });
  await page.getByLabel(/Sample taken/).fill(takenAt);
  await page.getByLabel("Turbidity", { exact: true }).fill("4.2");
  await page.getByLabel("Note", { exact: true }).fill(note);
  await page.getByRole("button", { name: "Save to the queue" }).click();
}

async function enterFind(page: Page, description: string) {
  await page.getByRole("button", { name: "Find", exact: true }).click();
  await page.getByLabel("Category", { exact: true }).selectOption("modern-debris");
  await page.getByLabel("Description", { exact: true }).fill(description);
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#6d8a7a" } }).jpeg().toBuffer();
  await page.getByLabel("Add a photo").setInputFiles({ name: "can.jpg", mimeType: "image/jpeg", buffer: photo });
  await expect(page.getByRole("button", { name: "Remove can.jpg" })).toBeVisible();
  await page.getByRole("button", { name: "Save to the queue" }).click();
}

async function divesWith(note: string) {
  const body = (await (await api.get(`/api/projects/${projectId}/dives?date=${DIVE_DAY}`)).json()) as { dives: Array<{ id: number; notes: string }> };
  return body.dives.filter((dive) => dive.notes === note);
}
/**
 * The readings with this note, looked for from the day before the given UTC day to the day after: the server files a reading
 * under the project's own day (its time zone), which differs from the UTC day for some hours every evening.
 */
async function readingsWith(note: string, day: string) {
  const shift = (days: number) => new Date(Date.parse(`${day}T12:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
  const body = (await (await api.get(`/api/projects/${projectId}/water-quality/readings?from=${shift(-1)}&to=${shift(1)}`)).json()) as { readings: Array<{ id: number; note: string; takenAt: string; photos: Array<{ id: number }> }> };
  return body.readings.filter((reading) => reading.note === note);
}
/** A reading at the outfall with a photo of the sample, taken now by the browser's clock and zone; answers the time field's value. */
async function enterReadingWithPhoto(page: Page, note: string): Promise<string> {
  const takenAt = localValue(new Date(), await page.evaluate(() => Intl.DateTimeFormat().resolvedOptions().timeZone));
  await page.getByRole("button", { name: "Turbidity reading", exact: true }).click();
  await page.getByLabel("Station", { exact: true }).selectOption({ label: "OF-1 return outfall (outfall)" });
  await page.getByLabel(/Sample taken/).fill(takenAt);
  await page.getByLabel("Turbidity", { exact: true }).fill("4.2");
  await page.getByLabel("Note", { exact: true }).fill(note);
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#7a8f96" } }).jpeg().toBuffer();
  await page.getByLabel("Add a photo").setInputFiles({ name: "sample-bottle.jpg", mimeType: "image/jpeg", buffer: photo });
  await expect(page.getByRole("button", { name: "Remove sample-bottle.jpg" })).toBeVisible();
  await page.getByRole("button", { name: "Save to the queue" }).click();
  return takenAt;
}
async function findsWith(description: string) {
  const body = (await (await api.get(`/api/projects/${projectId}/finds`)).json()) as { finds: Array<{ id: number; description: string }> };
  return body.finds.filter((find) => find.description === description);
}

/** The service worker is running and this page is in its cache. */
async function waitUntilOfflineReady(page: Page) {
  await expect(page.getByText("This page opens on this device without a connection.")).toBeVisible({ timeout: 30_000 });
}

const pad = (value: number) => String(value).padStart(2, "0");
/** A date-time field's value for a moment, in the browser's time zone (the context's). */
function localValue(date: Date, timeZone: string): string {
  const parts = Object.fromEntries(new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).formatToParts(date).map((part) => [part.type, part.value]));
  return `${parts.year}-${parts.month}-${parts.day}T${pad(Number(parts.hour))}:${parts.minute}`;
}

test.describe("with the service worker", () => {
  // The phone's own zone, different from the server's: the reading keeps the device's time and offset.
  test.use({ timezoneId: "America/New_York", viewport: { width: 390, height: 844 } });

  test("entries made offline survive a reload offline and are stored once each when the connection returns", async ({ page, context }) => {
    test.setTimeout(120_000);
    await openFieldPage(page);
    await waitUntilOfflineReady(page);
    const note = marker("offline-dive");
    const readingNote = marker("offline-reading");
    const description = marker("offline-find");
    // Taken 40 minutes before it is entered: the record keeps that time, not the time it is sent.
    const takenAt = new Date(Math.floor((Date.now() - 40 * 60_000) / 60_000) * 60_000);

    await context.setOffline(true);
    await enterDive(page, note);
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    await enterReading(page, readingNote, localValue(takenAt, "America/New_York"));
    await enterFind(page, description);
    await expect(page.getByRole("heading", { name: /^3 waiting to send; nothing sent yet/ })).toBeVisible();

    // Still offline: the page comes from the service worker, the queue from IndexedDB.
    await page.reload();
    await expect(page.getByRole("status").filter({ hasText: "Offline" })).toBeVisible();
    await expect(page.getByRole("heading", { name: /^3 waiting to send/ })).toBeVisible();
    const queue = page.getByRole("list", { name: "Entries in the queue, in sending order" });
    await expect(queue.getByRole("listitem")).toHaveCount(3);
    await expect(queue.getByRole("listitem").nth(0)).toContainText(`Dive · ${DIVE_DIVER}`);
    await expect(queue.getByRole("listitem").nth(1)).toContainText("Reading · OF-1 return outfall · 4.2 NTU");
    await expect(queue.getByRole("listitem").nth(2)).toContainText("1 photo");
    expect(await divesWith(note)).toHaveLength(0);

    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent \d\d:\d\d/ })).toBeVisible({ timeout: 30_000 });
    await expect(page.getByRole("region", { name: "Sent from this device" }).getByRole("listitem")).toHaveCount(3);

    expect(await divesWith(note)).toHaveLength(1);
    const readings = await readingsWith(readingNote, takenAt.toISOString().slice(0, 10));
    expect(readings).toHaveLength(1);
    expect(Date.parse(readings[0].takenAt)).toBe(takenAt.getTime());
    const finds = await findsWith(description);
    expect(finds).toHaveLength(1);
    const find = (await (await api.get(`/api/projects/${projectId}/finds/${finds[0].id}`)).json()) as { find: { photos: unknown[] } };
    expect(find.find.photos).toHaveLength(1);
  });

  test("the manifest and the service worker: the page loads offline, other pages say they need the server", async ({ page, context }) => {
    await openFieldPage(page);
    await waitUntilOfflineReady(page);
    await context.setOffline(true);
    await page.reload();
    await expect(page.getByRole("heading", { level: 1, name: /field entry/ })).toBeVisible();
    expect(await page.evaluate(() => Boolean(navigator.serviceWorker.controller))).toBe(true);
    const href = await page.locator('link[rel="manifest"]').getAttribute("href");
    expect(href).toBe("/manifest.webmanifest");
    const manifest = await page.evaluate(async (url) => (await fetch(url)).json(), href!);
    expect(manifest).toMatchObject({ name: "Firmsand field", display: "standalone", start_url: "/projects", scope: "/" });
    const sizes = (manifest.icons as Array<{ sizes: string; src: string }>).map((icon) => icon.sizes);
    expect(sizes).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    for (const icon of manifest.icons as Array<{ src: string }>) {
      expect(await page.evaluate(async (src) => (await fetch(src)).status, icon.src), icon.src).toBe(200);
    }
    await page.goto(`/projects/${projectId}/map`);
    await expect(page.getByRole("heading", { level: 1, name: "You are offline — this page needs the server" })).toBeVisible();
    await expect(page.getByRole("link", { name: /field entry/ })).toHaveAttribute("href", `/projects/${projectId}/field`);
  });
});

test.describe("sending", () => {
  // page.route sees the page's own requests only when no service worker stands between.
  test.use({ serviceWorkers: "block" });

  test("a lost answer: the retry returns the stored reading, so it is stored once", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("lost-answer");
    let posts = 0;
    await page.route(`**/api/projects/${projectId}/water-quality/readings`, async (route) => {
      if (route.request().method() !== "POST") return route.continue();
      posts += 1;
      if (posts === 1) {
        // The request reaches the server and is stored; its answer never comes back.
        const answer = await route.fetch();
        expect(answer.status()).toBe(201);
        return route.abort("connectionreset");
      }
      return route.continue();
    });
    await context.setOffline(true);
    await enterReading(page, note, localValue(new Date(), "UTC"));
    await context.setOffline(false);
    await expect(page.getByText("No connection: the entry waits and is sent when the connection returns.")).toBeVisible({ timeout: 15_000 });
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    expect(await readingsWith(note, new Date().toISOString().slice(0, 10))).toHaveLength(1);

    await page.getByRole("button", { name: "Send now" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    await expect(page.getByText("(the server had it already: stored once)")).toBeVisible();
    expect(posts).toBe(2);
    expect(await readingsWith(note, new Date().toISOString().slice(0, 10))).toHaveLength(1);
  });

  test("a refused entry stays in the queue with the server's words, through a reload, until it is fixed", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("refused-dive");
    await context.setOffline(true);
    // A1 is not on Team Gar's plan that day: the device cannot know, the server refuses it.
    await enterDive(page, note, "A1");
    await context.setOffline(false);
    const entry = page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").filter({ hasText: `Dive · ${DIVE_DIVER}` });
    await expect(entry).toContainText("Refused by the server", { timeout: 15_000 });
    await expect(entry).toContainText("A1");
    await expect(page.getByRole("heading", { name: /^0 waiting to send, 1 refused/ })).toBeVisible();
    await page.reload();
    await expect(entry).toContainText("Refused by the server");
    expect(await divesWith(note)).toHaveLength(0);

    // Fixed: the right cell, sent again.
    await entry.getByRole("button", { name: /^Fix/ }).click();
    await page.getByLabel("Cells worked").fill(DIVE_CELL);
    await page.getByRole("button", { name: "Save changes" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    expect(await divesWith(note)).toHaveLength(1);
  });

  test("a tube's status changed offline while the tube changed on the server: both shown side by side, the user chooses", async ({ page, context, baseURL }) => {
    const origin = new URL(baseURL!).origin;
    const name = marker("tube");
    const registered = await api.post(`/api/projects/${projectId}/dewatering/tubes`, { data: { name, circumference: 60, length: 100, capacityDryMassPerLength: 0.5 }, headers: { Origin: origin } });
    expect(registered.status()).toBe(201);
    const { tube } = (await registered.json()) as { tube: { id: number } };
    await openFieldPage(page);
    await context.setOffline(true);
    await page.getByRole("button", { name: "Tube status", exact: true }).click();
    await page.getByLabel("Tube", { exact: true }).selectOption(String(tube.id));
    await page.getByLabel("New status", { exact: true }).selectOption("dewatering");
    await page.getByRole("button", { name: "Save to the queue" }).click();
    // Meanwhile, at the office: the same tube is marked ready to open.
    const changed = await api.patch(`/api/projects/${projectId}/dewatering/tubes/${tube.id}`, { data: { status: "ready-to-open" }, headers: { Origin: origin } });
    expect(changed.status()).toBe(200);
    await context.setOffline(false);
    const entry = page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").filter({ hasText: name });
    await expect(entry).toContainText("Changed on the server meanwhile: choose", { timeout: 15_000 });
    await expect(entry.getByRole("region", { name: "Your change" })).toContainText("filling → dewatering");
    await expect(entry.getByRole("region", { name: "On the server now" })).toContainText("ready-to-open");
    await expect(page.getByRole("heading", { name: /^0 waiting to send, 1 to decide/ })).toBeVisible();
    await entry.getByRole("button", { name: "Send my change" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    const now = (await (await api.get(`/api/projects/${projectId}/dewatering/tubes/${tube.id}`)).json()) as { tube: { status: string } };
    expect(now.tube.status).toBe("dewatering");
  });

  test("a tube fill made offline is stored once when the connection returns", async ({ page, context, baseURL }) => {
    const name = marker("fill-tube");
    const registered = await api.post(`/api/projects/${projectId}/dewatering/tubes`, { data: { name, circumference: 60, length: 100, capacityDryMassPerLength: 0.5 }, headers: { Origin: new URL(baseURL!).origin } });
    expect(registered.status()).toBe(201);
    const { tube } = (await registered.json()) as { tube: { id: number } };
    await openFieldPage(page);
    await context.setOffline(true);
    await page.getByRole("button", { name: "Tube fill", exact: true }).click();
    await page.getByLabel("Tube", { exact: true }).selectOption(String(tube.id));
    await page.getByLabel(/^Dry solids/).fill("3.5");
    await page.getByRole("button", { name: "Save to the queue" }).click();
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    const now = (await (await api.get(`/api/projects/${projectId}/dewatering/tubes/${tube.id}`)).json()) as { tube: { fills: Array<{ drySolids: number }> } };
    // Kept in kilograms and shown in the project's short tons: equal to the entry within rounding.
    expect(now.tube.fills).toHaveLength(1);
    expect(now.tube.fills[0].drySolids).toBeCloseTo(3.5, 9);
  });

  test("a device clock more than 5 minutes off the server's is shown", async ({ page }) => {
    // The server's Date header says 12 minutes later than this device's clock.
    await page.route("**/healthz", (route) => route.fulfill({ status: 200, contentType: "application/json", headers: { Date: new Date(Date.now() + 12 * 60_000).toUTCString() }, body: JSON.stringify({ ok: true, db: "up" }) }));
    await openFieldPage(page);
    await expect(page.getByText(/This device's clock is 1[12] minutes behind the server's\./)).toBeVisible({ timeout: 15_000 });
  });

  test("the device refuses what the server would, before it is queued", async ({ page }) => {
    await openFieldPage(page);
    await page.getByRole("button", { name: "Turbidity reading", exact: true }).click();
    await page.getByLabel("Station", { exact: true }).selectOption({ label: "OF-1 return outfall (outfall)" });
    await page.getByLabel("Turbidity", { exact: true }).fill("-3");
    await page.getByRole("button", { name: "Save to the queue" }).click();
    await expect(page.getByText("turbidity is 0 NTU or more")).toBeVisible();
    await expect(page.getByLabel("Turbidity", { exact: true })).toBeFocused();
    await expect(page.getByRole("heading", { name: /^0 waiting to send/ })).toBeVisible();
  });
});


// ——— Dewatering records, handovers, a find's status and signing out.

const HAUL_SITE = "Bellwether Farm (reuse)";

async function enterShift(page: Page, note: string) {
  await page.getByRole("button", { name: "Shift log", exact: true }).click();
  await page.getByLabel("Slurry flow", { exact: true }).fill("900");
  await page.getByLabel("Solids by weight (%)").fill("12");
  await page.getByLabel("Product", { exact: true }).fill("Floc-A");
  await page.getByLabel("Stock concentration (%)").fill("0.5");
  await page.getByLabel("Dose (mg/L)").fill("15");
  // The figures come from the same function the server stores them with.
  await expect(page.getByTestId("field-stock-feed-rate")).not.toHaveText("–");
  await page.getByLabel("Notes", { exact: true }).fill(note);
  await page.getByRole("button", { name: "Save to the queue" }).click();
}

async function enterHaul(page: Page, ticket: string) {
  await page.getByRole("button", { name: "Haul ticket", exact: true }).click();
  await page.getByLabel("Ticket number").fill(ticket);
  await page.getByLabel("Truck", { exact: true }).fill("Truck 2");
  await page.getByLabel("Destination", { exact: true }).selectOption({ label: HAUL_SITE });
  await page.getByLabel("Load", { exact: true }).fill("14.5");
  await page.getByLabel("Cake solids (%)").fill("30");
  const photo = await sharp({ create: { width: 480, height: 640, channels: 3, background: "#c9c2a8" } }).jpeg().toBuffer();
  await page.getByLabel("Add a photo").setInputFiles({ name: "ticket.jpg", mimeType: "image/jpeg", buffer: photo });
  await expect(page.getByRole("button", { name: "Remove ticket.jpg" })).toBeVisible();
  await page.getByRole("button", { name: "Save to the queue" }).click();
}

async function haulsWith(ticket: string) {
  const body = (await (await api.get(`/api/projects/${projectId}/hauls`)).json()) as { hauls: Array<{ id: number; ticketNumber: string; photos: unknown[] }> };
  return body.hauls.filter((haul) => haul.ticketNumber === ticket);
}
async function shiftsWith(note: string) {
  const body = (await (await api.get(`/api/projects/${projectId}/dewatering/shifts`)).json()) as { shifts: Array<{ id: number; notes: string }> };
  return body.shifts.filter((shift) => shift.notes === note);
}

/** What this browser keeps in IndexedDB: queued entries (with their owners) and kept project copies. */
async function deviceStore(page: Page): Promise<{ queue: Array<{ userId: number }>; projects: number }> {
  return page.evaluate(() => new Promise((resolve, reject) => {
    const open = indexedDB.open("firmsand-field");
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const db = open.result;
      const transaction = db.transaction(["queue", "projects"]);
      const queue = transaction.objectStore("queue").getAll();
      const projects = transaction.objectStore("projects").count();
      transaction.oncomplete = () => {
        resolve({ queue: queue.result as Array<{ userId: number }>, projects: projects.result });
        db.close();
      };
    };
  }));
}

test.describe("dewatering and custody offline, with the service worker", () => {
  test.use({ timezoneId: "America/New_York", viewport: { width: 390, height: 844 } });

  test("a shift log, a haul ticket with its photo and a handover of a find made offline are stored once each", async ({ page, context }) => {
    test.setTimeout(150_000);
    await openFieldPage(page);
    await waitUntilOfflineReady(page);
    const note = marker("offline-shift");
    const ticket = marker("T");
    const description = marker("handed-find");
    const receiver = marker("Courier");

    await context.setOffline(true);
    await enterShift(page, note);
    await enterHaul(page, ticket);
    await enterFind(page, description);
    // The find is not on the server yet: the handover names it from the queue.
    await page.getByRole("button", { name: "Custody handover", exact: true }).click();
    const findSelect = page.getByLabel("Find", { exact: true });
    const queuedFind = await findSelect.locator("option", { hasText: description }).getAttribute("value");
    expect(queuedFind).toMatch(/^queued:/);
    await findSelect.selectOption(queuedFind!);
    await page.getByLabel("Purpose", { exact: true }).selectOption({ label: "To the state lab" });
    await page.getByLabel("Received by").fill(receiver);
    await page.getByLabel("Place it goes to").fill("State lab, Fennick");
    await page.getByLabel("Receiver's name, typed as their signature").fill(receiver);
    await page.getByRole("button", { name: "Save to the queue" }).click();
    await expect(page.getByRole("heading", { name: /^4 waiting to send; nothing sent yet/ })).toBeVisible();

    await page.reload();
    await expect(page.getByRole("status").filter({ hasText: "Offline" })).toBeVisible();
    const queue = page.getByRole("list", { name: "Entries in the queue, in sending order" });
    await expect(queue.getByRole("listitem")).toHaveCount(4);
    await expect(queue.getByRole("listitem").nth(0)).toContainText("Shift ·");
    await expect(queue.getByRole("listitem").nth(1)).toContainText(`Haul ticket ${ticket}`);
    await expect(queue.getByRole("listitem").nth(1)).toContainText("1 photo");
    await expect(queue.getByRole("listitem").nth(3)).toContainText(`Handover · new find "${description}`);

    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent \d\d:\d\d/ })).toBeVisible({ timeout: 45_000 });
    expect(await shiftsWith(note)).toHaveLength(1);
    const hauls = await haulsWith(ticket);
    expect(hauls).toHaveLength(1);
    expect(hauls[0].photos).toHaveLength(1);
    const finds = await findsWith(description);
    expect(finds).toHaveLength(1);
    const find = (await (await api.get(`/api/projects/${projectId}/finds/${finds[0].id}`)).json()) as { find: { custody: Array<{ toName: string }>; photos: unknown[] } };
    expect(find.find.custody.map((entry) => entry.toName)).toEqual([receiver]);
    expect(find.find.photos).toHaveLength(1);
  });
});

test.describe("dewatering and finds, sending", () => {
  test.use({ serviceWorkers: "block" });

  test("a lost answer to a reading's photo: the retry stores neither the reading nor the photo twice", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("reading-photo-lost");
    let photoPosts = 0;
    await page.route(`**/api/projects/${projectId}/water-quality/readings/*/photos`, async (route) => {
      if (route.request().method() !== "POST") return route.continue();
      photoPosts += 1;
      if (photoPosts === 1) {
        // The photo reaches the server and is stored; its answer never comes back.
        const answer = await route.fetch();
        expect(answer.status()).toBe(201);
        return route.abort("connectionreset");
      }
      return route.continue();
    });
    await context.setOffline(true);
    const takenAt = await enterReadingWithPhoto(page, note);
    await context.setOffline(false);
    const entry = page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").first();
    await expect(entry).toContainText(/Stored as #\d+; photos waiting/, { timeout: 15_000 });
    expect((await readingsWith(note, takenAt.slice(0, 10)))[0].photos).toHaveLength(1);

    await page.getByRole("button", { name: "Send now" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    expect(photoPosts).toBe(2);
    const readings = await readingsWith(note, takenAt.slice(0, 10));
    expect(readings).toHaveLength(1);
    expect(readings[0].photos).toHaveLength(1);
  });

  test("a lost answer to a haul ticket's photo: the retry stores neither the ticket nor the photo twice", async ({ page, context }) => {
    await openFieldPage(page);
    const ticket = marker("T");
    let photoPosts = 0;
    await page.route(`**/api/projects/${projectId}/hauls/*/photos`, async (route) => {
      if (route.request().method() !== "POST") return route.continue();
      photoPosts += 1;
      if (photoPosts === 1) {
        // The photo reaches the server and is stored; its answer never comes back.
        const answer = await route.fetch();
        expect(answer.status()).toBe(201);
        return route.abort("connectionreset");
      }
      return route.continue();
    });
    await context.setOffline(true);
    await enterHaul(page, ticket);
    await context.setOffline(false);
    const entry = page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").filter({ hasText: ticket });
    await expect(entry).toContainText(/Stored as #\d+; photos waiting/, { timeout: 15_000 });
    expect((await haulsWith(ticket))[0].photos).toHaveLength(1);

    await page.getByRole("button", { name: "Send now" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    expect(photoPosts).toBe(2);
    const hauls = await haulsWith(ticket);
    expect(hauls).toHaveLength(1);
    expect(hauls[0].photos).toHaveLength(1);
  });

  test("a jar test with its photo made offline is stored once, the photo to the test's id", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("offline-jars");
    await context.setOffline(true);
    await page.getByRole("button", { name: "Jar test", exact: true }).click();
    await page.getByLabel("Polymer product").fill("Floc-A");
    await page.getByLabel("Dose (mg/L)").nth(0).fill("5");
    // computed: a 1,000 mL jar at 5 mg/L from a 0.1 % (1 mg/mL) stock takes 5 mL
    await expect(page.getByText("add 5 mL of bench stock")).toBeVisible();
    await page.getByLabel("Clarity").nth(0).selectOption({ label: "hazy" });
    await page.getByLabel("Dose (mg/L)").nth(1).fill("10");
    await page.getByLabel("Clarity").nth(1).selectOption({ label: "clear" });
    await page.getByLabel("Notes", { exact: true }).fill(note);
    const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a7a5d" } }).jpeg().toBuffer();
    await page.getByLabel("Add a photo").setInputFiles({ name: "jars.jpg", mimeType: "image/jpeg", buffer: photo });
    await page.getByRole("button", { name: "Save to the queue" }).click();
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    const body = (await (await api.get(`/api/projects/${projectId}/dewatering/jar-tests`)).json()) as { jarTests: Array<{ notes: string; jars: unknown[]; photos: unknown[] }> };
    const tests = body.jarTests.filter((test) => test.notes === note);
    expect(tests).toHaveLength(1);
    expect(tests[0].jars).toHaveLength(2);
    expect(tests[0].photos).toHaveLength(1);
  });

  test("a reading with its photo made offline is stored once, the photo to the reading's id", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("offline-reading-photo");
    await context.setOffline(true);
    const takenAt = await enterReadingWithPhoto(page, note);
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    await expect(page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").first()).toContainText("1 photo");
    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible({ timeout: 15_000 });
    const readings = await readingsWith(note, takenAt.slice(0, 10));
    expect(readings).toHaveLength(1);
    expect(readings[0].photos).toHaveLength(1);
  });

  test("a find's status changed offline while the find changed on the server: side by side, the user keeps the server's", async ({ page, context, baseURL }) => {
    const origin = new URL(baseURL!).origin;
    const description = marker("status-find");
    const created = await api.post(`/api/projects/${projectId}/finds`, { data: { category: "modern-debris", description, foundAt: new Date().toISOString() }, headers: { Origin: origin } });
    expect(created.status()).toBe(201);
    const { id } = (await created.json()) as { id: number };
    await openFieldPage(page);
    // The version the page keeps is the one the find's own answer carries (so an unchanged find is not a conflict).
    const served = (await (await api.get(`/api/projects/${projectId}/finds/${id}`)).json()) as { find: { version: string } };
    await expect.poll(() => page.evaluate((findId) => new Promise<string | undefined>((resolve) => {
      const open = indexedDB.open("firmsand-field");
      open.onsuccess = () => {
        const request = open.result.transaction("projects").objectStore("projects").getAll();
        request.onsuccess = () => resolve((request.result as Array<{ snapshot: { finds: Array<{ id: number; version: string }> } }>).flatMap((kept) => kept.snapshot.finds).find((find) => find.id === findId)?.version);
      };
    }), id)).toBe(served.find.version);

    await context.setOffline(true);
    await page.getByRole("button", { name: "Find status", exact: true }).click();
    await page.getByLabel("Find", { exact: true }).selectOption(String(id));
    await page.getByLabel("New status", { exact: true }).selectOption({ label: "Site store" });
    await page.getByRole("button", { name: "Save to the queue" }).click();
    // Meanwhile, at the office: the find goes to the lab.
    const changed = await api.patch(`/api/projects/${projectId}/finds/${id}`, { data: { status: "at-lab" }, headers: { Origin: origin } });
    expect(changed.status()).toBe(200);
    await context.setOffline(false);
    const entry = page.getByRole("list", { name: "Entries in the queue, in sending order" }).getByRole("listitem").filter({ hasText: "Find " });
    await expect(entry).toContainText("Changed on the server meanwhile: choose", { timeout: 15_000 });
    await expect(entry.getByRole("region", { name: "Your change" })).toContainText("In field → Site store");
    await expect(entry.getByRole("region", { name: "On the server now" })).toContainText("At the lab");
    await expect(page.getByRole("heading", { name: /^0 waiting to send, 1 to decide/ })).toBeVisible();
    await entry.getByRole("button", { name: "Keep the server's and drop mine" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; / })).toBeVisible();
    await expect(page.getByText("Nothing waiting: every entry made on this device has been sent.")).toBeVisible();
    const now = (await (await api.get(`/api/projects/${projectId}/finds/${id}`)).json()) as { find: { status: string } };
    expect(now.find.status).toBe("at-lab");
  });

  test("signing out with entries waiting asks first, naming the count, and then clears them from the device", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("never-sent");
    // The readings never get through: the entry stays waiting while the page is online.
    await page.route(`**/api/projects/${projectId}/water-quality/readings`, (route) => (route.request().method() === "POST" ? route.abort("connectionreset") : route.continue()));
    await context.setOffline(true);
    await enterReading(page, note, localValue(new Date(), "UTC"));
    await context.setOffline(false);
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    const manager = (await deviceStore(page)).queue[0].userId;

    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    const dialog = page.getByRole("alertdialog", { name: "1 field entry has not been sent" });
    await expect(dialog).toBeVisible();
    await dialog.getByRole("button", { name: "Stay signed in" }).click();
    await expect(dialog).toBeHidden();
    expect((await deviceStore(page)).queue).toHaveLength(1);

    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    await dialog.getByRole("button", { name: "Sign out and delete it" }).click();
    await expect(page).toHaveURL(/\/login/);
    const kept = await deviceStore(page);
    expect(kept.queue.filter((entry) => entry.userId === manager)).toHaveLength(0);
    expect(kept.projects).toBe(0);
    expect(await readingsWith(note, new Date().toISOString().slice(0, 10))).toHaveLength(0);
  });

  test("another person signed in on the same phone neither sees nor sends the entries left waiting", async ({ page, context }) => {
    await openFieldPage(page);
    const note = marker("left-waiting");
    await context.setOffline(true);
    await enterReading(page, note, localValue(new Date(), "UTC"));
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    // The tab is closed and the session ends without signing out (expired, or cleared); a colleague signs in.
    await page.close();
    await context.clearCookies();
    await context.setOffline(false);
    const colleague = await context.newPage();
    await signInWithPassword(colleague, DEMO_ACCOUNTS["resource-monitor"], DEMO_PASSWORD);
    await expect(colleague).toHaveURL(/\/projects$/);
    await colleague.goto(`/projects/${projectId}/field`);
    await expect(colleague.getByRole("heading", { name: /^0 waiting to send/ })).toBeVisible();
    await expect(colleague.getByRole("button", { name: "Send now" })).toBeDisabled();
    expect(await readingsWith(note, new Date().toISOString().slice(0, 10))).toHaveLength(0);
    const kept = await deviceStore(colleague);
    expect(kept.queue).toHaveLength(1);
  });
});

/** Lays the device's store out as version 1 did (entries with no author), holding the given queue entries. */
async function seedVersion1Store(page: Page, entries: Array<Record<string, unknown>>) {
  await page.evaluate(async (queued) => {
    await new Promise<void>((resolve, reject) => {
      const removal = indexedDB.deleteDatabase("firmsand-field");
      removal.onsuccess = () => resolve();
      removal.onerror = () => reject(removal.error);
    });
    await new Promise<void>((resolve, reject) => {
      const open = indexedDB.open("firmsand-field", 1);
      open.onupgradeneeded = () => {
        const db = open.result;
        db.createObjectStore("projects", { keyPath: "projectId" });
        db.createObjectStore("queue", { keyPath: "id" }).createIndex("byProject", "projectId");
        db.createObjectStore("sent", { keyPath: "id" }).createIndex("byProject", "projectId");
        db.createObjectStore("sync", { keyPath: "projectId" });
      };
      open.onerror = () => reject(open.error);
      open.onsuccess = () => {
        const db = open.result;
        const transaction = db.transaction("queue", "readwrite");
        for (const entry of queued) transaction.objectStore("queue").put(entry);
        transaction.oncomplete = () => {
          db.close();
          resolve();
        };
        transaction.onerror = () => reject(transaction.error);
      };
    });
  }, entries);
}

test.describe("entries from before the update, and deleting what others need", () => {
  test.use({ serviceWorkers: "block" });

  test("entries kept before entries had an author are sent by nobody until the person signed in claims them; one claimed is stored once, one deleted never", async ({ page }) => {
    const claimed = marker("before-update-mine");
    const deleted = marker("before-update-other");
    const now = new Date();
    const reading = (note: string, order: number) => ({
      id: `${note}-id`, projectId, kind: "reading", order, capturedAt: now.toISOString(), form: { note }, photos: [], status: "waiting", attempts: 0,
      body: { station: "OF-1 return outfall", takenAt: now.toISOString(), value: 4.2, unit: "NTU", note },
      summary: `Reading · OF-1 return outfall · 4.2 NTU · ${note}`,
    });
    await signInWithPassword(page, DEMO_ACCOUNTS.manager, DEMO_PASSWORD);
    await expect(page).toHaveURL(/\/projects$/);
    await seedVersion1Store(page, [reading(claimed, 1), reading(deleted, 2)]);

    await page.goto(`/projects/${projectId}/field`);
    const held = page.getByRole("region", { name: "Entries from before the update: whose are these?" });
    await expect(held).toBeVisible();
    await expect(held.getByRole("listitem")).toHaveCount(2);
    await expect(page.getByRole("heading", { name: /^0 waiting to send/ })).toBeVisible();

    await held.getByRole("listitem").filter({ hasText: claimed }).getByRole("button", { name: /^Mine: send it under my name/ }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send; last sent \d\d:\d\d/ })).toBeVisible({ timeout: 20_000 });
    await expect(page.getByRole("region", { name: "Sent from this device" })).toContainText(claimed);
    await expect(held.getByRole("listitem")).toHaveCount(1);
    const today = now.toISOString().slice(0, 10);
    expect(await readingsWith(claimed, today)).toHaveLength(1);
    // The page sent what it had: the entry nobody claimed was not among it.
    expect(await readingsWith(deleted, today)).toHaveLength(0);

    const other = held.getByRole("listitem").filter({ hasText: deleted });
    await other.getByRole("button", { name: /^Delete/ }).click();
    await other.getByRole("group", { name: "Confirm delete" }).getByRole("button", { name: "Delete entry" }).click();
    await expect(held).toBeHidden();
    expect((await deviceStore(page)).queue).toHaveLength(0);
    expect(await readingsWith(deleted, today)).toHaveLength(0);
  });

  test("deleting a waiting find that a waiting handover needs names the handover and offers to delete both or keep them", async ({ page, context }) => {
    await openFieldPage(page);
    const description = marker("find-with-handover");
    const receiver = marker("Courier");
    await context.setOffline(true);
    await enterFind(page, description);
    await page.getByRole("button", { name: "Custody handover", exact: true }).click();
    const findSelect = page.getByLabel("Find", { exact: true });
    await findSelect.selectOption((await findSelect.locator("option", { hasText: description }).getAttribute("value"))!);
    await page.getByLabel("Purpose", { exact: true }).selectOption({ label: "To the state lab" });
    await page.getByLabel("Received by").fill(receiver);
    await page.getByLabel("Place it goes to").fill("State lab, Fennick");
    await page.getByLabel("Receiver's name, typed as their signature").fill(receiver);
    await page.getByRole("button", { name: "Save to the queue" }).click();
    await expect(page.getByRole("heading", { name: /^2 waiting to send/ })).toBeVisible();

    const queue = page.getByRole("list", { name: "Entries in the queue, in sending order" });
    const find = queue.getByRole("listitem").filter({ hasText: `Find · Modern debris · ${description}` });
    await find.getByRole("button", { name: /^Delete/ }).click();
    const confirm = find.getByRole("group", { name: "Confirm delete" });
    await expect(confirm).toContainText("A handover waiting in the queue is for this find: without the find it cannot be sent.");
    await expect(confirm.getByRole("listitem")).toHaveText([new RegExp(`Handover · new find "${description}.*${receiver}`)]);
    await expect(confirm.getByRole("button", { name: "Keep them" })).toBeFocused();
    await confirm.getByRole("button", { name: "Keep them" }).click();
    await expect(page.getByRole("heading", { name: /^2 waiting to send/ })).toBeVisible();

    await find.getByRole("button", { name: /^Delete/ }).click();
    await find.getByRole("button", { name: "Delete the find and its handover" }).click();
    await expect(page.getByRole("heading", { name: /^0 waiting to send/ })).toBeVisible();
    await context.setOffline(false);
    await expect(page.getByRole("status").filter({ hasText: "Online" })).toBeVisible();
    expect(await findsWith(description)).toHaveLength(0);
    expect((await deviceStore(page)).queue).toHaveLength(0);
  });
});

test.describe("sending in the background, with the service worker", () => {
  test.use({ timezoneId: "America/New_York", viewport: { width: 390, height: 844 } });

  test("an entry made offline is sent by the service worker once the page is closed (Background Sync), once", async ({ page, context, baseURL }) => {
    test.setTimeout(90_000);
    await openFieldPage(page);
    await waitUntilOfflineReady(page);
    const note = marker("background-reading");
    await context.setOffline(true);
    await enterReading(page, note, localValue(new Date(), "America/New_York"));
    await expect(page.getByRole("heading", { name: /^1 waiting to send/ })).toBeVisible();
    // The page asked the browser to send in the background when there is a connection.
    await expect.poll(() => page.evaluate(async () => {
      const registration = (await navigator.serviceWorker.ready) as ServiceWorkerRegistration & { sync: { getTags(): Promise<string[]> } };
      return registration.sync.getTags();
    })).toContain("firmsand-field-send");
    await page.close();
    await context.setOffline(false);

    // No page of the app is open: the browser's sync event reaches the worker (dispatched here through the DevTools protocol, as the browser does when the connection returns).
    const blank = await context.newPage();
    const cdp = await context.newCDPSession(blank);
    const registrations: Array<{ registrationId: string; scopeURL: string; isDeleted: boolean }> = [];
    cdp.on("ServiceWorker.workerRegistrationUpdated", (event) => registrations.push(...event.registrations));
    await cdp.send("ServiceWorker.enable");
    await expect.poll(() => registrations.find((registration) => registration.scopeURL === `${baseURL}/` && !registration.isDeleted)?.registrationId).toBeTruthy();
    const { registrationId } = registrations.find((registration) => registration.scopeURL === `${baseURL}/` && !registration.isDeleted)!;
    await cdp.send("ServiceWorker.dispatchSyncEvent", { origin: baseURL!, registrationId, tag: "firmsand-field-send", lastChance: false });

    const today = new Date().toISOString().slice(0, 10);
    await expect.poll(async () => (await readingsWith(note, today)).length, { timeout: 30_000 }).toBe(1);
    await cdp.detach();

    // Opened again, the page shows it sent and sends nothing more.
    const again = await context.newPage();
    await again.goto(`/projects/${projectId}/field`);
    await expect(again.getByRole("heading", { name: /^0 waiting to send; last sent/ })).toBeVisible();
    await expect(again.getByRole("region", { name: "Sent from this device" })).toContainText("Reading · OF-1 return outfall");
    expect(await readingsWith(note, today)).toHaveLength(1);
  });
});
