import Papa from "papaparse";
import { request as playwrightRequest } from "@playwright/test";
import { GRID, PEOPLE, SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { DEMO_FINDS } from "../../sample-data/finds";
import { startsLikeFormula } from "../../shared/csv-safe";
import { UNZONED_NAME } from "../../shared/volumes/rollup";
import { walkPublicText, type PublicWalkRules } from "../integration/progress-public-walk";
import { demoShoreline } from "./demo-shoreline";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, signInWithPassword, DEMO_PASSWORD, test } from "./fixtures";

// The manager's progress overview, the quantities CSV, and the public share link from creation
// to revocation, on the seeded demo (its five surveys imported through the import path).

const ZONE_NAMES = ZONES.map((zone) => zone.name);

/** What the public page may show, from the demo scenario itself (independent of the app's code). */
const RULES: PublicWalkRules = {
  // The map test's shoreline may be on the demo while this file runs beside it (a CI run saw it).
  allowedVertices: [...WORK_LIMIT.coordinates.flat(), ...ZONES.flatMap((zone) => zone.polygon.coordinates.flat()), ...demoShoreline().coordinates.flat()].map(([lon, lat]) => [lon, lat]),
  // The demo's finds: no description, tag, finder, receiver or authorising officer may reach the public page.
  forbiddenStrings: [
    ...PEOPLE.flatMap((person) => [person.name, person.email]), ...SURVEYS.map((survey) => survey.fileName),
    ...DEMO_FINDS.flatMap((find) => [find.description, find.fieldTag, find.finder, ...find.custody.flatMap((handover) => [handover.to, handover.place]), ...(find.hold ? [find.hold.liftedBy] : [])]),
  ],
  // practice: every sounding and cell of the demo lies within a few thousand feet of the grid origin
  projectedExtent: { minX: GRID.originEastingFt - 20_000, maxX: GRID.originEastingFt + 20_000, minY: GRID.originNorthingFt - 20_000, maxY: GRID.originNorthingFt + 20_000 },
};

let projectId = 0;

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

