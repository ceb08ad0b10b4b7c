import { SURVEYS, ZONES } from "../../sample-data/scenario";
import { UNZONED_NAME } from "../../shared/volumes/rollup";
import { demoProjectId, expect, test } from "./fixtures";
import { request as playwrightRequest } from "@playwright/test";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { writeFileSync } from "node:fs";
import { pdfTextItems } from "../pdf-text";

// The manager chooses a pay period between two of the demo's surveys on the quantities page, sees
// zone rows that add up to the project in every column, signs the period, and finds it listed.

let projectId = 0;

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

const COLUMNS = ["Removed", "Paid", "Over-dredge", "Deposited", "Remaining at end"];

/** "1,234 yd³" → 1234 */
const volumeOf = (text: string) => Number(text.replace(/[^\d.−-]/g, "").replace("−", "-"));

test("the manager chooses a period between two surveys, sees rows that add up, and signs it", async ({ page, signIn }) => {
  await signIn("manager");
  await page.goto(`/projects/${projectId}/quantities`);
  const section = page.getByRole("region", { name: "Pay period" });
  await expect(section.getByText("baseline to latest")).toBeVisible(); // the default period is today's figures

  // The second and fourth surveys of the demo (progress passes).
  const choose = async (label: string, date: string) => {
    const select = section.getByLabel(label);
    await select.selectOption((await select.locator("option", { hasText: date }).getAttribute("value"))!);
  };
  await choose("From survey", SURVEYS[1].surveyedOn);
  await choose("To survey", SURVEYS[3].surveyedOn);
  await section.getByRole("button", { name: "Show period" }).click();
  await expect(page).toHaveURL(/from=\d+&to=\d+/);
  await expect(section.getByText(`${SURVEYS[1].surveyedOn} → ${SURVEYS[3].surveyedOn}`)).toBeVisible();

  const table = page.getByTestId("period-table");
  const rowNames = [...ZONES.map((zone) => zone.name), UNZONED_NAME];
  for (const name of rowNames) await expect(table.locator(`tr[data-zone="${name}"]`)).toBeVisible();
  const read = async (zone: string) => (await table.locator(`tr[data-zone="${zone}"] td`).allInnerTexts()).map(volumeOf);
  const project = await read("project");
  const zones = await Promise.all(rowNames.map(read));
  COLUMNS.forEach((column, index) => {
    const sum = zones.reduce((running, row) => running + row[index], 0);
    // computed: each figure is shown to the whole unit, so within 0.5 of its true value
    expect(Math.abs(sum - project[index]), column).toBeLessThanOrEqual(0.5 * (rowNames.length + 1));
  });
  // invariant: paid + over-dredge = removed (to the display's rounding)
  expect(Math.abs(project[1] + project[2] - project[0])).toBeLessThanOrEqual(1.5);

  const signer = `E2E Manager ${Date.now()}`;
  await section.getByLabel("Your name, as signed").fill(signer);
  await section.getByLabel("I have reviewed these figures").check();
  await section.getByRole("button", { name: "Sign this period's report" }).click();
  await expect(section.getByRole("status")).toContainText("kept as issued");
  const signed = page.getByTestId("signed-periods").locator("tr", { hasText: signer });
  await expect(signed).toBeVisible();
  await expect(signed).toContainText(`${SURVEYS[1].surveyedOn} → ${SURVEYS[3].surveyedOn}`);
  await expect(signed).toContainText("same figures"); // nothing changed since it was signed
  // The signed paid volume is the one shown for the period (to the shown rounding).
  expect(Math.abs(volumeOf(await signed.locator("td").nth(1).innerText()) - project[1])).toBeLessThanOrEqual(0.6);
  // Its printable report says it is kept as issued, under the signer's name.
  await signed.getByRole("link", { name: "Report as signed" }).click();
  await expect(page.getByTestId("signed-as-issued")).toContainText(signer);
  await expect(page.getByTestId("signed-as-issued")).toContainText("kept as issued");
});

test("the printable report fits a phone, its tables scroll in regions the keyboard reaches, and prints whole", async ({ page, signIn }) => {
  const shots = join(process.cwd(), "test-results", "quantities-report");
  mkdirSync(shots, { recursive: true });
  await signIn("manager");
  for (const viewport of [{ width: 390, height: 844 }, { width: 1440, height: 900 }]) {
    await page.setViewportSize(viewport);
    await page.goto(`/projects/${projectId}/quantities/report?from=${await surveyId(page, 0)}&to=${await surveyId(page, 2)}`);
    await expect(page.getByRole("heading", { name: /Pay period/ })).toBeVisible();
    await page.screenshot({ path: join(shots, `report-${viewport.width}.png`), fullPage: true });
    // Nothing wider than the screen: the page never scrolls sideways.
    expect(await page.evaluate(() => document.documentElement.scrollWidth), `width at ${viewport.width}`).toBeLessThanOrEqual(viewport.width);
    // Every table sits in a labelled region that takes the keyboard's focus, so it can be scrolled without a pointer.
    const tables = page.locator("main table");
    expect(await tables.count()).toBeGreaterThanOrEqual(2);
    for (const table of await tables.all()) {
      const region = table.locator("xpath=ancestor::*[@role='region'][1]");
      await expect(region).toHaveAttribute("tabindex", "0");
      await expect(region).toHaveAttribute("aria-label", /scrollable$/);
    }
  }
  // Keyboard: the period's table region takes focus and scrolls with the arrow keys on a phone.
  await page.setViewportSize({ width: 390, height: 844 });
  const periodRegion = page.getByRole("region", { name: "Figures per zone for the period, scrollable" });
  if (await periodRegion.evaluate((element) => element.scrollWidth > element.clientWidth)) {
    await periodRegion.focus();
    await page.keyboard.press("ArrowRight");
    await expect.poll(() => periodRegion.evaluate((element) => element.scrollLeft)).toBeGreaterThan(0);
  }
  // On paper (US letter less the margins, about 680 CSS px) the layout is the wide one: terms beside
  // their values, and every table whole, never clipped by its scrolling region.
  await page.setViewportSize({ width: 680, height: 900 });
  await page.emulateMedia({ media: "print" });
  await page.screenshot({ path: join(shots, "report-print-680.png"), fullPage: true });
  expect(await page.locator("main dl").first().evaluate((list) => getComputedStyle(list).gridTemplateColumns.split(" ").length)).toBe(2);
  for (const region of await page.locator("main [role='region']").all()) {
    expect(await region.evaluate((element) => getComputedStyle(element).overflowX)).toBe("visible");
  }
  await expect(page.getByRole("button", { name: "Print" })).toBeHidden();
});

