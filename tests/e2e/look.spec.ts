import { request as playwrightRequest, type Locator, type Page } from "@playwright/test";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { labelIndex, type CellsData } from "../../app/components/map/cell-features";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test, uniqueEmail, waitForMail } from "./fixtures";

// One look across the manager's and outreach pages: role labels in mail, the audit log's filter,
// the tab bar, the share page's copy buttons and form, the public page's map, unit labels, chart
// text sizes, dates that never wrap, headers that stay apart, and words in the sans font.

let projectId = 0;

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

async function signedIn(page: Page, baseURL: string, account: keyof typeof DEMO_ACCOUNTS) {
  await signInRequest(page.context().request, baseURL, DEMO_ACCOUNTS[account]);
}

/** Rendered text sizes, in CSS pixels, of every <text> of the SVGs under `root`: font size × the SVG's scale. */
async function renderedTextSizes(root: Locator): Promise<number[]> {
  return root.locator("svg").evaluateAll((svgs) => svgs.flatMap((svg) => {
    const box = (svg as SVGSVGElement).viewBox.baseVal;
    const scale = box && box.width > 0 ? svg.getBoundingClientRect().width / box.width : 1;
    return [...svg.querySelectorAll("text")].map((text) => parseFloat(getComputedStyle(text).fontSize) * scale);
  }));
}

const fontOf = (locator: Locator) => locator.evaluate((element) => getComputedStyle(element).fontFamily);