test("the manager sees the zone table and the charts, and can sort the table", async ({ page, signIn }) => {
  await signIn("manager");
  await page.goto(`/projects/${projectId}`);
  const table = page.getByTestId("zone-table");
  await expect(table).toBeVisible();
  for (const name of ZONE_NAMES) await expect(table.locator(`tr[data-zone="${name}"]`)).toBeVisible();
  // The demo's edge cells lie in no zone: their row is there, set apart from the drawn zones, and explained.
  const unzoned = table.locator(`tr[data-zone="${UNZONED_NAME}"]`);
  await expect(unzoned).toBeVisible();
  await expect(unzoned).toHaveAttribute("data-unzoned", "");
  await expect(unzoned.getByRole("rowheader")).toContainText("cells in no zone");
  await expect(page.getByText(/Unzoned: the cells inside the work limit that no zone holds/)).toBeVisible();
  await expect(table.locator('tr[data-zone="Project"]')).toContainText("yd³");
  await expect(page.getByTestId("cumulative-chart")).toBeVisible();
  await expect(page.getByTestId("production-chart")).toBeVisible();
  await expect(page.getByTestId("forecast")).toContainText("Lower run");
  // The demo logs dives on two November days and dewatering shifts on others: production rests on them where
  // an interval has them, and an interval resting on fewer than three working days is drawn apart (hatched) and explained.
  await expect(page.getByText(/Working days are the days on which dives or dewatering shifts were logged/).first()).toBeVisible();
  await expect(page.getByText(/Working days: days with a logged dive or dewatering shift/)).toBeVisible();
  // Each zone's forecast names the window, the rate range and the date range, counted from the latest survey.
  // Other tests change the demo's figures meanwhile (the map's test imports a survey and retracts it): the
  // page is read again after the API until the two agree.
  const quick = { timeout: 1_000 };
  let firstTry = true;
  await expect(async () => {
    if (!firstTry) await page.reload();
    firstTry = false;
    const forecastJson = await (await page.request.get(`/api/projects/${projectId}/progress`)).json();
    // The hatched bars are exactly the intervals resting on fewer than three working days, and are explained when there are any.
    const thin = (forecastJson.production as Array<{ thin: boolean; workingDays: number }>).filter((interval) => interval.thin);
    for (const interval of forecastJson.production as Array<{ thin: boolean; workingDays: number }>) expect(interval.thin).toBe(interval.workingDays < 3);
    await expect(page.getByTestId("production-chart").locator("g[data-thin]")).toHaveCount(thin.length, quick);
    if (thin.length > 0) await expect(page.getByText(/Hatched bars rest on fewer than 3 working days/)).toBeVisible(quick);
    const latestSurvey: string = forecastJson.series.dates.at(-1);
    for (const zone of forecastJson.zones) {
      const item = page.getByTestId("forecast").locator(`li[data-zone="${zone.name}"]`);
      await expect(item).toHaveAttribute("data-state", zone.forecast.state, quick);
      if (zone.forecast.state === "forecast") {
        expect(zone.forecast.finishDate > latestSurvey).toBe(true);
        await expect(item).toContainText(`finish about ${zone.forecast.finishDate}`, quick);
        await expect(item).toContainText(zone.forecast.latestFinishDate === null ? `not before ${zone.forecast.earliestFinishDate}` : `between ${zone.forecast.earliestFinishDate} and ${zone.forecast.latestFinishDate}`, quick);
        await expect(item).toContainText(`42-day window ${zone.forecast.windowFromDate} to ${latestSurvey}`, quick);
        await expect(item).toContainText(/rates [\d,.]+–[\d,.]+ yd³\/day/, quick);
      }
      if (zone.forecast.state === "no-recent-rate") await expect(item).toContainText(`no recent rate: no removal measured in this zone in the 42 days ${zone.forecast.windowFromDate} to ${latestSurvey}`, quick);
    }
  }).toPass({ timeout: 30_000 });
  await expect(page.getByTestId("cross-check")).toContainText("average end area");
  await expect(page.getByTestId("cross-check")).toContainText("%");
  // Sorting needs the page's script: click until the heading reports the order, then compare with the API's figures.
  const progress = await (await page.request.get(`/api/projects/${projectId}/progress`)).json();
  const byRemaining = [...progress.zones].sort((a: { remainingVolume: number }, b: { remainingVolume: number }) => b.remainingVolume - a.remainingVolume).map((zone: { name: string }) => zone.name);
  const heading = table.locator("th", { has: page.getByRole("button", { name: /^Remaining/ }) });
  await expect(async () => {
    await heading.getByRole("button").click();
    await expect(heading).toHaveAttribute("aria-sort", "descending", { timeout: 500 });
  }).toPass({ timeout: 10_000 });
  const order = await table.locator("tbody tr").evaluateAll((rows) => rows.map((row) => row.getAttribute("data-zone")));
  expect(order).toEqual(byRemaining);
});

test("the overview is readable before scripts run (server-rendered table and SVG charts)", async ({ browser, baseURL }) => {
  const context = await browser.newContext({ javaScriptEnabled: false, baseURL });
  const page = await context.newPage();
  await signInWithPassword(page, DEMO_ACCOUNTS.viewer, DEMO_PASSWORD);
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByTestId("zone-table").locator('tr[data-zone="Vent basin"]')).toBeVisible();
  expect(await page.locator('[data-testid="cumulative-chart"] path').count()).toBeGreaterThan(ZONE_NAMES.length);
  await context.close();
});

