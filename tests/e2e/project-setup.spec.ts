import { readFileSync } from "node:fs";
import { join } from "node:path";
import { request as playwrightRequest } from "@playwright/test";
import { GRID, PROJECT, SURVEYS } from "../../sample-data/scenario";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, createSpringProject, expect, signInRequest, signInWithPassword, test } from "./fixtures";

const DEMO_DIR = join(import.meta.dirname, "..", "..", "sample-data", "demo");

// The first morning: the site admin creates a project from nothing with a GeoJSON work limit (an
// invented lake), lands on its setup steps, finds the empty grid and the next step on its map; the
// manager named on the form changes the cell size on the settings page and sees the new cell count.

const WORK_LIMIT_FILE = join(import.meta.dirname, "..", "fixtures", "project-setup", "yellowmarsh-lake.geojson");
// Two rectangles inside the lake (checked inside with turf's booleanWithin when written).
const ZONES_FILE = join(import.meta.dirname, "..", "fixtures", "project-setup", "yellowmarsh-zones.geojson");
// Sorts after the demo project, so the demo stays first in the manager's list (other specs find it so).
const PROJECT_NAME = `Yellowmarsh Lake muck removal ${Date.now().toString(36)}`;

const cellCountOf = (text: string | null) => Number((/has ([\d,]+) cells/.exec(text ?? "")?.[1] ?? "NaN").replaceAll(",", ""));

test("the site admin creates a project; its manager changes the cell size and sees the new cell count", async ({ page, signIn, browser, baseURL }) => {
  test.setTimeout(90_000);
  await signIn("admin");
  const form = page.getByRole("region", { name: "New project" });
  await form.getByLabel("Project name").fill(PROJECT_NAME);
  await form.getByLabel("Coordinate reference system (EPSG code)").fill("EPSG:2237");
  await form.getByLabel("Length unit").selectOption("us-ft");
  await form.getByLabel("Time zone").fill("America/New_York");
  await form.getByLabel("First manager's e-mail").fill(DEMO_ACCOUNTS.manager);
  await form.getByLabel(/Work limit \(GeoJSON/).setInputFiles(WORK_LIMIT_FILE);
  await form.getByRole("button", { name: "Create project" }).click();

  // A new project opens on its setup steps; the map shows the empty grid and the next step.
  await expect(page).toHaveURL(/\/projects\/\d+\/setup$/);
  const projectId = Number(/\/projects\/(\d+)\/setup/.exec(page.url())![1]);
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Map" }).click();
  await expect(page.getByRole("heading", { name: PROJECT_NAME })).toBeVisible();
  await expect(page.getByTestId("next-step")).toContainText("Next: import the baseline survey");
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 30_000 });

  // The manager named on the form runs it: Settings is among their tabs.
  const managerContext = await browser.newContext({ baseURL });
  const managerPage = await managerContext.newPage();
  await signInWithPassword(managerPage, DEMO_ACCOUNTS.manager, DEMO_PASSWORD);
  await expect(managerPage).toHaveURL(/\/projects$/);
  await managerPage.getByRole("link", { name: PROJECT_NAME }).click();
  await managerPage.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Settings" }).click();
  await expect(managerPage).toHaveURL(`/projects/${projectId}/settings`);

  const grid = managerPage.getByRole("region", { name: "Grid" });
  const before = cellCountOf(await grid.getByTestId("cell-count").textContent());
  expect(before).toBeGreaterThan(0);
  // The preview beside the form draws the saved grid's cells, then the grid as typed, before it is saved.
  const preview = grid.getByTestId("grid-preview");
  await expect(preview.getByTestId("grid-preview-map")).toHaveAttribute("data-ready", "", { timeout: 30_000 });
  await expect(preview.getByTestId("grid-preview-count")).toContainText(`The grid as typed: ${before.toLocaleString("en-US")} cells`);
  await grid.getByLabel("Cell size (ftUS)").fill("40");
  await expect(preview.getByTestId("grid-preview-count")).not.toContainText(`${before.toLocaleString("en-US")} cells`);
  const typed = cellCountOf((await preview.getByTestId("grid-preview-count").textContent())!.replace("The grid as typed:", "has"));
  const drawn = Number(await preview.getByTestId("grid-preview-map").getAttribute("data-drawn"));
  expect(drawn).toBeGreaterThan(0);
  expect(drawn).toBeLessThanOrEqual(typed);
  // Labels once the cells are large enough on screen to read.
  await expect(preview.getByTestId("grid-preview-labels")).toContainText("zoom in to read their labels");
  for (let step = 0; step < 4; step++) await preview.getByRole("button", { name: "Zoom in" }).click();
  await expect(preview.getByTestId("grid-preview-labels")).toContainText("labelled.");
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await managerPage.setViewportSize({ width, height });
    await preview.scrollIntoViewIfNeeded();
    await managerPage.screenshot({ path: test.info().outputPath(`grid-preview-${width}.png`) });
  }
  await managerPage.setViewportSize({ width: 1280, height: 720 });
  await grid.getByRole("button", { name: "Save grid" }).click();
  await expect(grid.getByRole("status")).toContainText("Saved.");
  await expect(grid.getByLabel("Cell size (ftUS)")).toHaveValue("40");
  const after = cellCountOf(await grid.getByTestId("cell-count").textContent());
  // invariant: from the same origin each 40 ft cell is a block of four 20 ft cells over the same extent
  expect(after).toBeGreaterThanOrEqual(before / 4);
  expect(after).toBeLessThan(before / 2);
  await expect(grid.getByRole("status")).toContainText(`The grid has ${after.toLocaleString("en-US")} cells.`);
  // computed: the preview laid out the grid as typed with the same grid code the save uses
  expect(typed).toBe(after);
  await managerContext.close();
});