test("the invitation mail names the role by its label, not its internal name", async ({ page, baseURL }) => {
  const email = uniqueEmail("operator");
  await signedIn(page, baseURL!, "manager");
  await page.goto(`/projects/${projectId}/members`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Role", { exact: true }).selectOption("dewatering");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("region", { name: "Open invitations" }).getByText(email)).toBeVisible();
  const mail = await waitForMail(email);
  expect(mail.text).toContain("on Firmsand as dewatering operator.");
  expect(mail.text).not.toMatch(/as dewatering\./);
  // The open invitation and the audit log say it the same way.
  await expect(page.getByRole("region", { name: "Open invitations" }).getByText("Dewatering operator")).toBeVisible();
  await page.goto(`/projects/${projectId}/audit?action=invite`);
  await expect(page.getByRole("cell", { name: new RegExp(`email: ${email.replace(/[.+]/g, "\\$&")}; role: Dewatering operator`) })).toBeVisible();
});

test("the audit log filters by person, action and dates, as a link, with an empty state", async ({ page, baseURL }) => {
  await signedIn(page, baseURL!, "manager");
  await page.goto(`/projects/${projectId}/audit`);
  await page.getByLabel("Action").selectOption("sign-in");
  await page.getByLabel("Person").selectOption({ label: `Imogen Tallis (${DEMO_ACCOUNTS.manager})` });
  await page.getByRole("button", { name: "Filter" }).click();
  await expect(page).toHaveURL(/\/audit\?person=\d+&action=sign-in(&|$)/);
  const rows = page.locator("tbody tr");
  await expect(rows.first()).toBeVisible();
  // Every row shown is a sign-in of that person.
  expect(new Set(await rows.locator("td:nth-child(3)").allTextContents())).toEqual(new Set(["Sign in"]));
  expect(new Set(await rows.locator("td:nth-child(2)").allTextContents())).toEqual(new Set([`Imogen Tallis <${DEMO_ACCOUNTS.manager}>`]));
  // The filter is a link: opened afresh, the form shows it.
  await page.goto(page.url());
  await expect(page.getByLabel("Action")).toHaveValue("sign-in");
  // Days long before the project: nothing matches, and the page says so with a way back.
  await page.goto(`/projects/${projectId}/audit?from=2001-01-01&to=2001-01-31`);
  await expect(page.getByTestId("audit-empty")).toContainText("No entries match this filter.");
  await page.getByRole("link", { name: "Show the whole log" }).click();
  await expect(page).toHaveURL(new RegExp(`/projects/${projectId}/audit$`));
  await expect(rows.first()).toBeVisible();
  // Dates the wrong way round are named and swapped; a nonsense value is named and ignored.
  await page.goto(`/projects/${projectId}/audit?from=2099-01-02&to=2001-01-01&action=no-such-action`);
  await expect(page.getByRole("alert")).toContainText("The from date (2099-01-02) is after the to date (2001-01-01)");
  await expect(page.getByRole("alert")).toContainText("Choose an action from the list.");
  // Today (in any time zone near the project's) holds the sign-in this test made.
  const today = new Date().toISOString().slice(0, 10);
  const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  await page.goto(`/projects/${projectId}/audit?action=sign-in&from=${yesterday}&to=${today}`);
  await expect(rows.first()).toBeVisible();
});

test("the tab bar offers Quantities and Share by role and marks the current tab on every project page", async ({ browser, baseURL }) => {
  const tabs = (page: Page) => page.getByRole("navigation", { name: "Project" });
  const manager = await (await browser.newContext()).newPage();
  await signedIn(manager, baseURL!, "manager");
  for (const [path, tab] of [["", "Overview"], ["/quantities", "Quantities"], ["/share", "Share"], ["/surveys/new", "Surveys"], ["/plans", "Dive plans"], ["/plans/2026-11-12", "Dive plans"], ["/holds", "Finds"], ["/water-quality/compliance", "Water quality"], ["/audit", "Audit log"]] as const) {
    await manager.goto(`/projects/${projectId}${path}`);
    const current = tabs(manager).locator('[aria-current="page"]');
    await expect(current, path).toHaveCount(1);
    await expect(current, path).toHaveText(tab);
  }
  await manager.context().close();
  // Outreach shares but does not read quantities; a viewer reads quantities but does not share.
  const outreach = await (await browser.newContext()).newPage();
  await signedIn(outreach, baseURL!, "outreach");
  await outreach.goto(`/projects/${projectId}`);
  await expect(tabs(outreach).getByRole("link", { name: "Share" })).toBeVisible();
  await expect(tabs(outreach).getByRole("link", { name: "Quantities" })).toHaveCount(0);
  await outreach.context().close();
  const viewer = await (await browser.newContext()).newPage();
  await signedIn(viewer, baseURL!, "viewer");
  await viewer.goto(`/projects/${projectId}`);
  await expect(tabs(viewer).getByRole("link", { name: "Quantities" })).toBeVisible();
  await expect(tabs(viewer).getByRole("link", { name: "Share" })).toHaveCount(0);
  await viewer.context().close();
});

test("the share page shows the whole embed snippet with a working Copy button and empties the form", async ({ browser, baseURL }) => {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 }, permissions: ["clipboard-read", "clipboard-write"] });
  const page = await context.newPage();
  await signedIn(page, baseURL!, "outreach");
  await page.goto(`/projects/${projectId}/share`);
  const form = page.getByTestId("create-link-form");
  await form.getByLabel("Link name").fill("Library kiosk");
  await form.getByLabel("Public text").fill("Progress of the spring run work.");
  await form.getByRole("button", { name: "Create link" }).click();
  const snippet = page.getByTestId("embed-snippet");
  await expect(snippet).toContainText("</iframe>");
  // Wrapped, not cut off: nothing of it is hidden sideways, even on a phone.
  expect(await snippet.evaluate((element) => element.scrollWidth <= element.clientWidth)).toBe(true);
  const url = await page.getByTestId("share-url").textContent();
  await page.getByRole("button", { name: "Copy the embed code" }).click();
  await expect(page.getByRole("button", { name: "Copy the embed code: copied" })).toHaveText(/Copied/);
  const copied = await page.evaluate(() => navigator.clipboard.readText());
  expect(copied).toBe(await snippet.textContent());
  expect(copied).toContain(`src="${url}"`);
  // The create form is empty again, ready for the next link.
  await expect(form.getByLabel("Link name")).toHaveValue("");
  await expect(form.getByLabel("Public text")).toHaveValue("");
  await context.close();
});

