import { readFileSync } from "node:fs";
import { join } from "node:path";
import { request as playwrightRequest } from "@playwright/test";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, expect, signInRequest, signInWithPassword, test } from "./fixtures";

const DEMO_DIR = join(import.meta.dirname, "..", "..", "sample-data", "demo");

// The first morning: the site admin creates a project from nothing with a GeoJSON work limit (an
// invented lake), lands on its setup steps, finds the empty grid and the next step on its map; the
// manager named on the form changes the cell size on the settings page and sees the new cell count.

const WORK_LIMIT_FILE = join(import.meta.dirname, "..", "fixtures", "project-setup", "yellowmarsh-lake.geojson");
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
  await grid.getByLabel("Cell size (ftUS)").fill("40");
  await grid.getByRole("button", { name: "Save grid" }).click();
  await expect(grid.getByRole("status")).toContainText("Saved.");
  await expect(grid.getByLabel("Cell size (ftUS)")).toHaveValue("40");
  const after = cellCountOf(await grid.getByTestId("cell-count").textContent());
  // invariant: from the same origin each 40 ft cell is a block of four 20 ft cells over the same extent
  expect(after).toBeGreaterThanOrEqual(before / 4);
  expect(after).toBeLessThan(before / 2);
  await expect(grid.getByRole("status")).toContainText(`The grid has ${after.toLocaleString("en-US")} cells.`);
  await managerContext.close();
});

test("after a baseline, the manager's new tolerance and then a new cell size are recomputed in the background: the page shows the progress, then what changed", async ({ page, signIn, baseURL }) => {
  test.setTimeout(120_000);
  const origin = new URL(baseURL!).origin;
  // The site admin sets a project up through the API with the demo spring's outline and zones; its manager imports the demo baseline.
  const admin = await playwrightRequest.newContext({ baseURL });
  await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
  const created = await admin.post("/api/projects", {
    headers: { Origin: origin },
    data: {
      name: `Recompute spring ${Date.now().toString(36)}`, crs: PROJECT.crs, lengthUnit: PROJECT.lengthUnit, timeZone: PROJECT.timeZone,
      workLimit: WORK_LIMIT, grid: { cellSize: GRID.cellSizeFt }, zones: ZONES.map((zone) => ({ name: zone.name, geometry: zone.polygon })), manager: DEMO_ACCOUNTS.manager,
    },
  });
  expect(created.status(), await created.text()).toBe(201);
  const projectId = ((await created.json()) as { id: number }).id;
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
