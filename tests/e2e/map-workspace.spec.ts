import { request as playwrightRequest, type Page } from "@playwright/test";
import { CELL_STATUSES } from "../../shared/cell-status";
import { cellCentreLonLat, labelIndex, type CellsData } from "../../app/components/map/cell-features";
import { clockOf } from "../../app/components/map/monitoring";
import { PROJECT as DEMO_PROJECT } from "../../sample-data/scenario";
import { demoProjectId, expect, test } from "./fixtures";

// The map as a workspace: the map fills the window beside a panel (a bottom sheet on a phone),
// frames the project while the cells load, labels each cell once, keeps its legend true to what
// is drawn, holds the view in its address, and can be worked from the keyboard alone.

let projectId: number;
test.describe.configure({ timeout: 90_000 });

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

type MapHandle = {
  firmsandMap: {
    getCenter(): { lng: number; lat: number };
    getZoom(): number;
    getBounds(): { getWest(): number; getEast(): number; getSouth(): number; getNorth(): number };
    isMoving(): boolean;
    jumpTo(options: object): void;
    queryRenderedFeatures(options: object): Array<{ properties: Record<string, unknown> }>;
    querySourceFeatures(source: string): unknown[];
    getSource(id: string): { getData(): Promise<{ features: unknown[] }> } | undefined;
  };
};

async function openMap(page: Page, search = ""): Promise<CellsData> {
  const cellsResponse = page.waitForResponse((response) => response.url().endsWith(`/api/projects/${projectId}/cells`));
  await page.goto(`/projects/${projectId}/map${search}`);
  const data = (await (await cellsResponse).json()) as CellsData;
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  return data;
}

async function settled(page: Page) {
  await expect.poll(() => page.evaluate(() => (window as unknown as MapHandle).firmsandMap.isMoving())).toBe(false);
  await page.waitForTimeout(300);
}

/** Cells with all eight neighbours inside the work limit and not confirmed (so assigning needs no reason). */
function openInterior(data: CellsData): string[] {
  const cols = data.grid!.cols;
  const confirmed = CELL_STATUSES.indexOf("confirmed");
  return [...labelIndex(data)]
    .filter(([, index]) => [0, -cols - 1, -cols, -cols + 1, -1, 1, cols - 1, cols, cols + 1].every((offset) => (data.status[index + offset] ?? -1) >= 0 && data.status[index + offset] !== confirmed))
    .map(([label]) => label);
}

test("on a large screen the map fills the window beside the panel, the page never scrolls, and the panel folds away (button and key)", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("dive-supervisor");
  await openMap(page);
  const map = page.getByTestId("coverage-map");
  const panel = page.getByTestId("map-panel");
  const before = (await map.boundingBox())!;
  expect(before.width, "the map is wider than the old 650 px column").toBeGreaterThan(900);
  expect(before.height).toBeGreaterThan(600);
  // The assign form is on screen beside the map, and the page itself does not scroll.
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeInViewport();
  expect(await page.evaluate(() => document.documentElement.scrollHeight <= window.innerHeight + 1)).toBe(true);
  const panelBox = (await panel.boundingBox())!;
  expect(panelBox.x).toBeGreaterThanOrEqual(before.x + before.width - 1);

  await page.getByRole("button", { name: "Hide panel" }).click();
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeHidden();
  await expect.poll(async () => (await map.boundingBox())!.width).toBeGreaterThan(before.width + 300);
  // P on the map brings it back.
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("p");
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Hide panel" })).toHaveAttribute("aria-expanded", "true");
});

test("on a phone the panel is a bottom sheet over the map: folded to its header, opened on demand", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const map = page.getByTestId("coverage-map");
  const mapBox = (await map.boundingBox())!;
  expect(mapBox.width).toBeGreaterThan(340);
  expect(mapBox.height).toBeGreaterThan(400);
  expect(await page.evaluate(() => document.documentElement.scrollHeight <= window.innerHeight + 1)).toBe(true);
  const sheet = page.getByTestId("map-panel");
  await expect(sheet).toHaveCSS("position", "fixed");
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeHidden();
  // The folded sheet still says what is selected.
  const label = openInterior(data)[0];
  await page.getByLabel("Search cell label").fill(label);
  await page.getByRole("button", { name: "Find" }).click();
  await expect(page.getByTestId("panel-summary")).toHaveText(`1 selected: ${label}`);
  await page.getByRole("button", { name: "Show panel" }).click();
  await expect(page.getByRole("region", { name: `Cell ${label}` })).toBeVisible();
  const sheetBox = (await sheet.boundingBox())!;
  expect(sheetBox.y, "the open sheet lies over the map").toBeLessThan(mapBox.y + mapBox.height - 100);
  expect(sheetBox.y + sheetBox.height).toBeLessThanOrEqual(844 + 1);
  await page.getByRole("button", { name: "Hide panel" }).click();
  await expect(page.getByRole("region", { name: `Cell ${label}` })).toBeHidden();
});