test("the quantities CSV has the right totals and no cell a spreadsheet could run", async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  await signInRequest(context, baseURL!, DEMO_ACCOUNTS.viewer);
  const response = await context.get(`/api/projects/${projectId}/quantities.csv`);
  expect(response.status()).toBe(200);
  expect(response.headers()["content-type"]).toContain("text/csv");
  const progress = await (await context.get(`/api/projects/${projectId}/progress`)).json();
  const rows = Papa.parse<string[]>((await response.text()).replace(/^\uFEFF/, ""), { skipEmptyLines: true }).data;
  expect(rows.find((row) => row[0] === "Units")![1]).toContain("yd³");
  expect(rows.find((row) => row[0] === "Method")![1]).toMatch(/Delaunay/);
  const header = rows.findIndex((row) => row[0] === "zone");
  const zoneRows = rows.slice(header + 1, header + 1 + ZONE_NAMES.length + 1);
  expect(zoneRows.map((row) => row[0])).toEqual([...ZONE_NAMES, UNZONED_NAME]); // the zones, then the cells in no zone
  const total = rows.find((row) => row[0] === "Project total")!;
  // computed: the CSV's project total is the progress API's, and the cells add up to it
  expect(Number(total[2])).toBeCloseTo(progress.total.removedVolume, 1);
  expect(Number(total[3])).toBeCloseTo(progress.total.remainingVolume, 1);
  const cells = rows.slice(rows.findIndex((row) => row[0] === "cell") + 1);
  expect(cells.length).toBe(progress.total.cells);
  expect(cells.reduce((sum, row) => sum + Number(row[6]), 0)).toBeCloseTo(progress.total.removedVolume, 0);
  // published: OWASP CSV injection — no text field begins with = + - @ tab or CR
  expect(rows.flat().filter((field) => startsLikeFormula(field) && !Number.isFinite(Number(field)))).toEqual([]);
  // The GeoJSON of the cells (RFC 7946): one closed ring per cell, in lon/lat near the site, same totals.
  const geojson = await (await context.get(`/api/projects/${projectId}/quantities.geojson`)).json();
  expect(geojson.type).toBe("FeatureCollection");
  expect(geojson.features.length).toBe(progress.total.cells);
  for (const feature of geojson.features) {
    const ring = feature.geometry.coordinates[0];
    expect(ring.length).toBe(5);
    expect(ring[0]).toEqual(ring[4]);
    expect(Math.abs(ring[0][0] - WORK_LIMIT.coordinates[0][0][0])).toBeLessThan(0.05);
    expect(Math.abs(ring[0][1] - WORK_LIMIT.coordinates[0][0][1])).toBeLessThan(0.05);
  }
  const geoRemoved = geojson.features.reduce((sum: number, feature: { properties: { removedVolume: number } }) => sum + feature.properties.removedVolume, 0);
  expect(geoRemoved).toBeCloseTo(progress.total.removedVolume, 6);
  await context.dispose();
});

