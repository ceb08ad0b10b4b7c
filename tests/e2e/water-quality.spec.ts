import { request as playwrightRequest, type Page } from "@playwright/test";
import { localClockOf, localDayOf } from "../../shared/local-time";
import { PROJECT } from "../../sample-data/scenario";
import { DEMO_ACCOUNTS, demoProjectId, expect, test, waitForMail } from "./fixtures";

// The exceedance path end to end on the demo project (seeded with stations and the permit's rule
// of 29 NTU above background): the operator's readings, the e-mail, the banner on the dive
// supervisor's map, the resumption refused until an in-limit resample, and a wildlife stand-down.
// The test closes what it opens, so other tests see the project as seeded.

let projectId: number;

test.describe.configure({ timeout: 90_000 });

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

/** A datetime-local value in the project's time zone, `minutesAgo` before now. */
const localInput = (minutesAgo: number) => {
  const at = Date.now() - minutesAgo * 60_000;
  return `${localDayOf(at, PROJECT.timeZone)}T${localClockOf(at, PROJECT.timeZone)}`;
};

async function recordReading(page: Page, station: RegExp, minutesAgo: number, value: string) {
  await page.goto(`/projects/${projectId}/water-quality`);
  const form = page.locator("form").filter({ has: page.getByRole("button", { name: "Save reading" }) });
  await form.getByLabel("Station").selectOption({ label: (await form.getByLabel("Station").locator("option").allTextContents()).find((text) => station.test(text))! });
  await form.getByLabel(/^Taken at/).fill(localInput(minutesAgo));
  await form.getByLabel("Turbidity").fill(value);
  await form.getByRole("button", { name: "Save reading" }).click();
  return page.getByTestId("reading-verdict");
}

async function signInAs(page: Page, account: keyof typeof DEMO_ACCOUNTS) {
  await page.context().clearCookies();
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(DEMO_ACCOUNTS[account]);
  await page.getByLabel("Password").fill("firmsand-demo");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/projects$/);
}

test("an exceedance stops work: e-mail, banner on the supervisor's map, resumption only after an in-limit resample", async ({ page, browser }) => {
  const since = new Date().toISOString();
  await signInAs(page, "dewatering");
  await expect(await recordReading(page, /^BG-1/, 12, "5")).toContainText("Recorded");
  // 34.5 over a background of 5: 29.5 above it, over the 29 NTU rule.
  const verdict = await recordReading(page, /^CP-1/, 8, "34.5");
  await expect(verdict).toContainText("Exceeds the limit of 34 NTU (background 5 NTU, difference 29.5 NTU)");
  await expect(page.getByTestId("stop-work-banner")).toContainText("STOP WORK");
  await expect(page.getByTestId("notify-countdown")).toContainText(/in 23 h 5\d min/);

  const mail = await waitForMail(DEMO_ACCOUNTS["dive-supervisor"], since);
  expect(mail.subject).toContain("STOP WORK");
  expect(mail.text).toContain("34.5 NTU");
  await waitForMail(DEMO_ACCOUNTS.manager, since);

  const supervisor = await browser.newPage();
  await signInAs(supervisor, "dive-supervisor");
  await supervisor.goto(`/projects/${projectId}/map`);
  await expect(supervisor.getByTestId("stop-work-banner")).toContainText("turbidity exceedance at CP-1");
  await expect(supervisor.getByTestId("assign-work-stopped")).toContainText("Work is stopped");
  await supervisor.close();

  // The monitor may not resume before an in-limit resample.
  const monitor = await browser.newPage();
  await signInAs(monitor, "resource-monitor");
  await monitor.goto(`/projects/${projectId}/water-quality`);
  const openEvent = monitor.locator("li").filter({ hasText: "OPEN" }).first();
  await openEvent.getByLabel("Resumption note").fill("Curtain repaired");
  await openEvent.getByRole("button", { name: "Record resumption" }).click();
  await expect(monitor.getByRole("alert").filter({ hasText: "No resample at this station is within the limit" })).toBeVisible();

  await expect(await recordReading(page, /^CP-1/, 3, "12")).toContainText("Within the limit of 34 NTU");

  await monitor.goto(`/projects/${projectId}/water-quality`);
  const stillOpen = monitor.locator("li").filter({ hasText: "OPEN" }).first();
  await stillOpen.getByLabel("Resumption note").fill("Curtain repaired; resample 12 NTU over background 5");
  await stillOpen.getByRole("button", { name: "Record resumption" }).click();
  await expect(monitor.getByRole("status").filter({ hasText: "Resumption recorded" })).toBeVisible();
  await expect(monitor.getByTestId("stop-work-banner")).toHaveCount(0);
  await monitor.close();
});

test("a sighting within the shutdown distance starts a stand-down that ends after the wait", async ({ page }) => {
  await signInAs(page, "dive-supervisor");
  await page.goto(`/projects/${projectId}/water-quality`);
  const form = page.locator("form").filter({ has: page.getByRole("button", { name: "Save sighting" }) });
  await form.getByLabel("Species").selectOption("manatee");
  await form.getByLabel(/^Distance/).fill("30");
  await form.getByLabel(/^Seen at/).fill(localInput(40));
  await form.getByLabel("Observer").fill("Wendell Achterberg");
  await form.getByRole("button", { name: "Save sighting" }).click();
  await expect(page.getByRole("status").filter({ hasText: "STAND-DOWN" })).toBeVisible();
  await expect(page.getByTestId("stop-work-banner")).toContainText("IN-WATER STAND-DOWN — manatee");

  // Left on its own 35 minutes ago: with the 30-minute wait, the stand-down ended 5 minutes ago.
  const again = page.locator("form").filter({ has: page.getByRole("button", { name: "Save sighting" }) });
  await again.getByLabel("Species").selectOption("manatee");
  await again.getByLabel(/The animal has left/).check();
  await again.getByLabel(/^Seen at/).fill(localInput(35));
  await again.getByLabel("Observer").fill("Wendell Achterberg");
  await again.getByRole("button", { name: "Save sighting" }).click();
  await expect(page.getByRole("status").filter({ hasText: "The stand-down ends at" })).toBeVisible();
  await expect(page.getByTestId("stop-work-banner")).toHaveCount(0);
});