test("a column on a tile edge is labelled once per cell (AC was drawn split with every label doubled)", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("viewer");
  const data = await openMap(page);
  const labels = labelIndex(data);
  // Column AC of the demo straddles a tile edge; look at it, and at every part of the grid, closely.
  const places = [labels.get("AC4") ?? [...labels.values()][0], ...[...labels.values()].filter((_, index) => index % 40 === 0)];
  for (const index of places) {
    await page.evaluate(([lon, lat]) => (window as unknown as MapHandle).firmsandMap.jumpTo({ center: [lon, lat], zoom: 20 }), cellCentreLonLat(data, index));
    await settled(page);
    // Label points are made once the map is near enough to show them: they arrive just after the move.
    const labelsShown = () => page.evaluate(() => (window as unknown as MapHandle).firmsandMap.queryRenderedFeatures({ layers: ["cell-labels"] }).map((feature) => String(feature.properties.label)));
    await expect.poll(async () => (await labelsShown()).length).toBeGreaterThan(0);
    await settled(page);
    const shown = await labelsShown();
    const doubled = shown.filter((label, position) => shown.indexOf(label) !== position);
    expect(doubled, `labels drawn twice near grid index ${index}`).toEqual([]);
  }
});

test("while the cells load the map already frames the project and says it is loading", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("viewer");
  let release = () => undefined as void;
  const held = new Promise<void>((resolve) => (release = resolve));
  await page.route(`**/api/projects/${projectId}/cells`, async (route) => {
    await held;
    await route.continue();
  });
  await page.goto(`/projects/${projectId}/map`);
  await expect(page.getByTestId("cells-loading")).toContainText("Loading cells…");
  await expect(page.getByRole("figure", { name: "Legend" })).toContainText("Loading cells…");
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-map-ready", "yes", { timeout: 20_000 });
  const style = await (await page.request.get(`/projects/${projectId}/map/style.json`)).json();
  const flat = (style.sources["work-limit"].data.geometry.coordinates as unknown[]).flat(Infinity) as number[];
  const lons = flat.filter((_, index) => index % 2 === 0), lats = flat.filter((_, index) => index % 2 === 1);
  expect(flat.length).toBeGreaterThan(0);
  const bounds = await page.evaluate(() => {
    const view = (window as unknown as MapHandle).firmsandMap.getBounds();
    return { west: view.getWest(), east: view.getEast(), south: view.getSouth(), north: view.getNorth(), zoom: (window as unknown as MapHandle).firmsandMap.getZoom() };
  });
  // The whole work limit is in view, and the view is the project's, not the world's.
  expect(bounds.west).toBeLessThanOrEqual(Math.min(...lons));
  expect(bounds.east).toBeGreaterThanOrEqual(Math.max(...lons));
  expect(bounds.south).toBeLessThanOrEqual(Math.min(...lats));
  expect(bounds.north).toBeGreaterThanOrEqual(Math.max(...lats));
  expect(bounds.zoom).toBeGreaterThan(14);
  await expect(page.locator(".maplibregl-ctrl-scale")).not.toContainText("mi");
  release();
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  await expect(page.getByTestId("cells-loading")).toHaveCount(0);
});

