import { request as playwrightRequest, type Page } from "@playwright/test";
import { CELL_STATUSES } from "../../shared/cell-status";
import { STATUS_COLOURS, hexToRgb } from "../../shared/palette";
import { cellCentreLonLat, labelIndex, type CellsData } from "../../app/components/map/cell-features";
import { fromGridFrame } from "../../shared/grid/cell-grid";
import { createCrs } from "../../shared/crs";
import { demoShoreline } from "./demo-shoreline";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test, waitForMail } from "./fixtures";

let projectId: number;

// Software WebGL in headless Chromium draws slowly on a cold server; these are not speed checks.
test.describe.configure({ timeout: 90_000 });

async function mapSettled(page: Page) {
  await expect.poll(() => page.evaluate(() => (window as unknown as { firmsandMap: { isMoving(): boolean; loaded(): boolean } }).firmsandMap.isMoving() === false)).toBe(true);
  await page.waitForTimeout(300);
}

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

async function openMap(page: Page): Promise<CellsData> {
  const cellsResponse = page.waitForResponse((response) => response.url().endsWith(`/api/projects/${projectId}/cells`));
  await page.goto(`/projects/${projectId}/map`);
  const data = (await (await cellsResponse).json()) as CellsData;
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  // The canvas fills the map box and is what the pointer meets (MapLibre's own stylesheet once
  // collapsed the container to no height, so the map took no clicks while its buffer still drew).
  const box = (await page.getByTestId("coverage-map").boundingBox())!;
  expect(box.height).toBeGreaterThan(400);
  const hit = await page.evaluate(([x, y]) => document.elementFromPoint(x, y)?.tagName, [box.x + box.width / 2, box.y + box.height / 2]);
  expect(hit).toBe("CANVAS");
  return data;
}

/** The canvas pixel at a cell's centre, read back through the preserved drawing buffer. */
async function pixelAt(page: Page, lonLat: [number, number]): Promise<[number, number, number]> {
  return page.evaluate(([lon, lat]) => {
    const map = (window as unknown as { firmsandMap: { project(lngLat: [number, number]): { x: number; y: number }; getCanvas(): HTMLCanvasElement } }).firmsandMap;
    const point = map.project([lon, lat]);
    const canvas = map.getCanvas();
    const copy = document.createElement("canvas");
    copy.width = canvas.width;
    copy.height = canvas.height;
    const context = copy.getContext("2d")!;
    context.drawImage(canvas, 0, 0);
    const ratio = canvas.width / canvas.clientWidth;
    const data = context.getImageData(Math.round(point.x * ratio), Math.round(point.y * ratio), 1, 1).data;
    return [data[0], data[1], data[2]] as [number, number, number];
  }, lonLat);
}

test("the map draws the demo's cells in their status colours, with labels, from the app alone", async ({ page, signIn }) => {
  await signIn("viewer");
  const data = await openMap(page);
  await expect(page.getByRole("figure", { name: "Legend" })).toContainText("At firm sand");
  // Zone labels are placed with the shipped font and no glyphs URL (the offline guard fails any outside request).
  await expect.poll(() => page.evaluate(() => (window as unknown as { firmsandMap: { queryRenderedFeatures(o: object): unknown[] } }).firmsandMap.queryRenderedFeatures({ layers: ["zone-labels"] }).length)).toBeGreaterThan(0);
  // Hide labels and outlines so cell centres show the bare fill colour.
  for (const name of ["Labels", "Zones", "Work limit"]) await page.getByRole("checkbox", { name, exact: true }).uncheck(); // (the legend has a Zones section too)
  await mapSettled(page);
  const checked: string[] = [];
  for (const [code, status] of CELL_STATUSES.entries()) {
    const index = data.status.findIndex((value, cell) => value === code && neighboursShare(data, cell, code));
    if (index < 0) continue;
    const [red, green, blue] = await pixelAt(page, cellCentreLonLat(data, index));
    const [expectedRed, expectedGreen, expectedBlue] = hexToRgb(STATUS_COLOURS[status]);
    const off = Math.max(Math.abs(red - expectedRed), Math.abs(green - expectedGreen), Math.abs(blue - expectedBlue));
    expect(off, `${status} cell at grid index ${index}: got rgb(${red}, ${green}, ${blue}), palette ${STATUS_COLOURS[status]}`).toBeLessThanOrEqual(6);
    checked.push(status);
  }
  expect(checked.length).toBeGreaterThan(0);
});

