import { readFileSync } from "node:fs";
import { join } from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { request as playwrightRequest, type Page } from "@playwright/test";
import { GRID, PROJECT, SURVEYS } from "../../sample-data/scenario";
import { configuredRoutes } from "../configured-routes";
import { unmarkedFigureCells } from "./figure-columns";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, createSpringProject, demoProjectId, expect, signInRequest, test, type DemoAccount } from "./fixtures";

// The automated accessibility check: every page route of app/routes.ts (the .tsx files; resource
// routes answer JSON, CSV or GeoJSON), opened at desktop size (1440 × 900) and at phone size
// (390 × 844) as a person allowed to see it, with axe-core's rules; a serious or critical
// violation fails. The same walk checks that every number column of a table is set as figures. Each route's address and who opens it
// is written out below; a page route without a row fails the first test, so a new page joins here.

const SERIOUS = new Set(["serious", "critical"]);
/** A desktop and a phone: a page can pass at one and fail at the other (contrast of a folded menu, a target too small). */
const VIEWPORTS = [{ width: 1440, height: 900 }, { width: 390, height: 844 }];
const PLAN_DATE = "2026-11-12";
const FIXTURES = join(import.meta.dirname, "..", "fixtures", "import");
const DEMO_DIR = join(import.meta.dirname, "..", "..", "sample-data", "demo");

interface Ids {
  project: number;
  survey: number;
  find: number;
  shareToken: string;
  messageId: string;
}

/** Who opens a page: a demo account, or nobody signed in. */
type Visitor = DemoAccount | "signed-out";

interface PageRow {
  /** The route's path exactly as app/routes.ts has it. */
  route: string;
  url: (ids: Ids) => string;
  as: Visitor;
  /** Why a row is not checked (it must say when it will be). */
  skip?: string;
}