test("the legend describes what is drawn: the bands with their unit and classes, the cell view, planned cells", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const legend = page.getByRole("figure", { name: "Legend" });
  await expect(legend.getByRole("region", { name: "Cell status" })).toContainText("At firm sand");

  // Planned cells for a date have their own entry, counted, and are drawn.
  const date = "2030-07-22";
  const cells = openInterior(data).slice(3, 5);
  const assigned = await page.request.post(`/api/projects/${projectId}/assignments`, {
    data: { date, team: "Team Gar", cells, hose: "Hose C", notes: "" }, headers: { Origin: new URL(page.url()).origin },
  });
  expect([201, 409]).toContain(assigned.status());
  await page.getByLabel("Plan date shown").fill(date);
  const marks = legend.getByRole("region", { name: "Marked cells" });
  await expect(marks).toContainText(`Planned on ${date} (2)`);
  await expect(marks).toContainText("Selected (0)");
  await expect.poll(() => page.evaluate(async () => (await (window as unknown as MapHandle).firmsandMap.getSource("cells-assigned")!.getData()).features.length)).toBe(2);
  await expect.poll(() => page.evaluate(() => (window as unknown as MapHandle).firmsandMap.queryRenderedFeatures({ layers: ["cells-assigned-fill"] }).length)).toBeGreaterThan(0);
  // Held cells get their entry whenever a hold is in force: tests/e2e/finds.spec.ts puts one on and reads it here.

  // Bands on: the legend names them, their unit and their classes, beside the cells they cover.
  await page.getByLabel("Bands", { exact: true }).check();
  const bands = legend.getByRole("region", { name: "Remaining thickness bands" });
  await expect(bands).toContainText(`in ${data.labels.length}`);
  await expect.poll(async () => bands.getByRole("listitem").count()).toBeGreaterThan(1);
  await expect(bands.getByRole("listitem").first()).toContainText(new RegExp(`\\d ${data.labels.length}`));
  await page.getByLabel("Band surface").selectOption("depth");
  // Contouring the depth surface takes a few seconds on a busy machine; until then the legend says so.
  await expect(legend.getByRole("region", { name: /bands$/ })).toContainText(/Reading the bottom depth bands…|Depth of the latest bottom/);
  await expect(legend.getByRole("region", { name: "Bottom depth bands" })).toContainText("Depth of the latest bottom", { timeout: 30_000 });
  // Cells off: only the bands are described.
  await page.getByLabel("Cells", { exact: true }).uncheck();
  await expect(legend.getByRole("region", { name: "Cell status" })).toHaveCount(0);
  await expect(legend.getByRole("region", { name: "Marked cells" })).toHaveCount(0);
  await page.getByLabel("Bands", { exact: true }).uncheck();
  // The demo's monitoring stations are drawn by kind, and the sightings of the last 24 hours: the
  // seeder places two, with positions, in the hours before it ran (other tests add some without).
  await expect(legend.getByRole("region", { name: "Monitoring stations" })).toContainText("Background (1)");
  await expect(legend.getByRole("region", { name: "Monitoring stations" })).toContainText("Compliance point (1)");
  await expect(legend.getByRole("region", { name: "Wildlife sightings, last 24 h" })).toContainText(/Sighting \(\d+\)/);
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-monitoring-drawn", "5");
  // W on the map steps to a station and the panel reads it out.
  await page.getByLabel(/^Cell map/).focus();
  await page.keyboard.press("w");
  await expect(page.getByTestId("map-announcement")).toContainText("station BG-1 up-run, 1 of 5");
  await expect(page.getByTestId("monitoring-detail")).toContainText("Background");
  await page.getByRole("button", { name: /CP-1 plume/ }).click();
  await expect(page.getByTestId("monitoring-detail")).toContainText("Compliance point");
  // Its latest reading's time, written by the server in the project's zone, is that instant's local clock.
  const taken = page.getByTestId("monitoring-detail").locator("time");
  await expect(async () => {
    const takenAt = await taken.getAttribute("datetime");
    expect(takenAt).not.toBeNull();
    expect(await taken.textContent()).toBe(clockOf(takenAt!, DEMO_PROJECT.timeZone));
  }).toPass({ timeout: 10_000 });
  await page.getByRole("checkbox", { name: "Stations and sightings" }).uncheck();
  await expect(legend.getByRole("region", { name: "Monitoring stations" })).toHaveCount(0);
  // Only the demo's zones (their colours) and its geotextile tubes on the laydown area are left: described alone.
  await expect(legend.getByRole("region")).toHaveCount(2);
  await expect(legend.getByRole("region", { name: "Zones" })).toBeVisible();
  await expect(legend.getByRole("region", { name: "Geotextile tubes" })).toContainText("Near capacity, at 90 % or more (1)");
  // Their layer switch hides them on the map and in the legend, the address remembers it, and it shows them again.
  const tubesVisibility = () => page.evaluate(() => (window as unknown as { firmsandMap: { getLayoutProperty(layer: string, name: string): unknown } }).firmsandMap.getLayoutProperty("tubes", "visibility"));
  await expect.poll(tubesVisibility).toBe("visible");
  await page.getByRole("checkbox", { name: "Geotextile tubes" }).uncheck();
  await expect.poll(tubesVisibility).toBe("none");
  await expect(legend.getByRole("region", { name: "Geotextile tubes" })).toHaveCount(0);
  await expect.poll(() => new URL(page.url()).searchParams.get("layers")).toBe("-cells,-bands,zones,workLimit,shoreline,labels,-monitoring,-tubes");
  await page.getByRole("checkbox", { name: "Geotextile tubes" }).check();
  await expect.poll(tubesVisibility).toBe("visible");
  await expect(legend.getByRole("region", { name: "Geotextile tubes" })).toBeVisible();
  await expect.poll(() => new URL(page.url()).searchParams.get("layers")).toBe("-cells,-bands,zones,workLimit,shoreline,labels,-monitoring,tubes");
  // A link made before the tubes switch lists only the layers shown, never "tubes": it opens with the tubes shown.
  // (Its layers of that time keep its choice: labels off; the stations layer, newer still, shows too.)
  await openMap(page, "?layers=cells,zones,workLimit,shoreline");
  await expect.poll(tubesVisibility).toBe("visible");
  await expect(page.getByRole("checkbox", { name: "Geotextile tubes" })).toBeChecked();
  await expect(page.getByRole("checkbox", { name: "Stations and sightings" })).toBeChecked();
  await expect(page.getByLabel("Labels", { exact: true })).not.toBeChecked();
});

