import { readFileSync } from "node:fs";
import { join } from "node:path";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, expect, signInRequest, signInWithPassword, test } from "./fixtures";

// Archive and restore: the manager archives a finished project from its settings page; every page
// of it then says so in a banner, its forms are disabled, and it is listed apart; a site admin
// restores it from the banner. A project of its own (never the demo, which other specs use).

const WORK_LIMIT_FILE = join(import.meta.dirname, "..", "fixtures", "project-setup", "yellowmarsh-lake.geojson");
// Sorts after the demo project, so the demo stays first in the manager's list (other specs find it so).
const PROJECT_NAME = `Zephyr Pond closeout ${Date.now().toString(36)}`;

test("the manager archives a project: banner on every page, forms disabled, listed apart; a site admin restores it", async ({ page, browser, baseURL }) => {
  test.setTimeout(90_000);
  const origin = new URL(baseURL!).origin;
  const { request } = await import("@playwright/test");
  const admin = await request.newContext({ baseURL });
  await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
  const created = await admin.post("/api/projects", {
    headers: { Origin: origin },
    data: { name: PROJECT_NAME, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York", workLimit: JSON.parse(readFileSync(WORK_LIMIT_FILE, "utf8")), grid: { cellSize: 40 }, manager: DEMO_ACCOUNTS.manager },
  });
  expect(created.status()).toBe(201);
  const { id } = (await created.json()) as { id: number };
  await admin.dispose();

  await signInWithPassword(page, DEMO_ACCOUNTS.manager, DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/projects$/, { timeout: 20_000 });
  await page.goto(`/projects/${id}/settings`);
  page.once("dialog", (dialog) => dialog.accept());
  await page.getByRole("region", { name: "Archive", exact: true }).getByRole("button", { name: "Archive this project" }).click();
  await expect(page).toHaveURL(`/projects/${id}`);
  const banner = page.getByRole("region", { name: "Archived project" });
  await expect(banner).toContainText("Archived since");
  await expect(banner).toContainText("read-only");
  await expect(banner).toContainText("A site admin can restore it.");
  await expect(banner.getByRole("button", { name: "Restore project" })).toHaveCount(0);
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.screenshot({ path: test.info().outputPath("archived-banner-1440.png") });

  // Every project page carries it; the settings are shown but cannot be sent.
  for (const path of ["/map", "/plans", "/teams", "/surveys"]) {
    await page.goto(`/projects/${id}${path}`);
    await expect(page.getByRole("region", { name: "Archived project" }), path).toBeVisible();
  }
  await page.goto(`/projects/${id}/settings`);
  await expect(page.getByRole("button", { name: "Save identity" })).toBeDisabled();
  await expect(page.getByRole("region", { name: "Archive", exact: true })).toHaveCount(0);

  // Listed apart on the projects page.
  await page.goto("/projects");
  await expect(page.getByRole("region", { name: "Archived", exact: true }).getByRole("link", { name: PROJECT_NAME })).toBeVisible();
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: test.info().outputPath("archived-list-390.png"), fullPage: true });

  // A site admin restores it from the banner.
  const adminContext = await browser.newContext({ baseURL });
  const adminPage = await adminContext.newPage();
  await signInWithPassword(adminPage, DEMO_ACCOUNTS.admin, DEMO_PASSWORD);
  await expect(adminPage).toHaveURL(/\/projects$/, { timeout: 20_000 });
  await adminPage.goto(`/projects/${id}`);
  await adminPage.setViewportSize({ width: 390, height: 844 });
  await adminPage.screenshot({ path: test.info().outputPath("archived-banner-admin-390.png") });
  adminPage.once("dialog", (dialog) => dialog.accept());
  await adminPage.getByRole("region", { name: "Archived project" }).getByRole("button", { name: "Restore project" }).click();
  await expect(adminPage).toHaveURL(`/projects/${id}`);
  await expect(adminPage.getByRole("region", { name: "Archived project" })).toHaveCount(0);
  await adminContext.close();

  // Open again for its manager.
  await page.goto(`/projects/${id}/settings`);
  await expect(page.getByRole("button", { name: "Save identity" })).toBeEnabled();
});