const PAGES: PageRow[] = [
  { route: "", url: () => "/", as: "signed-out" },
  { route: "account", url: () => "/account", as: "manager" },
  { route: "admin/users", url: () => "/admin/users", as: "admin" },
  { route: "dev/mail", url: () => "/dev/mail", as: "admin" },
  { route: "dev/mail/:messageId", url: (ids) => `/dev/mail/${ids.messageId}`, as: "admin" },
  { route: "forgot-password", url: () => "/forgot-password", as: "signed-out" },
  { route: "invite/:token", url: () => "/invite/no-such-token", as: "signed-out" },
  { route: "countersign/:token", url: () => "/countersign/no-such-token", as: "signed-out" },
  { route: "login", url: () => "/login", as: "signed-out" },
  { route: "projects", url: () => "/projects", as: "manager" },
  { route: "projects/:projectId", url: (ids) => `/projects/${ids.project}`, as: "manager" },
  { route: "projects/:projectId/audit", url: (ids) => `/projects/${ids.project}/audit`, as: "manager" },
  { route: "projects/:projectId/days", url: (ids) => `/projects/${ids.project}/days`, as: "manager" },
  { route: "projects/:projectId/days/:date", url: (ids) => `/projects/${ids.project}/days/${PLAN_DATE}`, as: "dive-supervisor" },
  { route: "projects/:projectId/dewatering", url: (ids) => `/projects/${ids.project}/dewatering`, as: "dewatering" },
  { route: "projects/:projectId/dewatering/hauls", url: (ids) => `/projects/${ids.project}/dewatering/hauls`, as: "dewatering" },
  { route: "projects/:projectId/dewatering/jar-tests", url: (ids) => `/projects/${ids.project}/dewatering/jar-tests`, as: "dewatering" },
  { route: "projects/:projectId/dewatering/samples", url: (ids) => `/projects/${ids.project}/dewatering/samples`, as: "resource-monitor" },
  { route: "projects/:projectId/dewatering/tubes", url: (ids) => `/projects/${ids.project}/dewatering/tubes`, as: "dewatering" },
  { route: "projects/:projectId/finds", url: (ids) => `/projects/${ids.project}/finds`, as: "resource-monitor" },
  { route: "projects/:projectId/finds/:findId", url: (ids) => `/projects/${ids.project}/finds/${ids.find}`, as: "resource-monitor" },
  { route: "projects/:projectId/finds/basket", url: (ids) => `/projects/${ids.project}/finds/basket`, as: "resource-monitor" },
  { route: "projects/:projectId/finds/new", url: (ids) => `/projects/${ids.project}/finds/new`, as: "resource-monitor" },
  { route: "projects/:projectId/holds", url: (ids) => `/projects/${ids.project}/holds`, as: "resource-monitor" },
  { route: "projects/:projectId/map", url: (ids) => `/projects/${ids.project}/map`, as: "manager" },
  { route: "projects/:projectId/members", url: (ids) => `/projects/${ids.project}/members`, as: "manager" },
  { route: "projects/:projectId/plans", url: (ids) => `/projects/${ids.project}/plans`, as: "dive-supervisor" },
  { route: "projects/:projectId/plans/:date", url: (ids) => `/projects/${ids.project}/plans/${PLAN_DATE}`, as: "dive-supervisor" },
  { route: "projects/:projectId/quantities", url: (ids) => `/projects/${ids.project}/quantities`, as: "manager" },
  { route: "projects/:projectId/settings", url: (ids) => `/projects/${ids.project}/settings`, as: "manager" },
  { route: "projects/:projectId/setup", url: (ids) => `/projects/${ids.project}/setup`, as: "manager" },
  { route: "projects/:projectId/share", url: (ids) => `/projects/${ids.project}/share`, as: "outreach" },
  { route: "projects/:projectId/surveys", url: (ids) => `/projects/${ids.project}/surveys`, as: "surveyor" },
  { route: "projects/:projectId/surveys/:surveyId", url: (ids) => `/projects/${ids.project}/surveys/${ids.survey}`, as: "surveyor" },
  // Its address comes from an upload made in the test (see below).
  { route: "projects/:projectId/surveys/imports/:jobId", url: () => "", as: "surveyor" },
  { route: "projects/:projectId/surveys/new", url: (ids) => `/projects/${ids.project}/surveys/new`, as: "surveyor" },
  { route: "projects/:projectId/teams", url: (ids) => `/projects/${ids.project}/teams`, as: "dive-supervisor" },
  { route: "projects/:projectId/water-quality", url: (ids) => `/projects/${ids.project}/water-quality`, as: "resource-monitor" },
  { route: "projects/:projectId/water-quality/compliance", url: (ids) => `/projects/${ids.project}/water-quality/compliance`, as: "manager" },
  { route: "projects/:projectId/water-quality/setup", url: (ids) => `/projects/${ids.project}/water-quality/setup`, as: "manager" },
  { route: "projects/:projectId/field", url: (ids) => `/projects/${ids.project}/field`, as: "manager" },
  { route: "projects/:projectId/finds/catalogue", url: (ids) => `/projects/${ids.project}/finds/catalogue`, as: "resource-monitor" },
  { route: "projects/:projectId/finds/:findId/custody-sheet", url: (ids) => `/projects/${ids.project}/finds/${ids.find}/custody-sheet`, as: "resource-monitor" },
  { route: "projects/:projectId/finds/custody-sheet", url: (ids) => `/projects/${ids.project}/finds/custody-sheet?find=${ids.find}`, as: "resource-monitor" },
  { route: "projects/:projectId/quantities/report", url: (ids) => `/projects/${ids.project}/quantities/report`, as: "manager" },
  { route: "reset-password/:token", url: () => "/reset-password/no-such-token", as: "signed-out" },
  { route: "share/:token", url: (ids) => `/share/${ids.shareToken}`, as: "signed-out" },
];

/** Serious and critical violations on the open page, one line each with where they are. */
async function seriousViolations(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page }).analyze();
  return results.violations
    .filter((violation) => SERIOUS.has(violation.impact ?? ""))
    .flatMap((violation) => violation.nodes.map((node) => `${violation.impact} ${violation.id}: ${violation.help} — ${node.target.join(" ")}`));
}

test("every page route of app/routes.ts has a row in the accessibility walk", () => {
  const pages = configuredRoutes().filter((route) => route.file.endsWith(".tsx"));
  const listed = new Set(PAGES.map((row) => row.route));
  expect(pages.filter((route) => !listed.has(route.path)).map((route) => `${route.path || "/"} (${route.file})`), "page routes without a row").toEqual([]);
  const known = new Set(pages.map((route) => route.path));
  expect(PAGES.filter((row) => !known.has(row.route)).map((row) => row.route), "rows naming no page route").toEqual([]);
});