test("zones from a file of polygons (previewed on the map, named, added) and a zone made of cells selected on the map", async ({ page, signIn }) => {
  test.setTimeout(120_000);
  await signIn("admin");
  const form = page.getByRole("region", { name: "New project" });
  const name = `Zz Yellowmarsh zones ${Date.now().toString(36)}`;
  await form.getByLabel("Project name").fill(name);
  await form.getByLabel("Coordinate reference system (EPSG code)").fill("EPSG:2237");
  await form.getByLabel("Length unit").selectOption("us-ft");
  await form.getByLabel("Time zone").fill("America/New_York");
  await form.getByLabel(/Work limit \(GeoJSON/).setInputFiles(WORK_LIMIT_FILE);
  await form.getByRole("button", { name: "Create project" }).click();
  await expect(page).toHaveURL(/\/projects\/\d+\/setup$/);
  const projectId = Number(/\/projects\/(\d+)\/setup/.exec(page.url())![1]);

  // The file: two rectangles in the lake, one named in its properties, one not (the page asks).
  await page.goto(`/projects/${projectId}/settings#zones-heading`);
  const zones = page.getByRole("region", { name: "Zones" });
  await zones.getByLabel(/File of zone outlines/).setInputFiles(ZONES_FILE);
  await zones.getByRole("button", { name: "Preview the zones" }).click();
  const read = zones.getByTestId("zones-file-preview");
  await expect(read).toContainText("Read GeoJSON from yellowmarsh-zones.geojson: 2 zones.");
  await expect(read.getByTestId("zones-file-map")).toHaveAttribute("data-ready", "", { timeout: 30_000 });
  await expect(read.getByTestId("zones-file-map")).toHaveAttribute("data-zones", "2");
  await expect(read.getByLabel("Feature 1: zone name")).toHaveValue("West bay");
  await expect(read.getByLabel("Feature 2: zone name")).toHaveValue("");
  await read.getByLabel("Feature 2: zone name").fill("East bay");
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await page.setViewportSize({ width, height });
    await read.getByTestId("zones-file-map").scrollIntoViewIfNeeded();
    await page.screenshot({ path: test.info().outputPath(`zones-file-${width}.png`) });
  }
  await page.setViewportSize({ width: 1280, height: 720 });
  // Adding asks first.
  let asked = "";
  page.once("dialog", (dialog) => { asked = dialog.message(); void dialog.accept(); });
  await read.getByRole("button", { name: "Add 2 zones" }).click();
  await expect(zones.getByRole("status").first()).toHaveText("2 zones added from the file.");
  expect(asked).toBe("Add the 2 zones from yellowmarsh-zones.geojson after the 0 zones there are?");
  await expect(zones.getByLabel("Name of zone 1")).toHaveValue("West bay");
  await expect(zones.getByLabel("Name of zone 2")).toHaveValue("East bay");

  // A zone of three cells chosen with the keys on the map (the cell at the centre and two east of it).
  await page.goto(`/projects/${projectId}/map`);
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 30_000 });
  await page.getByLabel("Cell map: arrow keys move the selected cell").focus();
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("Shift+ArrowRight");
  await page.keyboard.press("Shift+ArrowRight");
  const fromCells = page.getByRole("form", { name: "Make a zone of the selected cells" });
  await expect.poll(async () => (await fromCells.getByTestId("zone-cells").innerText()).split(", ").length).toBe(3);
  await fromCells.getByLabel("Name of the new zone").fill("Centre strip");
  await fromCells.getByRole("button", { name: "Make a zone of 3 cells" }).click();
  await expect(page.getByTestId("zone-from-cells-answer")).toContainText('Zone "Centre strip" made of 3 cells.');
  // Drawn on the map from the zones' source, and listed in the legend.
  await expect.poll(() => page.evaluate(() => (window as unknown as { firmsandMap: { querySourceFeatures: (source: string) => Array<{ properties: { name: string } }> } })
    .firmsandMap.querySourceFeatures("zones").map((feature) => feature.properties.name)).then((found) => [...new Set(found)].sort())).toEqual(["Centre strip", "East bay", "West bay"]);
  await page.goto(`/projects/${projectId}/settings#zones-heading`);
  await expect(zones.getByLabel("Name of zone 3")).toHaveValue("Centre strip");
});

