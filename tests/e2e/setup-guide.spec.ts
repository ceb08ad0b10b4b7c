import { join } from "node:path";
import type { Page } from "@playwright/test";
import { SURVEYS, ZONES } from "../../sample-data/scenario";
import { expect, test, uniqueEmail } from "./fixtures";

// "Set up this project": the site admin creates a project from nothing with the demo spring's work
// limit and walks the steps to done — identity, zones (two drawn by clicks on the map, one given a
// colour of its own), working hours and emergency information, a dive team, an invitation and the
// baseline survey — each step turning done from the project's own data; the overview's reminder
// goes once every step is done.

const DEMO = join(import.meta.dirname, "..", "..", "sample-data", "demo");
const PROJECT_NAME = `Zz setup steps ${Date.now().toString(36)}`;

async function backToSetup(page: Page) {
  await page.getByRole("link", { name: "Back to the setup steps" }).click();
  await expect(page.getByRole("heading", { name: "Set up this project" })).toBeVisible();
}

const countSays = (page: Page, done: number) => expect(page.getByTestId("setup-count")).toHaveText(`${done} of 9 steps done`);

/** Screen pixels (relative to the map's box) of lon/lat points, as the map shows them now. */
function pixelsOf(page: Page, points: Array<[number, number]>) {
  return page.evaluate((lonLats) => {
    const map = (window as unknown as { firmsandZoneMap: { project: (p: [number, number]) => { x: number; y: number } } }).firmsandZoneMap;
    return lonLats.map((lonLat) => map.project(lonLat)).map(({ x, y }) => ({ x, y }));
  }, points);
}

