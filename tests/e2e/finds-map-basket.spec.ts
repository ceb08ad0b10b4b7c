import type { Page } from "@playwright/test";
import { expect, test } from "./fixtures";

// The log form's map and the basket form, on the demo project as the resource monitor: a tap on
// the small map picks the cell (and, when asked, the position, which the server checks lies in
// that cell); a basket load of two kinds becomes two catalogue entries with their counts and volumes.

/** A cell drawn on the find form's map that is not `not`, and the screen point of its centre. */
async function drawnCell(page: Page, not: string): Promise<{ label: string; x: number; y: number }> {
  await page.getByTestId("find-cell-map").scrollIntoViewIfNeeded();
  const found = await page.evaluate((skip) => {
    const map = (window as unknown as { firmsandMap: import("maplibre-gl").Map }).firmsandMap;
    const canvas = map.getCanvas().getBoundingClientRect();
    for (const feature of map.queryRenderedFeatures({ layers: ["cells-fill"] })) {
      const label = String(feature.properties?.label ?? "");
      if (!label || label === skip || feature.geometry.type !== "Polygon") continue;
      const ring = feature.geometry.coordinates[0].slice(0, -1);
      const lon = ring.reduce((sum, point) => sum + point[0], 0) / ring.length;
      const lat = ring.reduce((sum, point) => sum + point[1], 0) / ring.length;
      const point = map.project([lon, lat]);
      // Well inside the canvas, away from the controls in its corners.
      if (point.x < 60 || point.y < 60 || point.x > canvas.width - 60 || point.y > canvas.height - 40) continue;
      return { label, x: canvas.left + point.x, y: canvas.top + point.y };
    }
    return null;
  }, not);
  if (!found) throw new Error("no cell drawn inside the map's frame");
  return found;
}

test("a tap on the find form's map picks the cell and, when asked, the position; the find is saved there", async ({ page, signIn }) => {
  test.setTimeout(120_000);
  await signIn("resource-monitor");
  await page.goto("/projects");
  const projectHref = await page.locator("a[href^='/projects/']").first().getAttribute("href");
  await page.goto(`${projectHref}/finds/new`);
  await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 60_000 });
  await page.getByLabel("Category").selectOption("modern-debris");
  await page.getByLabel("Description").fill(`Tin can picked on the map ${Date.now()}`);

  // A tap picks the cell; the position stays empty.
  const first = await drawnCell(page, "");
  await page.mouse.click(first.x, first.y);
  await expect(page.getByLabel("Cell", { exact: true })).toHaveValue(first.label);
  await expect(page.getByLabel(/^Easting/)).toHaveValue("");

  // With the position asked for, a tap on another cell sets both.
  await page.getByRole("checkbox", { name: /A tap also sets the position/ }).check();
  const second = await drawnCell(page, first.label);
  await page.mouse.click(second.x, second.y);
  await expect(page.getByLabel("Cell", { exact: true })).toHaveValue(second.label);
  await expect(page.getByLabel(/^Easting/)).toHaveValue(/^\d+\.\d\d$/);
  await expect(page.getByLabel(/^Northing/)).toHaveValue(/^\d+\.\d\d$/);

  // The server refuses a position outside the cell named, so a saved find proves the two agree.
  await page.getByRole("button", { name: "Save find" }).click();
  await expect(page).toHaveURL(/\/finds\/\d+\?logged=1$/);
  await expect(page.getByTestId("find-cell")).toHaveText(second.label);
});

test("the position's errors are said on the field typed in", async ({ page, signIn }) => {
  await signIn("resource-monitor");
  await page.goto("/projects");
  const projectHref = await page.locator("a[href^='/projects/']").first().getAttribute("href");
  await page.goto(`${projectHref}/finds/new`);
  await page.getByLabel("Category").selectOption("modern-debris");
  await page.getByLabel("Description").fill("Bottle cap");
  await page.getByLabel(/latitude and longitude/).check();
  await page.getByLabel(/^Latitude/).fill("10");
  await page.getByLabel(/^Longitude/).fill("10");
  await page.getByRole("button", { name: "Save find" }).click();
  await expect(page.getByText(/^Latitude and longitude: The position .* lies outside the work limit\.$/)).toBeVisible();
});

test("a basket load of two kinds becomes two catalogue entries with their counts and volumes", async ({ page, signIn }) => {
  test.setTimeout(120_000);
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn("resource-monitor");
  await page.goto("/projects");
  const projectHref = await page.locator("a[href^='/projects/']").first().getAttribute("href");
  await page.goto(`${projectHref}/finds`);
  await page.getByRole("link", { name: "Log a basket load" }).click();
  await expect(page.getByRole("heading", { name: "Log a basket load" })).toBeVisible();
  const stamp = Date.now();
  await page.getByLabel("Line 1: category").selectOption("modern-debris");
  await page.getByLabel("What it is").first().fill(`Aluminium cans ${stamp}`);
  await page.getByLabel("Count", { exact: true }).first().fill("12");
  // Measured by volume as well, in the feet project's own unit (US gallons, offered first).
  await page.getByLabel("Volume", { exact: true }).first().fill("1.5");
  await expect(page.getByLabel("Unit", { exact: true }).first()).toHaveValue("gal");
  await page.getByRole("button", { name: "Add a line" }).click();
  await page.getByLabel("Line 2: category").selectOption("faunal");
  await page.getByLabel("What it is").nth(1).fill(`Turtle shell fragments ${stamp}`);
  await page.getByLabel("Count", { exact: true }).nth(1).fill("5");
  await page.getByLabel("Taxon").fill("softshell turtle");
  // A third line, added and removed again, sends nothing.
  await page.getByRole("button", { name: "Add a line" }).click();
  await page.getByRole("button", { name: "Remove line 3" }).click();
  await page.getByRole("button", { name: "Save basket load" }).click();

  const logged = page.getByTestId("basket-logged");
  await expect(logged).toContainText("17 items counted and 1.5 gal by volume in 2 catalogue entries");
  const entries = logged.getByRole("listitem");
  await expect(entries).toHaveCount(2);
  await expect(entries.nth(0)).toContainText("Modern debris · 12 · 1.5 gal");
  await expect(entries.nth(1)).toContainText("Faunal · 5");
  const numbers = await entries.locator("a").allInnerTexts();
  // Consecutive numbers of one year: the basket's lines in order (computed).
  const [a, b] = numbers.map((number) => Number(number.split("-").at(-1)));
  expect(b).toBe(a + 1);
  const second = await entries.nth(1).locator("a").getAttribute("href");
  await entries.nth(0).locator("a").click();
  await expect(page.getByTestId("find-volume")).toHaveText("1.5 gal");
  await page.goto(second!);
  await expect(page.getByText(`Turtle shell fragments ${stamp}`)).toBeVisible();
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
});