test("the public page says 'Last updated' once and shows a north arrow and a scale bar", async ({ browser, baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  await signInRequest(context, baseURL!, DEMO_ACCOUNTS.outreach);
  const created = await context.post(`/api/projects/${projectId}/share-links`, { data: { name: "Public look", publicText: "" }, headers: { Origin: new URL(baseURL!).origin } });
  const { url } = (await created.json()) as { url: string };
  await context.dispose();
  for (const viewport of [{ width: 1440, height: 900 }, { width: 390, height: 844 }]) {
    const visitor = await browser.newContext({ viewport });
    const page = await visitor.newPage();
    await page.goto(new URL(url).pathname);
    await expect(page.getByText(/last updated/i)).toHaveCount(1);
    await expect(page.getByTestId("progress-map")).toBeVisible();
    await expect(page.getByRole("img", { name: /North arrow/ })).toBeVisible();
    const scale = page.getByTestId("progress-map-scale");
    await expect(scale).toContainText(/^\d[\d,]* (ft|mi)/);
    // The bar is a round length and no wider than a quarter of the map.
    const [bar, map] = await Promise.all([scale.locator("span").first().boundingBox(), page.getByTestId("progress-map").boundingBox()]);
    expect(bar!.width).toBeGreaterThan(10);
    expect(bar!.width).toBeLessThanOrEqual(map!.width / 4 + 1);
    await visitor.close();
  }
});

test("units carry one label each and every figure has its unit", async ({ page, baseURL }) => {
  await signedIn(page, baseURL!, "manager");
  await page.goto(`/projects/${projectId}`);
  await expect(page.getByTestId("cross-check").locator("xpath=..")).toContainText(/\d+ sections \d+(\.\d+)? ftUS apart/);
  const surveys = (await (await page.context().request.get(`/api/projects/${projectId}/surveys`)).json()) as { surveys: Array<{ id: number }> };
  await page.goto(`/projects/${projectId}/surveys/${surveys.surveys[0].id}`);
  await expect(page.getByText(/depths in US survey feet/)).toBeVisible();
  // No raw unit name anywhere a person reads.
  for (const path of ["", `/surveys/${surveys.surveys[0].id}`, "/quantities", "/settings"]) {
    await page.goto(`/projects/${projectId}${path}`);
    expect(await page.locator("main").innerText(), path).not.toMatch(/\bus-ft\b/);
  }
});

test("chart text is at least 12 px and charts fit their panels, on a desktop and a phone", async ({ browser, baseURL }) => {
  for (const viewport of [{ width: 1440, height: 900 }, { width: 390, height: 844 }]) {
    const context = await browser.newContext({ viewport });
    const page = await context.newPage();
    await signedIn(page, baseURL!, "manager");
    await page.goto(`/projects/${projectId}`);
    const cumulative = page.getByTestId("cumulative-chart");
    await expect(cumulative).toBeVisible();
    const charts = page.locator("section").filter({ has: page.locator("[data-testid$='-chart']") });
    // Drawn at the measured width once the page's scripts run.
    await expect.poll(async () => Math.min(...(await renderedTextSizes(charts))), { message: `smallest chart text at ${viewport.width} px` }).toBeGreaterThanOrEqual(11.99);
    expect((await renderedTextSizes(charts)).length).toBeGreaterThan(10);
    // Sized to its panel: the chart spans the panel's content width, give or take a pixel.
    const [chart, panel] = await Promise.all([cumulative.boundingBox(), cumulative.locator("xpath=../..").evaluate((element) => {
      const style = getComputedStyle(element);
      return element.getBoundingClientRect().width - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight);
    })]);
    expect(Math.abs(chart!.width - panel)).toBeLessThanOrEqual(2);
    // …and the panel fits the window: nothing pushed past the right edge.
    expect(chart!.x + chart!.width, `chart's right edge at ${viewport.width} px`).toBeLessThanOrEqual(viewport.width);
    await context.close();
  }
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const page = await context.newPage();
  await signedIn(page, baseURL!, "manager");
  await page.goto(`/projects/${projectId}/water-quality/compliance`);
  const turbidity = page.locator("[data-testid^='turbidity-chart-']");
  if ((await turbidity.count()) > 0) await expect.poll(async () => Math.min(...(await renderedTextSizes(turbidity.locator("xpath=.."))))).toBeGreaterThanOrEqual(11.99);
  await context.close();
});

