import { request as playwrightRequest } from "@playwright/test";
import { instantOfLocal, localDayOf } from "../../shared/local-time";
import { PROJECT } from "../../sample-data/scenario";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, demoProjectId, expect, test } from "./fixtures";

// The dive supervisor's day report end to end on the demo project: yesterday's report lists what
// is missing, takes the weather, is signed with a typed name, then refuses edits and takes an amendment.

let projectId: number;

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

test("daily report: missing items, weather, signature, locked, amendment", async ({ page }) => {
  const today = localDayOf(Date.now(), PROJECT.timeZone);
  // Noon of the day before today's local midnight is yesterday, whatever the offset.
  const yesterday = localDayOf(instantOfLocal(today, 0, PROJECT.timeZone) - 12 * 3_600_000, PROJECT.timeZone);
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(DEMO_ACCOUNTS["dive-supervisor"]);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/projects/);

  await page.goto(`/projects/${projectId}/days`);
  await page.getByRole("link", { name: yesterday }).click();
  await expect(page.getByRole("heading", { name: `Daily report · ${yesterday}` })).toBeVisible();
  await expect(page.getByTestId("missing")).toContainText("no weather entered");

  await page.getByLabel("Conditions").fill("Overcast, light chop");
  await page.getByLabel("Air temperature").fill("18 °C");
  await page.getByLabel("Effect on the work").fill("None");
  await page.getByRole("button", { name: "Save weather and notes" }).click();
  await expect(page.getByText("Weather and notes saved.")).toBeVisible();
  await expect(page.getByTestId("missing")).not.toContainText("no weather entered");

  await page.getByLabel("Your name (typed, as your signature)").fill("Dana Reyes");
  await page.getByRole("button", { name: "Sign the report" }).click();
  await expect(page.getByTestId("signed")).toContainText("Dana Reyes");
  // Locked: the notes form is gone, and a direct post is refused.
  await expect(page.getByTestId("notes-form")).toHaveCount(0);
  const origin = new URL(page.url()).origin;
  const refused = await page.request.post(`/projects/${projectId}/days/${yesterday}`, { form: { intent: "notes", conditions: "Sunny" }, headers: { Origin: origin } });
  expect(refused.status()).toBe(409);

  await page.getByLabel("Amendment").fill("Air temperature read at 07:00, not noon.");
  await page.getByRole("button", { name: "Add amendment" }).click();
  await expect(page.getByTestId("amendments")).toContainText("Air temperature read at 07:00, not noon.");
  await page.goto(`/projects/${projectId}/days`);
  await expect(page.getByTestId("day").filter({ hasText: yesterday })).toContainText("amended");
});
