import { SURVEYS, ZONES } from "../../sample-data/scenario";
import { UNZONED_NAME } from "../../shared/volumes/rollup";
import { demoProjectId, expect, test } from "./fixtures";
import { request as playwrightRequest } from "@playwright/test";

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