test("the site header fits a phone: the admin's and a member's links fold into a menu and nothing wraps", async ({ browser, baseURL }) => {
  const shots = join(process.cwd(), "test-results", "look");
  mkdirSync(shots, { recursive: true });
  for (const account of ["admin", "viewer"] as const) {
    for (const viewport of [{ width: 390, height: 844 }, { width: 1440, height: 900 }]) {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      await signedIn(page, baseURL!, account);
      await page.goto("/projects");
      const header = page.locator("body > header");
      const menu = page.getByTestId("site-menu");
      const signOut = page.getByRole("button", { name: "Sign out", exact: true });
      // One row: the header is no taller than its tallest control plus its padding.
      expect((await header.boundingBox())!.height, `header height, ${account} at ${viewport.width}`).toBeLessThanOrEqual(72);
      if (viewport.width < 640) {
        await expect(signOut).toBeHidden();
        await menu.locator("summary").click();
        const panel = menu.getByRole("navigation", { name: "Account" });
        await expect(panel.getByRole("link", { name: "Projects" })).toBeVisible();
        await expect(panel.getByRole("link", { name: "Accounts" })).toHaveCount(account === "admin" ? 1 : 0);
        await expect(panel.getByRole("link", { name: "Your account" })).toBeVisible();
        await expect(signOut).toBeVisible();
        // "Sign out" on one line, and the open menu inside the window.
        const button = (await signOut.boundingBox())!;
        const lineHeight = await signOut.evaluate((element) => parseFloat(getComputedStyle(element).lineHeight));
        expect(button.height, "Sign out on one line").toBeLessThan(2 * lineHeight);
        const box = (await panel.boundingBox())!;
        expect(box.x).toBeGreaterThanOrEqual(0);
        expect(box.x + box.width).toBeLessThanOrEqual(viewport.width);
        await page.screenshot({ path: join(shots, `header-${account}-${viewport.width}-open.png`) });
        // Escape folds it and gives the focus back to its button.
        await page.keyboard.press("Escape");
        await expect(signOut).toBeHidden();
        await expect(menu.locator("summary")).toBeFocused();
        // Following a link folds it on the next page.
        await menu.locator("summary").click();
        await panel.getByRole("link", { name: "Your account" }).click();
        await expect(page).toHaveURL(/\/account$/);
        await expect(signOut).toBeHidden();
      } else {
        await expect(menu).toBeHidden();
        const nav = page.getByRole("navigation", { name: "Account" });
        await expect(nav.getByRole("link", { name: "Accounts" })).toHaveCount(account === "admin" ? 1 : 0);
        await expect(signOut).toBeVisible();
        const lineHeight = await signOut.evaluate((element) => parseFloat(getComputedStyle(element).lineHeight));
        expect((await signOut.boundingBox())!.height, "Sign out on one line").toBeLessThan(2 * lineHeight);
      }
      expect(await page.evaluate(() => document.documentElement.scrollWidth), `page width, ${account} at ${viewport.width}`).toBeLessThanOrEqual(viewport.width);
      await page.screenshot({ path: join(shots, `header-${account}-${viewport.width}.png`) });
      await context.close();
    }
  }
});

/** Every chart's SVG: named "<what>-chart", or "turbidity-chart-<station>" (one per station). */
const CHART_SVGS = "svg[data-testid$='-chart'], svg[data-testid^='turbidity-chart-']";