test("a new project walks its setup steps to done; two zones drawn by clicks on the map are saved and shown in their colours", async ({ page, signIn }) => {
  test.setTimeout(240_000);
  await signIn("admin");
  const form = page.getByRole("region", { name: "New project" });
  await form.getByLabel("Project name").fill(PROJECT_NAME);
  await form.getByLabel("Coordinate reference system (EPSG code)").fill("EPSG:2237");
  await form.getByLabel("Length unit").selectOption("us-ft");
  await form.getByLabel("Time zone").fill("America/New_York");
  await form.getByLabel(/Work limit \(GeoJSON/).setInputFiles(join(DEMO, "work-limit.geojson"));
  await form.getByRole("button", { name: "Create project" }).click();

  // The new project opens on its steps, at the first one not done: what the form gave is done.
  await expect(page).toHaveURL(/\/projects\/\d+\/setup$/);
  const projectId = Number(/\/projects\/(\d+)\/setup/.exec(page.url())![1]);
  await countSays(page, 3);
  const step = page.getByTestId("setup-step");
  await expect(step.getByRole("heading", { name: "Name, agency and permits" })).toBeVisible();
  await expect(page.getByRole("navigation", { name: "Setup steps" }).getByRole("link", { name: /Coordinate system/ })).toContainText("Done");
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await page.setViewportSize({ width, height });
    await page.screenshot({ path: test.info().outputPath(`setup-${width}.png`), fullPage: true });
  }
  await page.setViewportSize({ width: 1440, height: 900 });

  // The overview says how far setting up has come.
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByTestId("setup-reminder")).toContainText("Setup: 3 of 9 steps done.");
  await page.getByRole("link", { name: "Continue setting up this project" }).click();

  // 1. Identity, on the settings page's own form.
  await step.getByRole("link", { name: "Open Identity in Settings" }).click();
  const identity = page.getByRole("region", { name: "Identity" });
  await identity.getByLabel("Agency or client").fill("Marrowby Lakes Authority");
  await identity.getByLabel("Permit numbers").fill("ERP-2026-0417, SAJ-2026-00981");
  await identity.getByRole("button", { name: "Save identity" }).click();
  await expect(identity.getByRole("status")).toContainText("Saved.");
  await backToSetup(page);
  await expect(step.getByRole("heading", { name: "Name, agency and permits" })).toBeVisible();
  await expect(step.getByTestId("step-state")).toHaveText("Agency and permit numbers are set.");
  await countSays(page, 4);

  // Next and Back walk the steps; 2 to 4 are done already.
  await page.getByRole("link", { name: "Next: Coordinate system" }).click();
  await page.getByRole("link", { name: "Next: Work limit" }).click();
  await page.getByRole("link", { name: "Back: Coordinate system" }).click();
  await expect(step.getByRole("heading", { name: "Coordinate system" })).toBeVisible();
  await page.getByRole("link", { name: "Next: Work limit" }).click();
  await page.getByRole("link", { name: "Next: Grid" }).click();
  await page.getByRole("link", { name: "Next: Zones" }).click();

  // 5. Zones: one drawn on the map, corner by corner, inside the vent basin.
  await step.getByRole("link", { name: "Open Zones in Settings" }).click();
  const zones = page.getByRole("region", { name: "Zones" });
  const map = zones.getByTestId("zone-map");
  await expect(map).toHaveAttribute("data-ready", "", { timeout: 30_000 });
  await map.scrollIntoViewIfNeeded();
  await zones.getByRole("button", { name: "Draw a zone" }).click();
  const basin = ZONES[0].polygon.coordinates[0];
  const [lon, lat] = basin.slice(0, -1).reduce(([x, y], [a, b]) => [x + a / (basin.length - 1), y + b / (basin.length - 1)], [0, 0]);
  const square: Array<[number, number]> = [[lon - 0.00015, lat - 0.00012], [lon + 0.00015, lat - 0.00012], [lon + 0.00015, lat + 0.00012], [lon - 0.00015, lat + 0.00012]];
  const corners = await pixelsOf(page, [...square, [lon, lat + 0.0002]]);
  const box = (await map.boundingBox())!;
  for (const corner of corners) await page.mouse.click(box.x + corner.x, box.y + corner.y);
  await expect(map).toHaveAttribute("data-vertices", "5");
  // The last corner was a slip: Backspace takes it back; Enter finishes the outline.
  await page.keyboard.press("Backspace");
  await expect(map).toHaveAttribute("data-vertices", "4");
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await page.setViewportSize({ width, height });
    await map.scrollIntoViewIfNeeded();
    await page.screenshot({ path: test.info().outputPath(`zone-drawing-${width}.png`) });
  }
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.keyboard.press("Enter");
  const newZone = page.getByRole("form", { name: "New zone" });
  await newZone.getByLabel("Name of the new zone").fill("Vent basin centre");
  await newZone.getByRole("button", { name: "Save zone" }).click();
  await expect(zones.getByRole("status")).toHaveText("Saved.");
  await expect(zones.getByLabel("Name of zone 1")).toHaveValue("Vent basin centre");
  // On the map too: the zones' source holds the saved outline.
  await expect.poll(() => page.evaluate(() => (window as unknown as { firmsandZoneMap: { querySourceFeatures: (source: string) => unknown[] } }).firmsandZoneMap.querySourceFeatures("zones").length)).toBeGreaterThan(0);
  // A second zone, west of the first in the vent basin (about 10 m inside its edge, computed with
  // turf), given a colour of the manager's choosing from the palette.
  await zones.getByRole("button", { name: "Draw a zone" }).click();
  const westSquare: Array<[number, number]> = [[lon - 0.00028, lat - 0.00001], [lon - 0.00018, lat - 0.00001], [lon - 0.00018, lat + 0.00007], [lon - 0.00028, lat + 0.00007]];
  const westBox = (await map.boundingBox())!;
  for (const corner of await pixelsOf(page, westSquare)) await page.mouse.click(westBox.x + corner.x, westBox.y + corner.y);
  await expect(map).toHaveAttribute("data-vertices", "4");
  await page.keyboard.press("Enter");
  await newZone.getByLabel("Name of the new zone").fill("West basin");
  // The next free colour is offered first; the manager picks another.
  await expect(newZone.getByLabel("Colour")).toHaveValue("#aa6600");
  await newZone.getByLabel("Colour").selectOption({ label: "Orchid" });
  await newZone.getByRole("button", { name: "Save zone" }).click();
  await expect(zones.getByRole("status")).toHaveText("Saved.");
  await expect(zones.getByLabel("Name of zone 2")).toHaveValue("West basin");
  await expect(zones.getByLabel("Colour of zone 2")).toHaveValue("#9955aa");
  // And the first zone's colour changed from its default.
  await expect(zones.getByLabel("Colour of zone 1")).toHaveValue("#0d5c66");
  await zones.getByLabel("Colour of zone 1").selectOption({ label: "Slate" });
  await zones.getByRole("button", { name: "Set colour of zone Vent basin centre" }).click();
  await expect(zones.getByRole("status")).toHaveText("Zone colour saved.");
  await expect(zones.getByLabel("Colour of zone 1")).toHaveValue("#333366");
  await expect.poll(() => page.evaluate(() => (window as unknown as { firmsandZoneMap: { querySourceFeatures: (source: string) => Array<{ properties: { name: string; colour: string } }> } })
    // (a feature crossing tiles comes back once per tile)
    .firmsandZoneMap.querySourceFeatures("zones").map((feature) => `${feature.properties.name} ${feature.properties.colour}`)).then((found) => [...new Set(found)].sort())).toEqual(["Vent basin centre #333366", "West basin #9955aa"]);
  for (const [width, height] of [[1440, 900], [390, 844]]) {
    await page.setViewportSize({ width, height });
    await map.scrollIntoViewIfNeeded();
    await page.screenshot({ path: test.info().outputPath(`zone-saved-${width}.png`) });
    await zones.getByRole("list", { name: "Zones" }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: test.info().outputPath(`zone-list-${width}.png`) });
  }
  await page.setViewportSize({ width: 1440, height: 900 });
  await backToSetup(page);
  await expect(step.getByTestId("step-state")).toHaveText("2 zones drawn or uploaded.");
  await countSays(page, 5);

  // 6. Working hours and emergency information.
  await page.getByRole("link", { name: "Next: Tolerances, hours and emergency information" }).click();
  await step.getByRole("link", { name: "Open Dive work" }).click();
  const diveWork = page.getByRole("region", { name: "Dive work" });
  await diveWork.getByLabel("Work day starts").fill("07:00");
  await diveWork.getByLabel("Work day ends").fill("15:30");
  await diveWork.getByRole("button", { name: "Save dive work" }).click();
  await expect(diveWork.getByRole("status")).toContainText("Saved.");
  const emergency = page.getByRole("region", { name: "Emergency information" });
  await emergency.getByLabel("Nearest hospital").fill("Marrowby General (emergency department)");
  await emergency.getByLabel("Hospital phone").fill("(555) 555-0131");
  await emergency.getByLabel("Emergency services number").fill("(555) 555-0100");
  await emergency.getByRole("button", { name: "Save emergency information" }).click();
  await expect(emergency.getByRole("status")).toContainText("Saved.");
  await backToSetup(page);
  await countSays(page, 6);

  // 7. A dive team.
  await page.getByRole("link", { name: "Next: Dive teams" }).click();
  await step.getByRole("link", { name: "Open Dive teams" }).click();
  const team = page.getByRole("form", { name: "New dive team" });
  await team.getByLabel("Team name").fill("North crew");
  await team.getByLabel("Crew, one person a line").fill("Odile Rask, diver\nBram Kettering, tender\nSunniva Holt, standby diver");
  await team.getByRole("button", { name: "Add team" }).click();
  await expect(page.getByRole("status")).toContainText("North crew saved.");

  // 8. An invitation.
  await page.goto(`/projects/${projectId}/setup?step=members`);
  await step.getByRole("link", { name: "Open Members" }).click();
  await page.getByLabel("E-mail").fill(uniqueEmail("setup-surveyor"));
  await page.getByLabel("Role", { exact: true }).selectOption("surveyor");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("region", { name: "Open invitations" })).toContainText("setup-surveyor");

  // 9. The baseline survey.
  await page.goto(`/projects/${projectId}/setup`);
  await countSays(page, 8);
  await expect(step.getByRole("heading", { name: "First survey" })).toBeVisible();
  await step.getByRole("link", { name: "Import a survey" }).click();
  const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
  await page.getByLabel("Sounding file (CSV, up to 200 MB)").setInputFiles(join(DEMO, baseline.fileName));
  await page.getByLabel("Survey kind").selectOption("baseline");
  await page.getByLabel("Survey date").fill(baseline.surveyedOn);
  await page.getByLabel(/Water-surface elevation/).fill(String(baseline.waterSurfaceElevationFt));
  await page.getByRole("button", { name: "Upload and check" }).click();
  // The upload is checked before the page moves on (some seconds for 20,000 soundings on a busy machine).
  await expect(page).toHaveURL(/\/surveys\/imports\/\d+$/, { timeout: 60_000 });
  await page.getByRole("button", { name: "Import the survey" }).click();
  await expect(page).toHaveURL(/\/surveys\/\d+$/, { timeout: 90_000 });

  // Every step done: the guide says so and the overview no longer reminds.
  await page.goto(`/projects/${projectId}/setup`);
  await countSays(page, 9);
  await expect(page.getByRole("status")).toContainText("Every step is done.");
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByRole("heading", { name: PROJECT_NAME })).toBeVisible();
  await expect(page.getByTestId("setup-reminder")).toHaveCount(0);

  // The audit log says a settings change as what differs (the colour chosen above), not as two whole objects.
  await page.goto(`/projects/${projectId}/audit`);
  const entries = page.getByRole("region", { name: "Audit entries" });
  await expect(entries).toContainText("zoneColours › Vent basin centre: Teal → Slate");
  await expect(entries).not.toContainText("[object Object]");
  await page.screenshot({ path: test.info().outputPath("audit-1440.png"), fullPage: true });
});