test("printed on US letter, the report's tables fit the page: every column inside the margins, none clipped", async ({ page, signIn }) => {
  test.setTimeout(120_000);
  const shots = join(process.cwd(), "test-results", "quantities-report");
  mkdirSync(shots, { recursive: true });
  await signIn("manager");
  await page.goto(`/projects/${projectId}/quantities/report?from=${await surveyId(page, 0)}&to=${await surveyId(page, 2)}`);
  await expect(page.getByRole("heading", { name: /Pay period/ })).toBeVisible();
  // What the browser's print command makes: the page's own @page rule (letter, 18 mm margins).
  const pdf = await page.pdf({ format: "Letter", preferCSSPageSize: true, printBackground: true });
  writeFileSync(join(shots, "report-letter.pdf"), pdf);
  const { pages, items } = await pdfTextItems(pdf);
  // US letter is 8.5 × 11 in = 612 × 792 pt; 18 mm = 51.0 pt (1 in = 25.4 mm = 72 pt).
  expect(pages[0].width).toBeCloseTo(612, 0);
  expect(pages[0].height).toBeCloseTo(792, 0);
  const margin = (18 / 25.4) * 72;
  // Every run of text lies inside the margins: a table wider than the page would run past the right one.
  const outside = items.filter((item) => item.x < margin - 1 || item.x + item.width > pages[item.page - 1].width - margin + 1);
  expect(outside.map((item) => `page ${item.page}: "${item.text}" at ${item.x.toFixed(1)}–${(item.x + item.width).toFixed(1)} pt`)).toEqual([]);
  // The last column of each table is on the paper (a clipped table loses its right-hand columns).
  const text = items.map((item) => item.text).join(" ").replace(/\s+/g, " ");
  for (const header of ["Last survey", "Remaining at end", "Removed ±"]) expect(text, header).toContain(header);
  // Every zone's row is printed in both tables, and the project's rows.
  for (const zone of ZONES) expect(items.filter((item) => item.text.includes(zone.name)).length, zone.name).toBeGreaterThanOrEqual(2);
  // Printed at its own size: the smallest text is 12 CSS px = 9 pt (1 px = 0.75 pt). A page wider
  // than the paper is not clipped by Chromium but shrunk whole to fit, which this catches (the zone
  // table at 14 px made the page 767 px wide and every text 0.89 × its size: 7.98 pt).
  expect(Math.min(...items.map((item) => item.size))).toBeGreaterThanOrEqual(8.99);
});

test("the surveyor records a survey's reference bias on its page, a bad value is named, and the report states it", async ({ page, signIn }) => {
  await signIn("surveyor");
  const second = await surveyId(page, 2);
  await page.goto(`/projects/${projectId}/surveys/${second}`);
  await expect(page.getByTestId("survey-bias")).toHaveText("none recorded");
  const form = page.locator("form", { has: page.getByRole("heading", { name: "Reference bias" }) });
  await form.getByLabel("Up to ±").fill("-0.05");
  await form.getByLabel("Where the figure comes from").fill("staff gauge read to 0.05 ft");
  await form.getByRole("button", { name: "Save the bias" }).click();
  await expect(page.getByRole("alert").or(page.getByText(/verticalBiasValue is not negative/)).first()).toContainText("verticalBiasValue is not negative");
  await expect(page.getByTestId("survey-bias")).toHaveText("none recorded");
  await form.getByLabel("Up to ±").fill("0.05");
  await form.getByLabel("Unit").selectOption("ft");
  await form.getByRole("button", { name: "Save the bias" }).click();
  await expect(page.getByTestId("survey-bias")).toContainText("± 0.05 ft");
  await expect(page.getByTestId("survey-bias")).toContainText("staff gauge read to 0.05 ft");
  // The period ending on that survey says the bias is in its ±.
  await page.goto(`/projects/${projectId}/quantities/report?from=${await surveyId(page, 0)}&to=${second}`);
  await expect(page.getByText(/reference bias 0\.05 ft \(staff gauge read to 0\.05 ft\)/)).toBeVisible();
  // Cleared again, so the demo's other periods stay as they were.
  await page.goto(`/projects/${projectId}/surveys/${second}`);
  await form.getByRole("button", { name: "Clear it" }).click();
  await expect(page.getByTestId("survey-bias")).toHaveText("none recorded");
});

/** The id of the demo's survey at `position` (0 = the baseline), from the quantities API. */
async function surveyId(page: import("@playwright/test").Page, position: number): Promise<number> {
  const answer = await page.request.get(`/api/projects/${projectId}/quantities`);
  const body = (await answer.json()) as { surveys: Array<{ id: number }> };
  return body.surveys[position].id;
}