/**
 * Hands the page's map to each function in `window.mapWatchers` the moment the page hands it out
 * (right after it is made, before any of its events): tests push their watchers in an init script
 * of their own, added after this one.
 */
async function watchMapFromItsStart(page: Page) {
  await page.addInitScript(() => {
    const record = window as unknown as { mapWatchers: Array<(map: unknown) => void> };
    record.mapWatchers = [];
    let map: unknown;
    Object.defineProperty(window, "firmsandMap", {
      configurable: true,
      get: () => map,
      set: (value: unknown) => {
        map = value;
        for (const watch of record.mapWatchers) watch(value);
      },
    });
  });
}

test("cells that come after the map's style are still drawn in its first complete frame, handed to the map's worker once", async ({ page, signIn }) => {
  await signIn("viewer");
  // The map's cells source: each time its data reaches the map's worker, a "metadata" event.
  await watchMapFromItsStart(page);
  await page.addInitScript(() => {
    type Listener = (event: { sourceId?: string; sourceDataType?: string }) => void;
    const record = window as unknown as { cellsHandedOver: number; mapWatchers: Array<(map: { on(type: string, listener: Listener): void }) => void> };
    record.cellsHandedOver = 0;
    record.mapWatchers.push((map) =>
      map.on("sourcedata", (event) => {
        if (event.sourceId === "cells" && event.sourceDataType === "metadata") record.cellsHandedOver += 1;
      }),
    );
  });
  // The cells' read answers 0.6 s late: MapLibre, the style and the fonts are in long before.
  await page.route(`**/api/projects/${projectId}/cells`, async (route) => {
    await new Promise((done) => setTimeout(done, 600));
    await route.continue();
  });
  await page.goto(`/projects/${projectId}/map`);
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  const rendered = await page.evaluate(() => (window as unknown as { firmsandMap: { queryRenderedFeatures(o: object): unknown[] } }).firmsandMap.queryRenderedFeatures({ layers: ["cells-fill"] }).length);
  expect(rendered).toBeGreaterThan(0);
  await mapSettled(page);
  // Made with the cells in its style: once. A map made without them gets them by a second hand-over.
  expect(await page.evaluate(() => (window as unknown as { cellsHandedOver: number }).cellsHandedOver)).toBe(1);
});

test("a first visit reads the style and cells while the page hydrates, and the map draws nothing until its first complete frame", async ({ page, signIn }) => {
  await signIn("viewer");
  // An inner cell's centre: the complete frame covers it (the land under the cells is the page's
  // background, not drawn by the map, so a pixel of land stays empty).
  const data = (await (await page.request.get(`/api/projects/${projectId}/cells`)).json()) as CellsData;
  const inner = data.status.findIndex((_, index) => interior(data, index));
  expect(inner).toBeGreaterThanOrEqual(0);
  // At each of MapLibre's frames before the load, and at the load's own, that pixel of the map's
  // canvas (its drawing buffer is kept): a held frame leaves it as it was, empty.
  await watchMapFromItsStart(page);
  await page.addInitScript((lonLat: [number, number]) => {
    type WatchedMap = { on(type: string, listener: () => void): void; getCanvas(): HTMLCanvasElement; project(lngLat: [number, number]): { x: number; y: number } };
    const record = window as unknown as { framePixels: Array<{ loaded: boolean; alpha: number }>; mapWatchers: Array<(map: WatchedMap) => void> };
    record.framePixels = [];
    record.mapWatchers.push((map) => {
      let loaded = false;
      const canvas = map.getCanvas();
      const gl = (canvas.getContext("webgl2") ?? canvas.getContext("webgl")) as WebGLRenderingContext;
      const sample = () => {
        const pixel = new Uint8Array(4);
        const point = map.project(lonLat);
        const ratio = canvas.width / canvas.clientWidth;
        // WebGL counts rows from the bottom.
        gl.readPixels(Math.round(point.x * ratio), canvas.height - 1 - Math.round(point.y * ratio), 1, 1, gl.RGBA, gl.UNSIGNED_BYTE, pixel);
        record.framePixels.push({ loaded, alpha: pixel[3] });
      };
      map.on("render", () => { if (!loaded) sample(); });
      map.on("load", () => { loaded = true; sample(); });
    });
  }, cellCentreLonLat(data, inner));
  const reads: string[] = [];
  page.on("request", (request) => {
    const path = new URL(request.url()).pathname;
    if (path === `/projects/${projectId}/map/style.json` || path === `/api/projects/${projectId}/cells`) reads.push(path);
  });
  await page.goto(`/projects/${projectId}/map`);
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
  await mapSettled(page);
  // Each read once, both started before the map's code ran (it runs once the page is hydrated).
  expect(reads.sort()).toEqual([`/api/projects/${projectId}/cells`, `/projects/${projectId}/map/style.json`]);
  const started = await page.evaluate((id) => {
    const at = (name: string) => performance.getEntriesByName(name)[0]?.startTime ?? Number.NaN;
    return { style: at(`${location.origin}/projects/${id}/map/style.json`), cells: at(`${location.origin}/api/projects/${id}/cells`), effect: at("map: effect started") };
  }, projectId);
  expect(started.style).toBeLessThan(started.effect);
  expect(started.cells).toBeLessThan(started.effect);
  // Partial frames came (the sources arrive one by one) and none was drawn; the complete one was.
  const pixels = await page.evaluate(() => (window as unknown as { framePixels: Array<{ loaded: boolean; alpha: number }> }).framePixels);
  const before = pixels.filter((pixel) => !pixel.loaded);
  expect(before.length).toBeGreaterThan(1);
  // The frame the load fires in is the complete one: every frame before it is left empty.
  expect(before.slice(0, -1).map((pixel) => pixel.alpha)).toEqual(before.slice(0, -1).map(() => 0));
  expect(pixels.find((pixel) => pixel.loaded)?.alpha).toBe(255);
});