test("after a baseline, the manager's new tolerance and then a new cell size are recomputed in the background: the page shows the progress, then what changed", async ({ page, signIn, baseURL }) => {
  test.setTimeout(120_000);
  const origin = new URL(baseURL!).origin;
  // The site admin sets a project up through the API with the demo spring's outline and zones; its manager imports the demo baseline.
  const admin = await playwrightRequest.newContext({ baseURL });
  await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
  const projectId = await createSpringProject(admin, baseURL!, `Recompute spring ${Date.now().toString(36)}`);
  await admin.dispose();
  const manager = await playwrightRequest.newContext({ baseURL });
  await signInRequest(manager, baseURL!, DEMO_ACCOUNTS.manager);
  const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
  const imported = await manager.post(`/api/projects/${projectId}/surveys`, {
    headers: { Origin: origin },
    multipart: {
      file: { name: baseline.fileName, mimeType: "text/csv", buffer: readFileSync(join(DEMO_DIR, baseline.fileName)) },
      kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    },
  });
  expect(imported.status(), await imported.text()).toBe(201);
  await manager.dispose();

  await signIn("manager");
  await page.goto(`/projects/${projectId}/settings`);
  const tolerances = page.getByRole("region", { name: "Targets and tolerances" });
  await tolerances.getByLabel(/Firm-sand tolerance/).fill(String(GRID.toleranceFt * 4));
  await tolerances.getByRole("button", { name: "Save tolerances" }).click();
  await expect(tolerances.getByRole("status")).toContainText("being recomputed");
  // The recompute's panel: the progress while it runs, then the summary, with the history's new version.
  const status = page.getByTestId("recompute-status");
  await expect(status.getByRole("heading", { name: "Figures recomputed" })).toBeVisible({ timeout: 60_000 });
  await expect(status.getByTestId("recompute-summary")).toContainText(/cells? changed status|no figure changed/);
  await expect(status).toContainText("from settings version 1 to 2");
  const history = page.getByTestId("settings-history");
  await expect(history.getByRole("row").nth(1)).toContainText("tolerances");
  await expect(history.getByRole("row").nth(2)).toContainText("created");

  // A new cell size lays new cells: the recompute runs again and finishes, the history keeps the grid change.
  const grid = page.getByRole("region", { name: "Grid" });
  await grid.getByLabel(/Cell size/).fill(String(GRID.cellSizeFt * 2));
  await grid.getByRole("button", { name: "Save grid" }).click();
  await expect(grid.getByRole("status")).toContainText("being recomputed");
  await expect(status).toContainText("from settings version 2 to 3", { timeout: 60_000 });
  await expect(status.getByRole("heading", { name: "Figures recomputed" })).toBeVisible();
  await expect(status.getByTestId("recompute-summary")).toContainText(/a new grid: [\d,]+ → [\d,]+ cells/);
  await expect(history.getByRole("row").nth(1)).toContainText("grid");
  await expect(grid.getByLabel(/Cell size/)).toHaveValue(String(GRID.cellSizeFt * 2));

  // The survey order (IHO S-44): a tolerance kept in the history, but nothing is recomputed; the upload then offers it.
  await expect(tolerances.getByLabel("Survey order (IHO S-44)")).toHaveValue("1a");
  await expect(tolerances).toContainText("Surveys already imported keep the order they were imported with");
  await tolerances.getByLabel("Survey order (IHO S-44)").selectOption("2");
  await tolerances.getByRole("button", { name: "Save tolerances" }).click();
  await expect(tolerances.getByRole("status")).toContainText("Saved.");
  await expect(tolerances.getByRole("status")).not.toContainText("recomputed");
  await expect(history.getByRole("row").nth(1)).toContainText("tolerances");
  await expect(history.getByRole("row").nth(1)).toContainText("Order 2");
  await expect(history.getByRole("row").nth(2)).toContainText("Order 1a");
  await expect(status).toContainText("from settings version 2 to 3");
  await expect(tolerances.getByLabel("Survey order (IHO S-44)")).toHaveValue("2");
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await page.setViewportSize({ width, height });
    await tolerances.scrollIntoViewIfNeeded();
    await tolerances.screenshot({ path: test.info().outputPath(`tolerances-${width}.png`) });
  }
  await page.goto(`/projects/${projectId}/surveys/new`);
  await expect(page.getByLabel("Survey order (IHO S-44) for QA")).toHaveValue("2");
});