test.describe("no serious or critical accessibility violations", () => {
  let ids: Ids;

  test.beforeAll(async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const project = await demoProjectId(context, baseURL!);
    const surveys = (await (await context.get(`/api/projects/${project}/surveys`)).json()) as { surveys: Array<{ id: number }> };
    const finds = (await (await context.get(`/api/projects/${project}/finds`)).json()) as { finds: Array<{ id: number }> };
    const share = await context.post(`/api/projects/${project}/share-links`, { data: { name: "Accessibility check", publicText: "Checked by the accessibility walk." }, headers: { Origin: new URL(baseURL!).origin } });
    expect(share.status()).toBe(201);
    const { token } = (await share.json()) as { token: string };
    await context.dispose();
    // A message in the demo mailbox: a reset link asked for the viewer's account.
    const admin = await playwrightRequest.newContext({ baseURL });
    await admin.post("/forgot-password", { form: { email: DEMO_ACCOUNTS.viewer }, headers: { Origin: new URL(baseURL!).origin } });
    await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
    let messageId = "";
    await expect.poll(async () => {
      messageId = (await (await admin.get("/dev/mail")).text()).match(/href="\/dev\/mail\/([^"]+)"/)?.[1] ?? "";
      return messageId;
    }, { timeout: 20_000 }).not.toBe("");
    await admin.dispose();
    ids = { project, survey: surveys.surveys[0].id, find: finds.finds[0].id, shareToken: token, messageId };
  });

  for (const viewport of VIEWPORTS) for (const row of PAGES) {
    test(`${row.route || "/"} as ${row.as} at ${viewport.width} px`, async ({ browser, baseURL }) => {
      test.skip(Boolean(row.skip), row.skip);
      // axe reads every node: a survey's page with its sounding plot takes half a minute on a busy machine.
      test.setTimeout(180_000);
      const context = await browser.newContext({ viewport });
      if (row.as !== "signed-out") await signInRequest(context.request, baseURL!, DEMO_ACCOUNTS[row.as], DEMO_PASSWORD);
      const page = await context.newPage();
      let discard: (() => Promise<void>) | null = null;
      if (row.route === "projects/:projectId/surveys/imports/:jobId") {
        // An upload of our own, checked and then discarded, so the walk leaves nothing behind.
        await page.goto(`/projects/${ids.project}/surveys/new`);
        await page.getByLabel(/Sounding file/).setInputFiles(join(FIXTURES, "duplicate-rows.csv"));
        await page.getByLabel("Survey kind").selectOption("progress");
        await page.getByLabel("Survey date").fill("2026-12-01");
        await page.getByLabel(/Water-surface elevation/).fill("31.7");
        await page.getByRole("button", { name: "Upload and check" }).click();
        await expect(page).toHaveURL(/\/surveys\/imports\/\d+$/);
        await expect(page.getByRole("heading", { level: 2 })).toBeVisible();
        discard = async () => {
          await page.getByRole("button", { name: "Discard this upload" }).click();
          await expect(page).not.toHaveURL(/\/surveys\/imports\/\d+$/);
        };
      } else {
        const response = await page.goto(row.url(ids));
        expect(response?.status(), row.url(ids)).toBeLessThan(400);
      }
      await page.waitForLoadState("networkidle");
      // One <main> on every page, and an h1 before any other heading.
      await expect(page.locator("main")).toHaveCount(1);
      const levels = await page.locator("h1, h2, h3, h4, h5, h6").evaluateAll((headings) => headings.map((heading) => Number(heading.tagName[1])));
      expect(levels[0], "the first heading is the h1").toBe(1);
      levels.forEach((level, index) => {
        if (index > 0) expect(level - levels[index - 1], `heading ${index + 1} skips a level (${levels.join(", ")})`).toBeLessThanOrEqual(1);
      });
      expect(await seriousViolations(page)).toEqual([]);
      expect(await unmarkedFigureCells(page), "number columns not set as figures").toEqual([]);
      if (discard) await discard();
      await context.close();
    });
  }
});