/** Rendered sizes (CSS px) of the text of every chart on the page. */
async function chartTextSizes(page: Page): Promise<number[]> {
  return page.locator(CHART_SVGS).locator("text").evaluateAll((texts) => texts.map((text) => {
    const svg = (text as SVGTextElement).ownerSVGElement!;
    const box = svg.viewBox.baseVal;
    const scale = box && box.width > 0 ? svg.getBoundingClientRect().width / box.width : 1;
    return parseFloat(getComputedStyle(text).fontSize) * scale;
  }));
}

/** Every chart on the page lies inside its panel and every label inside its chart (nothing cut off, nothing scrolls sideways). */
async function chartsOverflowing(page: Page): Promise<string[]> {
  return page.locator(CHART_SVGS).evaluateAll((svgs) => svgs.flatMap((svg) => {
    const problems: string[] = [];
    const name = svg.getAttribute("data-testid");
    const box = svg.getBoundingClientRect();
    const panel = svg.parentElement!;
    if (panel.scrollWidth > panel.clientWidth + 1) problems.push(`${name}: its panel scrolls (${panel.scrollWidth} > ${panel.clientWidth} px)`);
    if (box.right > document.documentElement.clientWidth + 1) problems.push(`${name}: ends at ${box.right} px, past the window`);
    for (const text of svg.querySelectorAll("text")) {
      const label = text.getBoundingClientRect();
      if (label.width === 0) continue;
      if (label.left < box.left - 1 || label.right > box.right + 1 || label.top < box.top - 1 || label.bottom > box.bottom + 1) problems.push(`${name}: "${text.textContent}" cut off at the chart's edge`);
    }
    return problems;
  }));
}

test("on a phone the charts fit their panels: production as rows, daily bars without scrolling, names in a key", async ({ browser, baseURL }) => {
  const shots = join(process.cwd(), "test-results", "look");
  mkdirSync(shots, { recursive: true });
  for (const viewport of [{ width: 390, height: 844 }, { width: 1440, height: 900 }]) {
    const context = await browser.newContext({ viewport });
    const page = await context.newPage();
    await signedIn(page, baseURL!, "manager");
    await page.goto(`/projects/${projectId}`);
    const production = page.getByTestId("production-chart");
    await expect(production).toBeVisible();
    // Drawn at the measured width once the page's scripts run: rows on a phone, columns on a desktop.
    await expect(production).toHaveAttribute("data-layout", viewport.width < 640 ? "rows" : "columns");
    await expect.poll(() => chartsOverflowing(page), { message: `overview charts at ${viewport.width} px` }).toEqual([]);
    expect(Math.min(...(await chartTextSizes(page)))).toBeGreaterThanOrEqual(11.99);
    // No chart in a sideways-scrolling region any more.
    await expect(page.getByRole("region", { name: /chart.*scrollable/i })).toHaveCount(0);
    await production.scrollIntoViewIfNeeded();
    await production.screenshot({ path: join(shots, `production-${viewport.width}.png`) });
    await page.getByTestId("cumulative-chart").screenshot({ path: join(shots, `cumulative-${viewport.width}.png`) });
    await page.goto(`/projects/${projectId}/dewatering`);
    await expect(page.locator("svg[data-testid$='-chart']").first()).toBeVisible();
    await expect.poll(() => chartsOverflowing(page), { message: `dewatering charts at ${viewport.width} px` }).toEqual([]);
    expect(Math.min(...(await chartTextSizes(page)))).toBeGreaterThanOrEqual(11.99);
    await page.screenshot({ path: join(shots, `dewatering-${viewport.width}.png`), fullPage: true });
    await context.close();
  }
});

/** Charts narrower or wider than their panel's content box (drawn at a stale or fixed width), by more than 2 px. */
async function chartsNotSizedToPanels(page: Page): Promise<string[]> {
  return page.locator(CHART_SVGS).evaluateAll((svgs) => svgs.flatMap((svg) => {
    const panel = svg.parentElement!;
    const style = getComputedStyle(panel);
    const room = panel.clientWidth - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight);
    const width = svg.getBoundingClientRect().width;
    return Math.abs(width - room) > 2 ? [`${svg.getAttribute("data-testid")}: ${width.toFixed(0)} px in a panel of ${room.toFixed(0)} px`] : [];
  }));
}