test("outreach creates a link, a signed-out browser sees the zones, outreach revokes it, the link is 404", async ({ page, signIn, browser, baseURL }) => {
  await signIn("outreach");
  await page.goto(`/projects/${projectId}/share`);
  const name = `Agency page ${Date.now()}`;
  await page.getByLabel("Link name").first().fill(name);
  await page.getByLabel("Public text").first().fill("Crews are removing muck from the spring run down to firm sand.");
  await page.getByRole("button", { name: "Create link" }).click();
  const url = await page.getByTestId("share-url").textContent();
  expect(url).toMatch(/\/share\/[A-Za-z0-9_-]{43}$/);
  await expect(page.getByTestId("embed-snippet")).toContainText(`<iframe src="${url}"`);

  const visitor = await browser.newContext({ baseURL });
  const publicPage = await visitor.newPage();
  const response = await publicPage.goto(url!);
  expect(response!.status()).toBe(200);
  const headers = response!.headers();
  expect(headers["cache-control"]).toMatch(/^public, max-age=\d+/);
  expect(headers["content-security-policy"]).toContain("frame-ancestors *");
  expect(headers["x-frame-options"]).toBeUndefined();
  for (const zone of ZONE_NAMES) await expect(publicPage.locator(`[data-zone="${zone}"]`)).toBeAttached();
  await expect(publicPage.getByTestId("progress-map")).toBeVisible();
  await expect(publicPage.getByText("Crews are removing muck")).toBeVisible();
  await expect(publicPage.getByRole("list", { name: "Zones" })).toContainText("Vent basin");
  await expect(publicPage.getByRole("list", { name: "Zones" }).locator("li[data-unzoned]")).toContainText(UNZONED_NAME);
  // The whole public response: the HTML (with the data it embeds) and the data the page loads.
  expect(walkPublicText(await response!.text(), RULES, "html")).toEqual([]);
  const dataResponse = await visitor.request.get(`${new URL(url!).pathname}.data`);
  expect(walkPublicText(await dataResponse.text(), RULES, "data")).toEqual([]);
  // On a phone: nothing wider than the screen.
  const phone = await browser.newContext({ baseURL, viewport: { width: 360, height: 740 }, isMobile: true });
  const phonePage = await phone.newPage();
  await phonePage.goto(url!);
  await expect(phonePage.getByTestId("progress-map")).toBeVisible();
  expect(await phonePage.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
  await phone.close();
  // Framing is refused everywhere else.
  const login = await visitor.request.get("/login");
  expect(login.headers()["x-frame-options"]).toBe("DENY");
  await visitor.close();

  // Signed in, the layout names the visitor: that copy must stay out of shared caches.
  const signedIn = await page.request.get(new URL(url!).pathname);
  expect(signedIn.headers()["cache-control"]).toMatch(/^private, max-age=\d+/);

  const item = page.getByTestId("share-link").filter({ hasText: name });
  // Revoking asks first: declining keeps the link, accepting revokes it.
  page.once("dialog", (dialog) => dialog.dismiss());
  await item.getByRole("button", { name: `Revoke ${name}` }).click();
  await expect(item).toBeVisible();
  expect((await page.request.get(new URL(url!).pathname)).status()).toBe(200);
  page.once("dialog", (dialog) => { expect(dialog.message()).toContain("cannot be undone"); void dialog.accept(); });
  await item.getByRole("button", { name: `Revoke ${name}` }).click();
  await expect(page.getByText("Link revoked")).toBeVisible();
  const later = await browser.newContext({ baseURL });
  const gone = await later.request.get(new URL(url!).pathname);
  expect(gone.status()).toBe(404);
  expect(gone.headers()["cache-control"]).toBe("no-store");
  await later.close();
});

test("the share-links API: 201 {token,url}, DELETE 204, then 404; a viewer may not create one", async ({ baseURL }) => {
  const origin = new URL(baseURL!).origin;
  const outreach = await playwrightRequest.newContext({ baseURL });
  await signInRequest(outreach, baseURL!, DEMO_ACCOUNTS.outreach);
  const created = await outreach.post(`/api/projects/${projectId}/share-links`, { data: { name: "API link", publicText: "" }, headers: { Origin: origin } });
  expect(created.status()).toBe(201);
  const { token, url } = await created.json();
  expect(url).toBe(`${origin}/share/${token}`);
  const anonymous = await playwrightRequest.newContext({ baseURL });
  const open = await anonymous.get(`/share/${token}`);
  expect(open.status()).toBe(200);
  expect(walkPublicText(await open.text(), RULES, "html")).toEqual([]);
  const deleted = await outreach.delete(`/api/projects/${projectId}/share-links/${token}`, { headers: { Origin: origin } });
  expect(deleted.status()).toBe(204);
  expect((await anonymous.get(`/share/${token}`)).status()).toBe(404);
  const viewer = await playwrightRequest.newContext({ baseURL });
  await signInRequest(viewer, baseURL!, DEMO_ACCOUNTS.viewer);
  expect((await viewer.post(`/api/projects/${projectId}/share-links`, { data: { name: "x" }, headers: { Origin: origin } })).status()).toBe(403);
  for (const context of [outreach, anonymous, viewer]) await context.dispose();
});