test("the address holds the view: a link sent from it opens the same centre, zoom, view, layers, zone and cells", async ({ page, signIn, browser, baseURL }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const chosen = openInterior(data).slice(0, 2);
  await page.getByLabel("Search cell label").fill(chosen[0]);
  await page.getByRole("button", { name: "Find" }).click();
  await settled(page);
  const index = labelIndex(data).get(chosen[1])!;
  // Shift-click the second cell.
  const point = await page.evaluate(([lon, lat]) => (window as unknown as { firmsandMap: { project(l: [number, number]): { x: number; y: number } } }).firmsandMap.project([lon, lat]), cellCentreLonLat(data, index));
  const box = (await page.getByTestId("coverage-map").boundingBox())!;
  await page.keyboard.down("Shift");
  await page.mouse.click(box.x + point.x, box.y + point.y);
  await page.keyboard.up("Shift");
  await page.getByLabel("View", { exact: true }).selectOption("thickness");
  const zone = data.zones[1] ?? data.zones[0];
  await page.getByLabel("Zone filter").selectOption(String(zone.id));
  await page.getByLabel("Labels", { exact: true }).uncheck();
  await settled(page);
  // No reload: the page's document stays, only the address changes.
  await page.evaluate(() => ((window as unknown as { stayed: number }).stayed = 1));
  await expect.poll(() => new URL(page.url()).searchParams.get("cells")).toBe([...chosen].sort().join(","));
  const sent = new URL(page.url());
  expect(sent.searchParams.get("view")).toBe("thickness");
  expect(sent.searchParams.get("zone")).toBe(String(zone.id));
  expect(sent.searchParams.get("layers")).toBe("cells,-bands,zones,workLimit,shoreline,-labels,monitoring,tubes");
  expect(sent.searchParams.get("c")).toMatch(/^-?\d+\.\d{6},-?\d+\.\d{6}$/);
  expect(await page.evaluate(() => (window as unknown as { stayed?: number }).stayed)).toBe(1);
  const camera = await page.evaluate(() => ({ centre: (window as unknown as MapHandle).firmsandMap.getCenter(), zoom: (window as unknown as MapHandle).firmsandMap.getZoom() }));

  // Another person opens the link.
  const context = await browser.newContext({ baseURL, viewport: { width: 1440, height: 900 } });
  const other = await context.newPage();
  await other.goto("/login");
  await other.getByLabel("E-mail").fill("manager@example.org");
  await other.getByLabel("Password").fill("firmsand-demo");
  await other.getByRole("button", { name: "Sign in" }).click();
  await expect(other).toHaveURL(/\/projects$/);
  await other.goto(`${sent.pathname}${sent.search}`);
  await expect(other.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  await expect(other.getByTestId("selected-cells")).toHaveText([...chosen].sort().join(", "));
  await expect(other.getByLabel("View", { exact: true })).toHaveValue("thickness");
  await expect(other.getByLabel("Zone filter")).toHaveValue(String(zone.id));
  await expect(other.getByLabel("Labels", { exact: true })).not.toBeChecked();
  await expect(other.getByRole("region", { name: `Cell ${[...chosen].sort()[1]}` })).toBeVisible();
  const opened = await other.evaluate(() => ({ centre: (window as unknown as MapHandle).firmsandMap.getCenter(), zoom: (window as unknown as MapHandle).firmsandMap.getZoom() }));
  expect(Math.abs(opened.zoom - camera.zoom)).toBeLessThan(0.01);
  expect(Math.abs(opened.centre.lng - camera.centre.lng)).toBeLessThan(1e-5);
  expect(Math.abs(opened.centre.lat - camera.centre.lat)).toBeLessThan(1e-5);
  await context.close();
});

test("the address keeps the view after a form on the map page is sent", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("manager");
  await openMap(page);
  await page.getByLabel("View", { exact: true }).selectOption("thickness");
  await settled(page);
  await expect.poll(() => new URL(page.url()).searchParams.get("view")).toBe("thickness");
  const before = new URL(page.url()).search;
  // A shoreline file that is not a polygon: refused, so the shared demo keeps its shoreline.
  await page.getByRole("form", { name: "Upload shoreline" }).locator('input[type="file"]').setInputFiles({ name: "not-a-shoreline.geojson", mimeType: "application/geo+json", buffer: Buffer.from('{"type":"Point","coordinates":[0,0]}') });
  await page.getByRole("form", { name: "Upload shoreline" }).locator('button[type="submit"]').click();
  await expect(page.getByTestId("shoreline-result")).toBeVisible();
  await expect.poll(() => new URL(page.url()).search).toBe(before);
});