/** Every chart on the page legible (text ≥ 12 px), inside its panel, sized to it, nothing cut off; a screenshot of each. */
async function expectChartsFit(page: Page, where: string, shots: string, name: string, options: { text?: boolean } = {}) {
  await expect.poll(() => chartsOverflowing(page), { message: `${where}: charts cut off or scrolling` }).toEqual([]);
  await expect.poll(() => chartsNotSizedToPanels(page), { message: `${where}: charts sized to their panels` }).toEqual([]);
  const sizes = await chartTextSizes(page);
  // A sounding plot with every point inside its frame has no text at all.
  if (options.text !== false) expect(sizes.length, `${where}: chart text`).toBeGreaterThan(0);
  expect(Math.min(Infinity, ...sizes), `${where}: smallest chart text`).toBeGreaterThanOrEqual(11.99);
  const charts = page.locator(CHART_SVGS);
  for (let index = 0; index < (await charts.count()); index++) {
    await charts.nth(index).scrollIntoViewIfNeeded();
    await charts.nth(index).screenshot({ path: join(shots, `${name}-${index}.png`) });
  }
}

test("the turbidity charts, the sounding plots (import check, survey page) and the map's cell history are legible and fit their panels, on a desktop and a phone", async ({ browser, baseURL }) => {
  test.setTimeout(120_000);
  const shots = join(process.cwd(), "test-results", "look");
  mkdirSync(shots, { recursive: true });
  for (const viewport of [{ width: 1440, height: 900 }, { width: 390, height: 844 }]) {
    const context = await browser.newContext({ viewport });
    const page = await context.newPage();
    // Water quality: one turbidity chart per station with readings.
    await signedIn(page, baseURL!, "resource-monitor");
    await page.goto(`/projects/${projectId}/water-quality/compliance`);
    await expect(page.locator("svg[data-testid^='turbidity-chart-']").first()).toBeVisible();
    await expectChartsFit(page, `turbidity at ${viewport.width} px`, shots, `turbidity-${viewport.width}`);

    // The map: the cell inspector's history, in the side panel (a bottom sheet on a phone).
    const cellsResponse = page.waitForResponse((response) => response.url().endsWith(`/api/projects/${projectId}/cells`));
    await page.goto(`/projects/${projectId}/map`);
    const labels = [...labelIndex((await (await cellsResponse).json()) as CellsData).keys()];
    const label = labels[Math.floor(labels.length / 2)];
    await expect(page.getByTestId("coverage-map")).toHaveAttribute("data-cells-drawn", /\d+/, { timeout: 20_000 });
    await page.getByLabel("Search cell label").fill(label);
    await page.getByRole("button", { name: "Find" }).click();
    if (viewport.width < 640) await page.getByRole("button", { name: "Show panel" }).click();
    await expect(page.getByRole("region", { name: `Cell ${label}` }).getByTestId("cell-history-chart")).toBeVisible();
    await expectChartsFit(page, `cell history at ${viewport.width} px`, shots, `cell-history-${viewport.width}`);

    // The import check: a file with one sounding far off, drawn on the frame's edge with its count; then discarded.
    await signedIn(page, baseURL!, "surveyor");
    await page.goto(`/projects/${projectId}/surveys`);
    await page.getByRole("link", { name: "Upload a survey" }).click();
    await page.getByLabel("Sounding file (CSV, up to 200 MB)").setInputFiles(join(import.meta.dirname, "..", "fixtures", "import", "one-far-off-point.csv"));
    await page.getByLabel("Survey kind").selectOption("baseline");
    await page.getByLabel("Survey date").fill("2026-09-08");
    await page.getByLabel(/Water-surface elevation/).fill("32.4");
    await page.getByRole("button", { name: "Upload and check" }).click();
    await expect(page.getByTestId("sounding-plot-chart").locator('[data-edge="east"]')).toHaveText("1 beyond ▶");
    await expectChartsFit(page, `sounding plot at ${viewport.width} px`, shots, `sounding-plot-${viewport.width}`);
    await page.getByRole("button", { name: "Discard this upload" }).click();
    await expect(page.getByRole("heading", { name: "Surveys" })).toBeVisible();
    // A stored survey's page draws the same plot.
    const surveys = (await (await page.context().request.get(`/api/projects/${projectId}/surveys`)).json()) as { surveys: Array<{ id: number }> };
    await page.goto(`/projects/${projectId}/surveys/${surveys.surveys[0].id}`);
    await expect(page.getByTestId("sounding-plot-chart")).toBeVisible();
    await expectChartsFit(page, `survey's sounding plot at ${viewport.width} px`, shots, `survey-plot-${viewport.width}`, { text: false });

    // The dewatering page's daily bars: none overlapping the next.
    await signedIn(page, baseURL!, "manager");
    await page.goto(`/projects/${projectId}/dewatering`);
    const rects = await page.getByTestId("dry-solids-chart").locator("rect").evaluateAll((bars) => bars.map((bar) => bar.getBoundingClientRect()).map((box) => ({ left: box.left, right: box.right })));
    expect(rects.length).toBeGreaterThan(0);
    for (let index = 1; index < rects.length; index++) expect(rects[index].left, `bar ${index} at ${viewport.width} px`).toBeGreaterThanOrEqual(rects[index - 1].right);
    await context.close();
  }
});

