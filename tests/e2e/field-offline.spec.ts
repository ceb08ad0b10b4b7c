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
async function readingsWith(note: string, day: string) {
  const body = (await (await api.get(`/api/projects/${projectId}/water-quality/readings?from=${day}&to=${day}`)).json()) as { readings: Array<{ id: number; note: string; takenAt: string }> };
  return body.readings.filter((reading) => reading.note === note);
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
    const day = takenAt.toISOString().slice(0, 10);
    const readings = [...(await readingsWith(readingNote, day)), ...(await readingsWith(readingNote, new Date().toISOString().slice(0, 10)))];
    const unique = new Map(readings.map((reading) => [reading.id, reading]));
    expect(unique.size).toBe(1);
    expect(Date.parse([...unique.values()][0].takenAt)).toBe(takenAt.getTime());
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

