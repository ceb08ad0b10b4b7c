import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { request as playwrightRequest, type Page } from "@playwright/test";
import { localDayOf } from "../../shared/local-time";
import { PROJECT, WORK_LIMIT } from "../../sample-data/scenario";
import { DEMO_EMERGENCY } from "../../db/seeders/demo-scenario";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test } from "./fixtures";

// The day sheet and the dive log on the plan page: the printed sheet's map, emergency information,
// caution and sign-off lines; the divers chosen from the team's roster, or typed as a visitor; no
// dive on a plan after today; the list of plans.

let projectId: number;
const SHOTS = join(process.cwd(), "test-results", "day-sheet");
/** The demo's first dive day: Team Limpkin on two cells, two dives (db/seeders/demo.ts). */
const DEMO_DAY = "2026-11-10";

test.describe.configure({ timeout: 60_000 });

test.beforeAll(async ({ baseURL }) => {
  mkdirSync(SHOTS, { recursive: true });
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

/** Team Gar's demo cells (the plan of 2026-11-12), to plan again on other days. */
async function garCells(page: Page): Promise<string[]> {
  const plan = await (await page.request.get(`/api/projects/${projectId}/assignments?date=2026-11-12`)).json();
  const gar = (plan.teams as Array<{ team: { name: string }; cells: Array<{ label: string }> }>).find((entry) => entry.team.name === "Team Gar")!;
  return gar.cells.map((cell) => cell.label);
}

async function assign(page: Page, baseURL: string, date: string, cells: string[]) {
  const response = await page.request.post(`/api/projects/${projectId}/assignments`, {
    data: { date, team: "Team Gar", cells, hose: "Hose C", notes: "", reason: "divers report new muck" },
    headers: { Origin: new URL(baseURL).origin },
  });
  expect([201, 409]).toContain(response.status());
}

test("the printed day sheet carries the map of the day's cells, the emergency information, the caution and sign-off lines", async ({ page, signIn }) => {
  await signIn("dive-supervisor");
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.goto(`/projects/${projectId}/plans/${DEMO_DAY}`);
  await expect(page.getByRole("heading", { name: new RegExp(`Dive plan · ${DEMO_DAY}`) })).toBeVisible();
  // On screen: the emergency block and the map, no sign-off lines.
  await expect(page.getByTestId("emergency-block")).toContainText(DEMO_EMERGENCY.hospitalName);
  await expect(page.getByTestId("day-sheet-map")).toBeVisible();
  await expect(page.getByTestId("sign-off")).toBeHidden();

  await page.emulateMedia({ media: "print" });
  await expect(page.getByRole("navigation", { name: "Project" })).toBeHidden();
  await expect(page.getByRole("form", { name: "Log a dive for Team Limpkin" })).toBeHidden();
  // The map: both of the day's cells drawn inside the work limit, labelled, with the team in the key.
  const map = page.getByTestId("day-sheet-map");
  await expect(map).toBeVisible();
  const team = page.getByRole("region", { name: "Team Limpkin" });
  const labels = await team.locator("table").first().locator("tbody tr td:first-child").allInnerTexts();
  expect(labels).toHaveLength(2);
  for (const label of labels) await expect(map.locator(`[data-cell="${label}"] text`)).toHaveText(label);
  // The team's hoses and pumps with their diameters (the demo seed's, in inches), and each cell's hose with its own.
  await expect(team.getByTestId("plan-team-equipment")).toHaveText("Hoses: Hose A (6 in), Hose B (6 in). Pumps: Pump P1 (8 in).");
  for (const hose of await team.locator("table").first().locator("tbody tr td:nth-child(3)").allInnerTexts()) expect(hose).toMatch(/^Hose [AB] \(6 in\)$/);
  await expect(map.locator("figcaption")).toContainText("Team Limpkin");
  // The emergency information as set, every item.
  const emergency = page.getByTestId("emergency-block");
  for (const value of Object.values(DEMO_EMERGENCY)) await expect(emergency).toContainText(value);
  await expect(page.getByTestId("emergency-missing")).toHaveCount(0);
  await expect(page.getByTestId("plan-caution")).toBeVisible();
  await expect(page.getByTestId("plan-caution")).toContainText("dive safety plan");
  // Sign-off: the dive supervisor, the team's two divers (diver and standby diver, not the tender), a spare line.
  const signOff = page.getByTestId("sign-off");
  await expect(signOff).toBeVisible();
  await expect(signOff.getByTestId("sign-off-line")).toHaveCount(4);
  await expect(signOff.getByTestId("sign-off-line").nth(0)).toContainText("Dive supervisor");
  await expect(signOff).toContainText("Odessa Marchetti");
  await expect(signOff).toContainText("Juniper Adeyemi");
  await expect(signOff).not.toContainText("Caspian Holloway");
  await page.screenshot({ path: join(SHOTS, "day-sheet-print-1440.png"), fullPage: true });
  // The printable width of a letter page in landscape with 10 mm margins: 11 in − 20 mm at 96 px/in.
  await page.setViewportSize({ width: 979, height: 739 });
  await page.screenshot({ path: join(SHOTS, "day-sheet-print-letter.png"), fullPage: true });
  const pdf = await page.pdf({ format: "Letter", landscape: true, margin: { top: "10mm", bottom: "10mm", left: "10mm", right: "10mm" } });
  writeFileSync(join(SHOTS, "day-sheet.pdf"), pdf);
  const pages = (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
  expect(pages, "a one-team day sheet prints on one page").toBe(1);

  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(SHOTS, "day-sheet-print-390.png"), fullPage: true });
  await page.emulateMedia({ media: "screen" });
  await page.screenshot({ path: join(SHOTS, "day-plan-screen-390.png"), fullPage: true });
  // Nothing on the phone-sized page runs wider than the screen.
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
});

test("the supervisor chooses a diver from the team's roster, or types a visitor, whom the log and the daily report mark", async ({ page, signIn, baseURL }) => {
  await signIn("dive-supervisor");
  const cells = await garCells(page);
  const date = "2025-08-12";
  await assign(page, baseURL!, date, cells);
  await page.goto(`/projects/${projectId}/plans/${date}`);
  const form = page.getByRole("form", { name: "Log a dive for Team Gar" });
  const diver = form.getByLabel("Diver", { exact: true });
  // The roster as options, then the visitor choice; no free text until a visitor is chosen.
  await expect(diver.locator("option")).toHaveText(["Choose from Team Gar", "Florian Bexley (diver)", "Rosalind Ituarte (tender)", "Visitor, not on the roster…"]);
  await expect(form.getByLabel("Visitor's name")).toHaveCount(0);

  await diver.selectOption("Florian Bexley");
  await form.getByLabel(/or bottom time/).fill("40");
  await form.getByLabel(/Maximum depth/).fill("8");
  await form.getByLabel(cells[0], { exact: true }).check();
  await form.getByRole("button", { name: "Log dive" }).click();
  await expect(form.getByTestId("dive-result")).toContainText("Logged Florian Bexley's dive: 40 min bottom time");

  await diver.selectOption({ label: "Visitor, not on the roster…" });
  await form.getByLabel("Visitor's name").fill("Thaddeus Moorcroft");
  await form.getByLabel(/or bottom time/).fill("25");
  await form.getByLabel(/Maximum depth/).fill("7.5");
  await form.getByLabel(cells[1], { exact: true }).check();
  await form.getByRole("button", { name: "Log dive" }).click();
  await expect(form.getByTestId("dive-result")).toContainText("Logged Thaddeus Moorcroft (visitor)'s dive: 25 min bottom time");
  const log = page.getByRole("table", { name: "Dives logged for Team Gar" });
  await expect(log.getByRole("row", { name: /Thaddeus Moorcroft/ }).getByTestId("dive-visitor")).toHaveText("visitor");
  await expect(log.getByRole("row", { name: /Florian Bexley/ }).getByTestId("dive-visitor")).toHaveCount(0);
  // The printed sheet gives the visitor a sign-off line of their own.
  await page.emulateMedia({ media: "print" });
  await expect(page.getByTestId("sign-off")).toContainText("Diver (visitor)");
  await expect(page.getByTestId("sign-off")).toContainText("Thaddeus Moorcroft");
  await page.emulateMedia({ media: "screen" });

  await page.goto(`/projects/${projectId}/days/${date}`);
  await expect(page.getByTestId("report-visitors")).toContainText("Team Gar: Thaddeus Moorcroft");
});

test("no dive is logged on tomorrow's plan: the page says so, and the API refuses it naming the date", async ({ page, signIn, baseURL }) => {
  await signIn("dive-supervisor");
  const cells = await garCells(page);
  const today = localDayOf(Date.now(), PROJECT.timeZone);
  const tomorrow = localDayOf(Date.now() + 86_400_000, PROJECT.timeZone);
  await assign(page, baseURL!, tomorrow, cells);
  await page.goto(`/projects/${projectId}/plans/${tomorrow}`);
  await expect(page.getByRole("form", { name: "Log a dive for Team Gar" })).toHaveCount(0);
  await expect(page.getByTestId("dive-log-upcoming")).toContainText(`this plan is for ${tomorrow}, after today (${today} in ${PROJECT.timeZone})`);
  const api = await playwrightRequest.newContext({ baseURL });
  await signInRequest(api, baseURL!, DEMO_ACCOUNTS["dive-supervisor"]);
  const refused = await api.post(`/api/projects/${projectId}/dives`, {
    data: { date: tomorrow, team: "Team Gar", diver: "Florian Bexley", bottomMinutes: 30, maxDepth: 8, cells: [cells[0]] },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(refused.status()).toBe(422);
  const body = await refused.json();
  expect(body.errors[0]).toMatchObject({ field: "date" });
  expect(body.errors[0].message).toContain(`${tomorrow} is after today`);
  await api.dispose();
});

test("the manager keeps the emergency information under Settings; without it the sheet says so plainly", async ({ page, signIn }) => {
  await signIn("manager");
  await page.goto(`/projects/${projectId}/settings`);
  const section = page.getByRole("form", { name: "Emergency information" });
  await expect(section.getByLabel("Nearest hospital")).toHaveValue(DEMO_EMERGENCY.hospitalName);
  // A name without its phone, and a phone that is not one, are named beside their fields.
  await section.getByLabel("Hospital phone").fill("");
  await section.getByLabel("Hyperbaric chamber phone").fill("ring the office");
  await section.getByRole("button", { name: "Save emergency information" }).click();
  await expect(section.getByText("give the hospital's phone number with its name")).toBeVisible();
  await expect(section.getByText(/write a phone number with its digits/)).toBeVisible();
  await page.getByRole("region", { name: "Emergency information" }).screenshot({ path: join(SHOTS, "settings-emergency-refused.png") });
  // Cleared: every plan warns before diving.
  for (const label of ["Nearest hospital", "Hospital phone", "Nearest hyperbaric chamber", "Hyperbaric chamber phone", "Emergency services number", "Site address", "Access point"]) await section.getByLabel(label).fill("");
  await section.getByRole("button", { name: "Save emergency information" }).click();
  await expect(page.getByText("Saved.")).toBeVisible();
  await page.goto(`/projects/${projectId}/plans/${DEMO_DAY}`);
  await page.emulateMedia({ media: "print" });
  await expect(page.getByTestId("emergency-missing")).toHaveText("No emergency information set — add it under Settings before diving.");
  await page.emulateMedia({ media: "screen" });
  // Set again (the demo's values), and the sheet shows them.
  await page.goto(`/projects/${projectId}/settings`);
  const fields: Array<[string, string]> = [
    ["Nearest hospital", DEMO_EMERGENCY.hospitalName], ["Hospital phone", DEMO_EMERGENCY.hospitalPhone], ["Nearest hyperbaric chamber", DEMO_EMERGENCY.chamberName],
    ["Hyperbaric chamber phone", DEMO_EMERGENCY.chamberPhone], ["Emergency services number", DEMO_EMERGENCY.emergencyNumber], ["Site address", DEMO_EMERGENCY.siteAddress], ["Access point", DEMO_EMERGENCY.accessPoint],
  ];
  for (const [label, value] of fields) await section.getByLabel(label).fill(value);
  await section.getByRole("button", { name: "Save emergency information" }).click();
  await expect(page.getByText("Saved.")).toBeVisible();
  await page.goto(`/projects/${projectId}/plans/${DEMO_DAY}`);
  await expect(page.getByTestId("emergency-block")).toContainText(DEMO_EMERGENCY.chamberPhone);
});

test("the plans list shows every day planned, newest first, linked from the project's tabs", async ({ page, signIn }) => {
  await signIn("viewer");
  await page.goto(`/projects/${projectId}`);
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Dive plans" }).click();
  await expect(page).toHaveURL(new RegExp(`/projects/${projectId}/plans$`));
  const rows = page.getByTestId("plan-row");
  const dates = await rows.locator("td:first-child").allInnerTexts();
  expect(dates.length).toBeGreaterThanOrEqual(2);
  expect([...dates].sort().reverse()).toEqual(dates);
  const demo = rows.filter({ hasText: DEMO_DAY });
  await expect(demo).toContainText("Team Limpkin");
  await expect(demo.locator("td").nth(2)).toHaveText("2");
  await expect(demo.locator("td").nth(3)).toHaveText("2");
  await expect(demo.locator("td").nth(4)).toHaveText("Dives logged");
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.screenshot({ path: join(SHOTS, "plans-list-1440.png"), fullPage: true });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(SHOTS, "plans-list-390.png"), fullPage: true });
  await demo.getByRole("link", { name: DEMO_DAY }).click();
  await expect(page.getByRole("heading", { name: new RegExp(`Dive plan · ${DEMO_DAY}`) })).toBeVisible();
});

test("a project without plans says how a plan is made", async ({ page, signIn, baseURL }) => {
  await signIn("admin");
  const created = await page.request.post("/api/projects", {
    data: { name: `Plans empty ${Date.now()}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: PROJECT.timeZone, workLimit: WORK_LIMIT, grid: { cellSize: 20 } },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(created.status()).toBe(201);
  const { id } = await created.json();
  await page.goto(`/projects/${id}/plans`);
  const empty = page.getByTestId("plans-empty");
  await expect(empty).toContainText("No day plans yet.");
  await expect(empty.getByRole("link", { name: "Go to the map" })).toHaveAttribute("href", `/projects/${id}/map`);
  await expect(page.getByRole("table", { name: "Day plans" })).toHaveCount(0);
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: join(SHOTS, "plans-empty-390.png"), fullPage: true });
});