// The settings page's recompute panel appears only after a figures change on a project with
// surveys, so no page row above shows it: it is checked here while it runs (its progress bar and
// live status) and once done (the summary and the before/after table). The browser tests' server
// holds every recompute for 3 s before it computes (RECOMPUTE_HOLD_MS, db/scripts/test.mjs), so the
// page reads the job back running after the save however fast the machine; from then on, while axe
// reads the running panel, the page's polls are answered "still running", so the check does not race the server.
test("the settings page's recompute panel, running and done, has no serious or critical violations", async ({ page, signIn, baseURL }) => {
  test.setTimeout(180_000);
  const origin = new URL(baseURL!).origin;
  const admin = await playwrightRequest.newContext({ baseURL });
  await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
  const projectId = await createSpringProject(admin, baseURL!, `Recompute panel spring ${Date.now().toString(36)}`);
  const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
  const imported = await admin.post(`/api/projects/${projectId}/surveys`, {
    headers: { Origin: origin },
    multipart: {
      file: { name: baseline.fileName, mimeType: "text/csv", buffer: readFileSync(join(DEMO_DIR, baseline.fileName)) },
      kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    },
  });
  expect(imported.status(), await imported.text()).toBe(201);
  await admin.dispose();

  // Until axe has read the running panel, every poll of the job says it is still running.
  let holding = true;
  await page.route(`**/api/projects/${projectId}/recomputes/*`, async (route) => {
    const response = await route.fetch();
    const job = (await response.json()) as Record<string, unknown>;
    await route.fulfill({ response, json: holding ? { ...job, state: "running", stage: "computing the cells", fraction: 0.42, summary: null, summaryText: null, finishedAt: null } : job });
  });
  await signIn("manager");
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.goto(`/projects/${projectId}/settings`);
  const tolerances = page.getByRole("region", { name: "Targets and tolerances" });
  await tolerances.getByLabel(/Firm-sand tolerance/).fill(String(GRID.toleranceFt * 4));
  await tolerances.getByRole("button", { name: "Save tolerances" }).click();
  const panel = page.getByTestId("recompute-status");
  const panelViolations = async () => {
    const results = await new AxeBuilder({ page }).include('[data-testid="recompute-status"]').analyze();
    return results.violations.filter((violation) => SERIOUS.has(violation.impact ?? "")).flatMap((violation) => violation.nodes.map((node) => `${violation.impact} ${violation.id}: ${violation.help} — ${node.target.join(" ")}`));
  };
  // Held on the server, the job is running when the page reads it back after the save: the running panel is always checked.
  await expect(panel.getByRole("progressbar")).toBeVisible({ timeout: 30_000 });
  await expect(panel.getByRole("heading", { name: "Recomputing every survey's figures" })).toBeVisible();
  expect(await panelViolations(), "the running panel").toEqual([]);
  holding = false;
  await expect(panel.getByRole("heading", { name: "Figures recomputed" })).toBeVisible({ timeout: 90_000 });
  // The before/after table is there whenever a figure moved (a four times wider tolerance moves some cells).
  if (!(await panel.getByTestId("recompute-summary").textContent())?.includes("no figure changed")) await expect(panel.getByRole("table")).toBeVisible();
  expect(await panelViolations(), "the finished panel").toEqual([]);
  // And the whole page with it, as the walk checks every page.
  expect(await seriousViolations(page)).toEqual([]);
});

// The grid preview (the settings page and the setup guide's grid step) and the zones read from a
// file appear only after a step the walk does not take: checked here at both widths, on the demo
// project (nothing is saved: the zones file is only previewed).
test("the grid preview and the zones read from a file have no serious or critical violations", async ({ page, signIn, baseURL }) => {
  test.setTimeout(180_000);
  const context = await playwrightRequest.newContext({ baseURL });
  const projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
  await signIn("manager");
  for (const viewport of VIEWPORTS) {
    await page.setViewportSize(viewport);
    await page.goto(`/projects/${projectId}/setup?step=grid`);
    await expect(page.getByTestId("grid-preview-map")).toHaveAttribute("data-ready", "", { timeout: 30_000 });
    await expect(page.getByTestId("grid-preview-count")).toContainText("The saved grid:");
    expect(await seriousViolations(page), `setup grid step at ${viewport.width} px`).toEqual([]);
    await page.goto(`/projects/${projectId}/settings`);
    const zones = page.getByRole("region", { name: "Zones" });
    await zones.getByLabel(/File of zone outlines/).setInputFiles(join(import.meta.dirname, "..", "fixtures", "project-setup", "yellowmarsh-zones.geojson"));
    await zones.getByRole("button", { name: "Preview the zones" }).click();
    // The lake of the fixture lies far from the demo spring: both zones are refused, each named.
    await expect(zones.getByTestId("zones-file-preview")).toContainText("2 of them refused");
    await expect(page.getByTestId("grid-preview-map")).toHaveAttribute("data-ready", "", { timeout: 30_000 });
    expect(await seriousViolations(page), `settings with the zones file read at ${viewport.width} px`).toEqual([]);
  }
});