test("the supervisor selects, inspects, assigns and clears cells with the keyboard alone", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const cols = data.grid!.cols;
  const labelOf = new Map([...labelIndex(data)].map(([label, index]) => [index, label]));
  const start = openInterior(data).find((label) => openInterior(data).includes(labelOf.get(labelIndex(data).get(label)! + 1)!))!;
  const next = labelOf.get(labelIndex(data).get(start)! + 1)!;
  expect(cols).toBeGreaterThan(2);
  // The keys are documented in the panel.
  await page.getByText("Keys", { exact: true }).click();
  await expect(page.getByTestId("map-keys")).toContainText("Assign the selected cells");

  // F finds a cell by label; Tab leads from the search to the map.
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("f");
  await expect(page.getByLabel("Search cell label")).toBeFocused();
  await page.keyboard.type(start);
  await page.keyboard.press("Enter");
  await expect(page.getByTestId("selected-cells")).toHaveText(start);
  await page.keyboard.press("Tab");
  await page.keyboard.press("Tab");
  await expect(page.getByLabel("Cell map: arrow keys move the selected cell")).toBeFocused();
  // Shift + → adds the next cell; Enter inspects it.
  await page.keyboard.press("Shift+ArrowRight");
  await expect(page.getByTestId("selected-cells")).toHaveText([start, next].sort().join(", "));
  await expect(page.getByTestId("map-announcement")).toContainText(`Cell ${next}`);
  await page.keyboard.press("Enter");
  await expect(page.getByLabel("Cell inspector")).toBeFocused();
  await expect(page.getByRole("region", { name: `Cell ${next}` })).toBeVisible();

  // Back to the map; A goes to the assign form; the date is typed and Enter assigns.
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("a");
  await expect(page.getByLabel("Work date")).toBeFocused();
  await page.keyboard.type("07212030");
  await expect(page.getByLabel("Work date")).toHaveValue("2030-07-21");
  await page.keyboard.press("Enter");
  await expect(page.getByRole("status").filter({ hasText: "Assigned 2 cell(s)" })).toBeVisible();

  // Escape on the map clears the selection; P hides the panel and shows it again.
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("Escape");
  await expect(page.getByTestId("selected-cells")).toContainText("Select cells");
  await page.keyboard.press("p");
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeHidden();
  await page.keyboard.press("p");
  await expect(page.getByRole("form", { name: "Assign cells" })).toBeVisible();
  // + zooms in.
  const zoom = await page.evaluate(() => (window as unknown as MapHandle).firmsandMap.getZoom());
  await page.keyboard.press("+");
  await expect.poll(() => page.evaluate(() => (window as unknown as MapHandle).firmsandMap.getZoom())).toBeGreaterThan(zoom + 0.5);
});