test("each zone is outlined and named in its own colour, and the legend lists the zones with their colours", async ({ page, signIn, baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  await signInRequest(context, baseURL!, DEMO_ACCOUNTS.manager);
  const { settings } = (await (await context.get(`/api/projects/${projectId}`)).json()) as { settings: { zones: Array<{ name: string; colour: string }> } };
  await context.dispose();
  expect(settings.zones.length).toBeGreaterThan(1);
  // The demo's zones got the palette's first colours, one each, in their order (shared/zone-colours.ts).
  expect(new Set(settings.zones.map((zone) => zone.colour)).size).toBe(settings.zones.length);
  await signIn("viewer");
  for (const viewport of [{ width: 1440, height: 900 }, { width: 390, height: 844 }]) {
    await page.setViewportSize(viewport);
    await openMap(page);
    await mapSettled(page);
    const drawn = await page.evaluate(() => (window as unknown as { firmsandMap: { queryRenderedFeatures(o: object): Array<{ properties: { name: string; colour: string } }> } })
      .firmsandMap.queryRenderedFeatures({ layers: ["zones-outline"] }).map((feature) => [feature.properties.name, feature.properties.colour]));
    for (const zone of settings.zones) expect(drawn, zone.name).toContainEqual([zone.name, zone.colour]);
    const legend = page.getByRole("figure", { name: "Legend" });
    if (viewport.width < 1024) await legend.getByText("Legend", { exact: true }).click(); // folded on a narrow screen
    const zones = legend.getByRole("region", { name: "Zones" });
    for (const zone of settings.zones) await expect(zones.getByRole("listitem").filter({ hasText: zone.name })).toHaveCount(1);
    const swatches = await zones.locator("li > span").evaluateAll((spans) => spans.map((span) => getComputedStyle(span).borderTopColor));
    expect(swatches).toEqual(settings.zones.map((zone) => `rgb(${hexToRgb(zone.colour).join(", ")})`));
    await zones.scrollIntoViewIfNeeded();
    await page.screenshot({ path: test.info().outputPath(`map-zone-colours-${viewport.width}.png`) });
  }
});

/** Page coordinates of a lon/lat on the map. */
async function screenPoint(page: Page, lonLat: [number, number]): Promise<{ x: number; y: number }> {
  const point = await page.evaluate(([lon, lat]) => (window as unknown as { firmsandMap: { project(l: [number, number]): { x: number; y: number } } }).firmsandMap.project([lon, lat]), lonLat);
  const box = (await page.getByTestId("coverage-map").boundingBox())!;
  return { x: box.x + point.x, y: box.y + point.y };
}

/** A cell whose eight neighbours are all inside the work limit (so it is drawn as a whole square). */
function interior(data: CellsData, index: number): boolean {
  const cols = data.grid!.cols;
  return [-cols - 1, -cols, -cols + 1, -1, 1, cols - 1, cols, cols + 1].every((offset) => (data.status[index + offset] ?? -1) >= 0);
}

/** A cell whose four neighbours share its status, so the centre pixel is well inside one colour. */
function neighboursShare(data: CellsData, index: number, code: number): boolean {
  const cols = data.grid!.cols;
  return [index - 1, index + 1, index - cols, index + cols].every((neighbour) => data.status[neighbour] === code);
}

test("the supervisor selects cells, assigns them, opens and prints the plan, and the team gets it by e-mail", async ({ page, signIn, baseURL }) => {
  // An uncaught error (a failed hydration, a map torn down badly on leaving the page) fails the test.
  const pageErrors: string[] = [];
  page.on("pageerror", (error) => pageErrors.push(error.message));
  page.on("console", (message) => message.type() === "error" && console.log(`browser console: ${message.text()}`));
  // MapLibre's word when a tile asks for an image of the style (the planned hatch) that is not there yet.
  const missingImages: string[] = [];
  page.on("console", (message) => /could not be loaded/.test(message.text()) && missingImages.push(message.text()));
  await signIn("dive-supervisor");
  const data = await openMap(page);
  // Cells away from the work limit: cells along it are drawn clipped, so their centre may lie outside what is drawn.
  const labels = [...labelIndex(data)].filter(([, index]) => interior(data, index)).map(([label]) => label);
  const date = "2030-05-14";
  await page.getByLabel("Search cell label").fill(labels[5]);
  await page.getByRole("button", { name: "Find" }).click();
  await expect(page.getByRole("region", { name: `Cell ${labels[5]}` })).toBeVisible();
  // Arrow keys move the selection to the next cell.
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("ArrowRight");
  await expect(page.getByTestId("selected-cells")).not.toHaveText(labels[5]);
  await mapSettled(page);
  // Shift-click adds the first cell back to the selection.
  const screen = await screenPoint(page, cellCentreLonLat(data, labelIndex(data).get(labels[5])!));
  await page.keyboard.down("Shift");
  await page.mouse.click(screen.x, screen.y);
  await page.keyboard.up("Shift");
  await expect(page.getByTestId("selected-cells")).toContainText(labels[5]);
  const chosen = (await page.getByTestId("selected-cells").innerText()).split(", ");
  expect(chosen.length).toBe(2);

  await page.getByLabel("Work date").fill(date);
  await page.getByLabel("Dive team").selectOption({ label: "Team Limpkin (3 people)" });
  await page.getByLabel("Notes").fill("Work the vent edge first");
  if (await page.getByLabel(/Reason for working confirmed cells/).isVisible()) await page.getByLabel(/Reason for working confirmed cells/).fill("divers report new muck");
  await page.getByRole("button", { name: "Assign" }).click();
  await expect(page.getByRole("status")).toContainText("Assigned 2 cell(s) to Team Limpkin");
  await expect(page.getByRole("note").first()).toContainText("verify against the current US Navy Diving Manual");
  // The planned cells' tiles got their hatch with their first request.
  await mapSettled(page);
  expect(missingImages, "images the map asked for before they were there").toEqual([]);

  const planLink = page.getByRole("link", { name: `Open the day plan for ${date}` });
  await expect(planLink).toHaveAttribute("href", `/projects/${projectId}/plans/${date}`);
  // A client-side navigation (no full reload), as the supervisor clicks it.
  await planLink.click();
  await expect(page).toHaveURL(new RegExp(`/projects/${projectId}/plans/${date}$`));
  await expect(page.getByRole("heading", { name: new RegExp(`Dive plan · ${date}`) })).toBeVisible();
  const team = page.getByRole("region", { name: "Team Limpkin" });
  for (const label of chosen) await expect(team.getByRole("cell", { name: label, exact: true })).toBeVisible();
  await expect(page.getByTestId("plan-caution")).toContainText("dive safety plan");
  expect(pageErrors, "uncaught errors in the page").toEqual([]);

  await page.emulateMedia({ media: "print" });
  await expect(page.getByRole("navigation", { name: "Project" })).toBeHidden();
  await expect(page.getByRole("button", { name: "E-mail to team" })).toBeHidden();
  await expect(page.getByTestId("plan-caution")).toBeVisible();
  const pdf = await page.pdf({ format: "Letter", landscape: true, margin: { top: "10mm", bottom: "10mm", left: "10mm", right: "10mm" } });
  const pages = (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
  expect(pages, "the plan prints on one page").toBe(1);
  await page.emulateMedia({ media: "screen" });

  const since = new Date().toISOString();
  await page.getByRole("button", { name: "E-mail to team" }).click();
  await expect(page.getByRole("status")).toContainText("limpkin.diver@example.org");
  const mail = await waitForMail("limpkin.diver@example.org", since);
  expect(mail.subject).toContain(`Dive plan ${date}: Team Limpkin`);
  for (const label of chosen) expect(mail.text).toContain(label);
  expect(mail.text).toContain("CAUTION");

  // The same cells for the other team on the same day are refused, naming both teams.
  const api = await playwrightRequest.newContext({ baseURL });
  await signInRequest(api, baseURL!, DEMO_ACCOUNTS.manager);
  const refused = await api.post(`/api/projects/${projectId}/assignments`, {
    data: { date, team: "Team Gar", cells: chosen, hose: "Hose C", notes: "", reason: "divers report new muck" },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(refused.status()).toBe(409);
  const body = await refused.json();
  expect(body.errors[0].message).toContain("Team Limpkin");
  expect(body.errors[0].message).toContain("Team Gar");
  expect(body.conflicts.map((conflict: { cell: string }) => conflict.cell).sort()).toEqual([...chosen].sort());
  await api.dispose();
});

test("the supervisor drags a box with Shift to select the cells it touches", async ({ page, signIn }) => {
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const cols = data.grid!.cols;
  const labelOf = new Map([...labelIndex(data)].map(([label, index]) => [index, label]));
  // Two rows by three columns of cells inside the work limit, from the middle of the list.
  const inLimit = [...labelOf.keys()];
  const block = (corner: number) => [0, 1, 2, cols, cols + 1, cols + 2].map((offset) => corner + offset);
  const corner = inLimit.slice(Math.floor(inLimit.length / 3)).find((index) => index % cols < cols - 2 && block(index).every((cell) => labelOf.has(cell)))!;
  const expected = block(corner).map((index) => labelOf.get(index)!).sort();
  await page.getByLabel("Search cell label").fill(labelOf.get(corner + cols + 1)!);
  await page.getByRole("button", { name: "Find" }).click();
  await expect(page.getByTestId("selected-cells")).toHaveText(labelOf.get(corner + cols + 1)!);
  await mapSettled(page);
  // From the centre of the first cell to the centre of the last: the box touches all six.
  const from = await screenPoint(page, cellCentreLonLat(data, corner));
  const to = await screenPoint(page, cellCentreLonLat(data, corner + cols + 2));
  await page.mouse.move(from.x, from.y);
  await page.keyboard.down("Shift");
  await page.mouse.down();
  await page.mouse.move(to.x, to.y, { steps: 8 });
  await page.mouse.up();
  await page.keyboard.up("Shift");
  await expect.poll(async () => (await page.getByTestId("selected-cells").innerText()).split(", ").sort()).toEqual(expected);
  // The box selects; it neither pans nor zooms the map.
  const centre = await screenPoint(page, cellCentreLonLat(data, corner));
  expect(Math.abs(centre.x - from.x) + Math.abs(centre.y - from.y)).toBeLessThan(2);

});

test("a viewer sees the map but cannot assign", async ({ page, signIn, baseURL }) => {
  await signIn("viewer");
  await openMap(page);
  await expect(page.getByRole("form", { name: "Assign cells" })).toHaveCount(0);
  await expect(page.getByText("dive supervisors and managers assign cells")).toBeVisible();
  const api = await playwrightRequest.newContext({ baseURL });
  await signInRequest(api, baseURL!, DEMO_ACCOUNTS.viewer);
  const refused = await api.post(`/api/projects/${projectId}/assignments`, {
    data: { date: "2030-05-15", team: "Team Gar", cells: ["A1"], hose: "Hose C", notes: "" },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(refused.status()).toBe(403);
  const dive = await api.post(`/api/projects/${projectId}/dives`, {
    data: { date: "2030-05-15", team: "Team Gar", diver: "X", bottomMinutes: 30, maxDepth: 10, cells: ["A1"] },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(dive.status()).toBe(403);
  await api.dispose();
});

type StyleJson = { sources: Record<string, { data: { type: string; geometry?: { coordinates: number[][][] | number[][][][] }; features?: Array<{ geometry: unknown }> } }> };

test("the manager uploads a shoreline, the offline style draws it, and removing it asks first", async ({ page, signIn }) => {
  await signIn("manager");
  await openMap(page);
  const styleUrl = `/projects/${projectId}/map/style.json`;
  // A shoreline 100 m or so around the demo's work limit (its bounding box, grown), the one the
  // public page's test allows while this test runs beside it.
  const shoreline = demoShoreline();
  const [[[west, south], [east], [, north]]] = shoreline.coordinates;
  const settings = page.getByRole("region", { name: "Map settings" });
  await expect(settings.getByTestId("shoreline-current")).toContainText("None");
  await settings.getByLabel("GeoJSON file").setInputFiles({ name: "demo-shore.geojson", mimeType: "application/geo+json", buffer: Buffer.from(JSON.stringify(shoreline)) });
  await settings.getByRole("button", { name: "Upload shoreline" }).click();
  await expect(settings.getByTestId("shoreline-result")).toContainText("demo-shore.geojson (1 polygon, 5 vertices) uploaded");
  await expect(settings.getByTestId("shoreline-current")).toContainText("demo-shore.geojson");
  const after = (await (await page.request.get(styleUrl)).json()) as StyleJson;
  expect(after.sources.shoreline.data.features?.[0].geometry).toEqual(shoreline);
  // The open map swapped in the new water without a reload.
  await expect.poll(() => page.evaluate(async () => ((await (window as unknown as { firmsandMap: { getSource(id: string): { getData(): Promise<{ features: unknown[] }> } } }).firmsandMap.getSource("shoreline").getData()).features.length))).toBe(1);

  // A bad file is refused with the reason.
  await settings.getByLabel("Replace with a GeoJSON file").setInputFiles({ name: "bad.geojson", mimeType: "application/geo+json", buffer: Buffer.from(JSON.stringify({ type: "Polygon", coordinates: [[[west, south], [east, south], [east, north]]] })) });
  await settings.getByRole("button", { name: "Replace shoreline" }).click();
  await expect(settings.getByRole("alert")).toContainText("at least 4 positions");

  // Removing asks to confirm; keeping it changes nothing, confirming removes it.
  await settings.getByRole("button", { name: "Remove shoreline…" }).click();
  await expect(settings.getByRole("button", { name: "Keep it" })).toBeFocused();
  await settings.getByRole("button", { name: "Keep it" }).click();
  await expect(settings.getByTestId("shoreline-current")).toContainText("demo-shore.geojson");
  await settings.getByRole("button", { name: "Remove shoreline…" }).click();
  await settings.getByRole("button", { name: "Remove the shoreline" }).click();
  await expect(settings.getByTestId("shoreline-result")).toContainText("Shoreline removed");
  await expect(settings.getByTestId("shoreline-current")).toContainText("None");
  const removed = (await (await page.request.get(styleUrl)).json()) as StyleJson;
  expect(removed.sources.shoreline.data.features).toEqual([]);
});

test("a viewer has no map settings and cannot upload a shoreline", async ({ page, signIn, baseURL }) => {
  await signIn("viewer");
  await openMap(page);
  await expect(page.getByRole("region", { name: "Map settings" })).toHaveCount(0);
  const before = (await (await page.request.get(`/projects/${projectId}/map/style.json`)).json()) as StyleJson;
  const refused = await page.request.post(`/projects/${projectId}/map`, {
    multipart: { intent: "upload", shoreline: { name: "x.geojson", mimeType: "application/geo+json", buffer: Buffer.from("{}") } },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(refused.status()).toBe(403);
  const style = (await (await page.request.get(`/projects/${projectId}/map/style.json`)).json()) as StyleJson;
  expect(style.sources.shoreline.data).toEqual(before.sources.shoreline.data);
});

test("the supervisor logs the day's dives on the plan page and the cell inspector lists them, flagging a long bottom time", async ({ page, signIn, baseURL }) => {
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const labels = [...labelIndex(data).keys()];
  const cells = [labels[20], labels[21]];
  // A past day: dives are logged on or before the project's today.
  const date = "2025-06-03";
  const assigned = await page.request.post(`/api/projects/${projectId}/assignments`, {
    data: { date, team: "Team Gar", cells, hose: "Hose C", notes: "" },
    headers: { Origin: new URL(baseURL!).origin },
  });
  // The demo's closeout may have confirmed these cells: then the plan asks for a reason.
  if (assigned.status() === 422) {
    const retry = await page.request.post(`/api/projects/${projectId}/assignments`, {
      data: { date, team: "Team Gar", cells, hose: "Hose C", notes: "", reason: "divers report new muck" },
      headers: { Origin: new URL(baseURL!).origin },
    });
    expect([201, 409]).toContain(retry.status());
  } else expect([201, 409]).toContain(assigned.status());

  await page.goto(`/projects/${projectId}/plans/${date}`);
  const form = page.getByRole("form", { name: "Log a dive for Team Gar" });
  await form.getByLabel("Diver", { exact: true }).selectOption("Florian Bexley");
  await form.getByLabel("Left surface").fill("08:00");
  await form.getByLabel("Left bottom").fill("09:20");
  // 52 ft enters the 55 fsw row, whose figure (74 min as recalled in shared/no-decompression.ts) is under 80 min.
  await form.getByLabel(/Maximum depth/).fill("52");
  await form.getByLabel(cells[0], { exact: true }).check();
  await form.getByRole("button", { name: "Log dive" }).click();
  await expect(form.getByTestId("dive-result")).toContainText("Logged Florian Bexley's dive: 80 min bottom time");
  const log = page.getByRole("table", { name: "Dives logged for Team Gar" });
  await expect(log).toContainText("Florian Bexley");
  await expect(log.getByTestId("dive-flag").first()).toContainText("beyond the table's figure");
  await expect(log).toContainText("74 min (55 fsw row)");
  // A refused entry says why and keeps the log as it was.
  await form.getByLabel("Diver", { exact: true }).selectOption("Rosalind Ituarte");
  await form.getByLabel(/Maximum depth/).fill("12");
  await form.getByRole("button", { name: "Log dive" }).click();
  await expect(form.getByRole("alert")).toContainText("give the bottom time in minutes");

  // The cell inspector on the map lists the cell's dives with the flag and the caution.
  await openMap(page);
  await page.getByLabel("Search cell label").fill(cells[0]);
  await page.getByRole("button", { name: "Find" }).click();
  const inspector = page.getByRole("region", { name: `Cell ${cells[0]}` });
  await expect(inspector.getByTestId("inspector-dives")).toContainText(`${date}: Team Gar, Florian Bexley, 80 min bottom time, 52.0 ${data.labels.length} max depth`);
  await expect(inspector.getByTestId("inspector-dives")).toContainText("beyond the table's no-decompression figure");
  await expect(inspector.getByRole("note")).toContainText("dive plan");

  // The demo seed's invented dives are there too.
  const seeded = await (await page.request.get(`/api/projects/${projectId}/dives?date=2026-11-10`)).json();
  expect(seeded.dives.map((dive: { diver: string }) => dive.diver).sort()).toEqual(["Juniper Adeyemi", "Odessa Marchetti"]);
});

test("the open map picks up a new survey without a reload, and its retraction too", async ({ page, signIn, baseURL }) => {
  await signIn("dive-supervisor");
  const data = await openMap(page);
  const grid = data.grid!;
  const untouched = CELL_STATUSES.indexOf("untouched");
  // An untouched cell with in-limit neighbours on all sides, so a small survey covers it whole.
  const index = data.status.findIndex((code, cell) => code === untouched && [cell - 1, cell + 1, cell - grid.cols, cell + grid.cols, cell - grid.cols - 1, cell + grid.cols + 1].every((other) => (data.status[other] ?? -1) >= 0));
  expect(index, "the demo has an untouched cell").toBeGreaterThanOrEqual(0);
  const label = [...labelIndex(data)].find(([, cell]) => cell === index)![0];
  const detail = await (await page.request.get(`/api/projects/${projectId}/cells/${label}`)).json();
  expect(detail.workingDepth).not.toBeNull();
  // Soundings every 4 ft over the cell and its neighbours, 3 ft deeper than its deepest latest bottom:
  // the divers took sediment out of it.
  const crs = createCrs(data.crs.definition);
  const row = Math.floor(index / grid.cols) + grid.firstRow, col = (index % grid.cols) + grid.firstCol;
  const lines = ["easting,northing,depth"];
  for (let u = (col - 1) * grid.cellSize; u <= (col + 2) * grid.cellSize; u += 4) {
    for (let v = (row - 1) * grid.cellSize; v <= (row + 2) * grid.cellSize; v += 4) {
      const [easting, northing] = fromGridFrame(grid, u, v);
      lines.push(`${easting.toFixed(2)},${northing.toFixed(2)},${(detail.workingDepth + 3).toFixed(2)}`);
    }
  }
  expect(crs.isGeographic).toBe(false);

  // The page stays the same document throughout: a marker set now must survive.
  await page.evaluate(() => ((window as unknown as { firmsandMarker: number }).firmsandMarker = 1));
  const featureStatus = () =>
    page.evaluate((cell) => {
      const map = (window as unknown as { firmsandMap: { querySourceFeatures(source: string, options: object): Array<{ id?: number | string; properties: { s: number } }> } }).firmsandMap;
      return map.querySourceFeatures("cells", { filter: ["==", ["id"], cell] })[0]?.properties.s ?? null;
    }, index);
  expect(await featureStatus()).toBe(untouched);

  const origin = new URL(baseURL!).origin;
  const surveyor = await playwrightRequest.newContext({ baseURL });
  const manager = await playwrightRequest.newContext({ baseURL });
  let surveyId: number | null = null;
  try {
    await signInRequest(surveyor, baseURL!, DEMO_ACCOUNTS.surveyor);
    const imported = await surveyor.post(`/api/projects/${projectId}/surveys`, {
      // A whole-cell cut below firm sand is what the import's bottom-shift check holds for
      // confirmation; this test is about the map's refresh, so it confirms the bottom as it is.
      multipart: { kind: "progress", surveyedOn: "2026-12-02", waterSurfaceElevation: "31.7", acceptBottomShift: "true", file: { name: `map-refresh-${label}.csv`, mimeType: "text/csv", buffer: Buffer.from(lines.join("\n") + "\n") } },
      headers: { Origin: origin },
    });
    expect(imported.status(), await imported.text()).toBe(201);
    surveyId = (await imported.json()).id;

    // The map re-reads the cells when the window regains focus (and every 30 s while visible).
    const changed = page.waitForResponse((response) => response.url().endsWith(`/api/projects/${projectId}/cells`) && response.status() === 200);
    await page.evaluate(() => window.dispatchEvent(new Event("focus")));
    await changed;
    await expect.poll(featureStatus, { timeout: 15_000 }).not.toBe(untouched);
    expect(await page.evaluate(() => (window as unknown as { firmsandMarker?: number }).firmsandMarker)).toBe(1);

    // Retracting the survey puts the cell back, on the same open map.
    await signInRequest(manager, baseURL!, DEMO_ACCOUNTS.manager);
    const retracted = await manager.delete(`/api/projects/${projectId}/surveys/${surveyId}`, { data: { reason: "map refresh test survey" }, headers: { Origin: origin } });
    expect(retracted.status(), await retracted.text()).toBeLessThan(300);
    surveyId = null;
    await expect.poll(async () => {
      await page.evaluate(() => window.dispatchEvent(new Event("focus")));
      return featureStatus();
    }, { timeout: 15_000 }).toBe(untouched);
    expect(await page.evaluate(() => (window as unknown as { firmsandMarker?: number }).firmsandMarker)).toBe(1);
  } finally {
    // Leave the shared demo database as it was, even when an assertion failed.
    if (surveyId !== null) {
      await signInRequest(manager, baseURL!, DEMO_ACCOUNTS.manager).catch(() => undefined);
      await manager.delete(`/api/projects/${projectId}/surveys/${surveyId}`, { data: { reason: "map refresh test survey" }, headers: { Origin: origin } });
    }
    await surveyor.dispose();
    await manager.dispose();
  }
});