test("dates never wrap and report headers stay apart", async ({ browser, baseURL }) => {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const page = await context.newPage();
  await signedIn(page, baseURL!, "manager");
  for (const path of ["", "/quantities/report"]) {
    await page.goto(`/projects/${projectId}${path}`);
    const dates = page.locator("table time");
    await expect(dates.first()).toBeVisible();
    // One line each: as tall as the line height, never two.
    const heights = await dates.evaluateAll((times) => times.map((time) => {
      const style = getComputedStyle(time);
      const line = parseFloat(style.lineHeight) || parseFloat(style.fontSize) * 1.2;
      return time.getBoundingClientRect().height / line;
    }));
    expect(Math.max(...heights), path).toBeLessThan(1.5);
  }
  // The report's headers: each starts after the one before it ends.
  const headers = await page.getByRole("table", { name: "Totals per zone" }).locator("thead th").evaluateAll((cells) => cells.map((cell) => {
    const range = document.createRange();
    range.selectNodeContents(cell);
    const text = range.getBoundingClientRect();
    return { left: text.left, right: text.right };
  }));
  for (let index = 1; index < headers.length; index++) expect(headers[index].left, `header ${index + 1}`).toBeGreaterThanOrEqual(headers[index - 1].right + 4);
  await context.close();
});

test("names and labels are set in the sans, figures in the mono", async ({ page, baseURL }) => {
  await signedIn(page, baseURL!, "manager");
  await page.goto(`/projects/${projectId}`);
  // A zone's name in a plain table cell (the solids table) and its figures beside it.
  const name = page.getByRole("cell", { name: "Vent basin", exact: true }).first();
  expect(await fontOf(name)).not.toContain("Roboto Mono");
  expect(await fontOf(name.locator("xpath=following-sibling::td[1]"))).toContain("Roboto Mono");
  expect(await fontOf(page.getByTestId("zone-table").locator('tr[data-zone="Vent basin"] td .figures').first())).toContain("Roboto Mono");
  expect(await fontOf(page.getByRole("heading", { name: "Progress by zone" }))).not.toContain("Roboto Mono");
  await page.goto(`/projects/${projectId}/audit`);
  expect(await fontOf(page.locator("tbody tr").first().locator("td").nth(1))).not.toContain("Roboto Mono"); // who: a name
  expect(await fontOf(page.locator("tbody tr").first().locator("td").first())).toContain("Roboto Mono"); // when: a figure
});
