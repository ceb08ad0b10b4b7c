import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { request as playwrightRequest } from "@playwright/test";
import sharp from "sharp";
import { dayNumber, isoDateOf } from "../../shared/progress/calendar-days";
import { DEMO_ACCOUNTS, createSpringProject, demoProjectId, expect, signInRequest, test } from "./fixtures";

// The Dewatering section on the seeded demo: the operator logs a shift on a phone and sees the
// feed rate at once, registers a tube and fills it, enters a haul ticket; the manager reads the
// reconciliation and the nutrients removed on the overview; a viewer reads and cannot write.

let projectId = 0;
const run = Date.now().toString(36);

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

test("the dewatering operator logs a shift on a phone and sees the feed rate as they type", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn("dewatering");
  await page.goto(`/projects/${projectId}/dewatering`);
  await expect(page.getByTestId("dewatering-caution")).toContainText("safety data sheet");
  const form = page.getByRole("form", { name: "Log a shift" });
  await form.getByLabel("Date").fill("2026-11-19");
  await form.getByLabel("Slurry flow").fill("20");
  await form.getByLabel("Flow unit").selectOption("m3/h");
  await form.getByLabel("Solids by weight (%)").fill("4");
  await form.getByLabel("Product").fill("Cationic PAM emulsion CE-412");
  await form.getByLabel("Stock concentration (%)").fill("0.5");
  await form.getByLabel("Dose (mg/L)").fill("5");
  // published: 20 m³/h at 5 mg/L with a 0.5 % stock → 20 L/h of stock = 5.3 US gal/h (NIST gallon) on this feet project
  await expect(page.getByTestId("stock-feed-rate")).toHaveText(/^5\.3 gal\/h$/);
  await expect(form.getByText("slurry flow (m³/h) × dose (mg/L) ÷ stock concentration")).toBeVisible();
  // No wider than the phone: the form fits its screen.
  expect(await page.evaluate(() => document.querySelector('form[aria-label="Log a shift"]')!.getBoundingClientRect().right)).toBeLessThanOrEqual(390);
  await form.getByRole("button", { name: "Log the shift" }).click();
  await expect(page.getByRole("status")).toContainText("Logged the shift of 2026-11-19");
  await expect(page.getByRole("cell", { name: "2026-11-19" })).toBeVisible();
});

test("the dewatering operator records a jar test with a photo of the jars on a phone", async ({ page, signIn }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn("dewatering");
  await page.goto(`/projects/${projectId}/dewatering/jar-tests`);
  await expect(page.getByTestId("dewatering-caution")).toContainText("safety data sheet and the site's safety plan");
  const form = page.getByRole("form", { name: "Record a jar test" });
  const date = "2026-11-20";
  await form.getByLabel("Date").fill(date);
  await form.getByLabel("Product").fill(`CE-412 ${run}`);
  await form.getByLabel("Raw sample turbidity (NTU)").fill("400");
  // The bench stock starts at 0.1 % and the jars at 1,000 mL.
  const jars = [["2", "60", "hazy"], ["4", "12", "clear"], ["6", "12", "clear"]];
  for (const [index, [dose, ntu, clarity]] of jars.entries()) {
    const jar = form.getByTestId(`jar-${index + 1}`);
    await jar.getByLabel("Dose (mg/L)").fill(dose);
    await jar.getByLabel("NTU").fill(ntu);
    await jar.getByLabel("Clarity").selectOption(clarity);
  }
  // published: 1 mL of a 0.1 % stock in a 1-litre jar is 1 mg/L, so 4 mg/L takes 4 mL; computed: (400 − 12) ÷ 400 = 97 %
  await expect(form.getByTestId("jar-2-stock")).toHaveText("add 4 mL of stock · 97 % of the raw turbidity removed");
  await expect(form.getByTestId("clearest-dose")).toContainText("4 mg/L");
  await form.getByRole("button", { name: "Use it" }).click();
  await expect(form.getByLabel("Dose chosen (mg/L)")).toHaveValue("4");
  const photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: "#9b8f6a" } }).jpeg().toBuffer();
  await form.getByLabel("Photo of the jars").setInputFiles({ name: "jars.jpg", mimeType: "image/jpeg", buffer: photo });
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  await form.getByRole("button", { name: "Record the jar test" }).click();
  await expect(page.getByRole("status")).toContainText(`Recorded the jar test of ${date}: 3 dosed jars, dose chosen 4 mg/L, with its photo.`);
  const card = page.getByRole("article").filter({ hasText: `CE-412 ${run}` });
  await expect(card.getByText("Dose chosen: 4 mg/L")).toBeVisible();
  const thumbnail = card.getByRole("img", { name: /jars\.jpg/ });
  await expect(thumbnail).toBeVisible();
  await expect.poll(() => thumbnail.evaluate((image: HTMLImageElement) => image.naturalWidth)).toBe(320);
});

test("the dewatering operator registers a tube, records a fill, and enters a haul ticket", async ({ page, signIn }) => {
  await signIn("dewatering");
  await page.goto(`/projects/${projectId}/dewatering/tubes`);
  const register = page.getByRole("region", { name: "Register a tube" });
  const name = `E2E-${run}`;
  await register.getByLabel("Name").fill(name);
  await register.getByLabel(/Circumference/).fill("30");
  await register.getByLabel(/Length/).fill("100");
  await register.getByLabel(/Capacity/).fill("1");
  await register.getByRole("button", { name: "Register the tube" }).click();
  await expect(page.getByRole("status")).toContainText(`Registered tube ${name}`);
  // computed: D = C/π = 30/π = 9.55
  await expect(page.getByTestId(`tube-${name}`)).toContainText("9.55 ftUS");
  const fill = page.getByRole("region", { name: "Record a fill" });
  await fill.getByLabel("Tube").selectOption({ label: name });
  await fill.getByLabel(/Estimated dry solids/).fill("95");
  await fill.getByRole("button", { name: "Record the fill" }).click();
  // computed: 95 of 1 × 100 short tons is 95 %, past the 90 % flag
  await expect(page.getByRole("status")).toContainText(`Recorded a fill of tube ${name}: now 95 %`);
  await expect(page.getByTestId(`tube-${name}`).getByTestId("near-capacity")).toBeVisible();

  await page.goto(`/projects/${projectId}/dewatering/hauls`);
  const ticket = page.getByRole("region", { name: "Enter a haul ticket" });
  await ticket.getByLabel("Ticket number").fill(`T${run}`);
  await ticket.getByLabel("Truck").fill("Truck 9");
  await ticket.getByLabel("Load", { exact: true }).fill("20");
  await ticket.getByLabel("Cake solids (%)").fill("25");
  const scan = await sharp({ create: { width: 600, height: 900, channels: 3, background: "#f2efe6" } }).jpeg().toBuffer();
  await ticket.getByLabel("Photo of the ticket").setInputFiles({ name: `ticket-${run}.jpg`, mimeType: "image/jpeg", buffer: scan });
  await ticket.getByRole("button", { name: "Record the ticket" }).click();
  // computed: 20 wet short tons × 25 %
  await expect(page.getByRole("status")).toContainText(`Recorded ticket T${run}: 5 dry short tons, with its photo.`);
  const shown = page.getByTestId(`ticket-photos-T${run}`).getByRole("img", { name: `Ticket T${run}: ticket-${run}.jpg` });
  await expect(shown).toBeVisible();
  // The thumbnail (loaded lazily): 320 px on its longer side.
  await expect.poll(() => shown.evaluate((image: HTMLImageElement) => image.naturalHeight)).toBe(320);
});

test("the manager sees the reconciliation panel with the nutrients removed on the overview", async ({ page, signIn }) => {
  await signIn("manager");
  await page.goto(`/projects/${projectId}`);
  const panel = page.getByRole("region", { name: "Solids and nutrients removed" });
  await expect(panel).toBeVisible();
  await expect(page.getByTestId("nutrients-removed")).toContainText(/[\d,]+ lb of phosphorus and [\d,]+ lb of nitrogen removed/);
  const figures = await (await page.request.get(`/api/projects/${projectId}/reconciliation`)).json();
  await expect(page.getByTestId("nutrients-removed")).toContainText(`${Math.round(figures.project.phosphorusRemoved.value).toLocaleString("en-US")} lb of phosphorus`);
  for (const zone of ["Vent basin", "Upper run", "Lower run"]) await expect(panel.getByRole("cell", { name: zone })).toBeVisible();
  await expect(panel.getByText("Pumped (shift logs)")).toBeVisible();
  // Pumped and hauled by zone are attributed, with an Unattributed row; the rows add up to the Project row, which is the API's figure.
  await expect(panel.getByTestId("reconciliation-attribution")).toContainText("Attributed, not measured");
  await expect(panel.getByTestId("reconciliation-unattributed")).toContainText("Unattributed");
  const oneDecimal = (value: number) => value.toLocaleString("en-US", { minimumFractionDigits: 0, maximumFractionDigits: 1 });
  await expect(panel.getByRole("columnheader", { name: /^Pumped.*dry short tons$/ })).toBeVisible();
  await expect(panel.getByTestId("reconciliation-total")).toContainText(oneDecimal(figures.project.dryMassPumped.value));
  const rows = [...figures.zones, figures.unattributed] as Array<{ dryMassPumped: { value: number }; dryMassHauled: { value: number } }>;
  expect(rows.reduce((sum, row) => sum + row.dryMassPumped.value, 0)).toBeCloseTo(figures.project.dryMassPumped.value, 6);
  expect(rows.reduce((sum, row) => sum + row.dryMassHauled.value, 0)).toBeCloseTo(figures.project.dryMassHauled.value, 6);
});

test("a viewer reads the dewatering records and cannot write them", async ({ page, signIn }) => {
  await signIn("viewer");
  await page.goto(`/projects/${projectId}/dewatering`);
  await expect(page.getByRole("heading", { name: "Shifts" })).toBeVisible();
  await expect(page.getByRole("form", { name: "Log a shift" })).toHaveCount(0);
  await page.goto(`/projects/${projectId}/dewatering/tubes`);
  await expect(page.getByRole("heading", { name: "Tube register" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Register the tube" })).toHaveCount(0);
  await page.goto(`/projects/${projectId}/dewatering/jar-tests`);
  await expect(page.getByRole("heading", { name: "Jar tests", exact: true })).toBeVisible();
  await expect(page.getByRole("form", { name: "Record a jar test" })).toHaveCount(0);
  const refused = await page.request.post(`/api/projects/${projectId}/dewatering/shifts`, { data: { date: "2026-11-19" }, headers: { Origin: new URL(page.url()).origin } });
  expect(refused.status()).toBe(403);
});

test("the dewatering charts draw the logged days and end where the reconciliation does", async ({ page, signIn }) => {
  await signIn("manager");
  await page.goto(`/projects/${projectId}/dewatering`);
  const shifts: Array<{ date: string; computed: { drySolids: unknown } }> = await (await page.request.get(`/api/projects/${projectId}/dewatering/shifts`)).json().then((body) => body.shifts ?? body);
  const daysWithSolids = new Set(shifts.filter((shift) => shift.computed.drySolids !== null).map((shift) => shift.date));
  await expect(page.getByTestId("dry-solids-chart").locator("rect")).toHaveCount(daysWithSolids.size);
  await expect(page.getByTestId("polymer-per-ton-chart")).toBeVisible();
  // The surveyed line's last dot says the same dry mass as the reconciliation (one rule for both).
  const figures = await (await page.request.get(`/api/projects/${projectId}/reconciliation`)).json();
  const surveyed = page.getByTestId("cumulative-solids-chart").locator('[data-series="Surveyed"] circle title').last();
  await expect(surveyed).toHaveText(new RegExp(`: ${Math.round(figures.project.dryMassFromSurveys.value).toLocaleString("en-US")} dry short tons$`));
  const pumped = page.getByTestId("cumulative-solids-chart").locator('[data-series="Pumped"] circle title').last();
  await expect(pumped).toHaveText(new RegExp(`: ${Math.round(figures.project.dryMassPumped.value).toLocaleString("en-US")} dry short tons$`));
});

test("a 400-day shift record is drawn by week on a phone and a desktop: bars apart, the caption says so, the totals kept", async ({ browser, baseURL }) => {
  test.setTimeout(240_000);
  const origin = new URL(baseURL!).origin;
  // A project of its own (the demo's record is short), set up by the site admin with the demo spring's outline.
  const admin = await playwrightRequest.newContext({ baseURL });
  await signInRequest(admin, baseURL!, DEMO_ACCOUNTS.admin);
  const longProject = await createSpringProject(admin, baseURL!, `Long dewatering record ${run}`);
  await admin.dispose();
  // One shift on most of 400 days (every fifth day none), its flow and solids varying with the day.
  const manager = await playwrightRequest.newContext({ baseURL });
  await signInRequest(manager, baseURL!, DEMO_ACCOUNTS.manager);
  const first = dayNumber("2025-10-28");
  const days = Array.from({ length: 400 }, (_, day) => day).filter((day) => day % 5 !== 2);
  for (let start = 0; start < days.length; start += 8) {
    await Promise.all(days.slice(start, start + 8).map(async (day) => {
      const answer = await manager.post(`/api/projects/${longProject}/dewatering/shifts`, {
        headers: { Origin: origin },
        data: {
          date: isoDateOf(first + day), start: "07:00", end: "15:00", slurryFlow: { value: 300 + (day % 7) * 20, unit: "gpm" }, solidsByWeight: 0.04 + (day % 3) * 0.01,
          polymer: { product: "Cationic emulsion", doseMgPerL: 8 + (day % 4), stockPercent: 0.5 },
        },
      });
      expect(answer.status(), await answer.text()).toBe(201);
    }));
  }
  const shifts = (await (await manager.get(`/api/projects/${longProject}/dewatering/shifts`)).json()) as { shifts: Array<{ computed: { drySolids: { value: number } | null } }> };
  const pumped = shifts.shifts.reduce((sum, shift) => sum + (shift.computed.drySolids?.value ?? 0), 0);
  expect(shifts.shifts).toHaveLength(days.length);
  await manager.dispose();

  const shots = join(process.cwd(), "test-results", "look");
  mkdirSync(shots, { recursive: true });
  for (const viewport of [{ width: 390, height: 844 }, { width: 1440, height: 900 }]) {
    const context = await browser.newContext({ viewport });
    const page = await context.newPage();
    await signInRequest(page.context().request, baseURL!, DEMO_ACCOUNTS.manager);
    await page.goto(`/projects/${longProject}/dewatering`);
    const chart = page.getByTestId("dry-solids-chart");
    // Drawn at the measured width once scripts run: too narrow for a bar a day, so a bar a week.
    await expect(chart).toHaveAttribute("data-per", "week");
    const figure = page.getByTestId("dry-solids-chart-figure");
    await expect(figure.locator("figcaption")).toHaveText(/^Dry solids pumped per week \(/);
    await expect(page.getByTestId("dry-solids-chart-binning")).toHaveText(/^400 days are too many for a bar each at this width: one bar per week \(Monday to Sunday\), the sum of its days\.$/);
    await expect(chart).toHaveAccessibleDescription(/one bar per week/);
    await expect(page.getByTestId("polymer-per-ton-chart-binning")).toContainText("its days' parts added before dividing");
    for (const testId of ["dry-solids-chart", "polymer-per-ton-chart"]) {
      const boxes = await page.getByTestId(testId).locator("rect").evaluateAll((bars) => bars.map((bar) => bar.getBoundingClientRect()).map((box) => ({ left: box.left, right: box.right })));
      // computed: 2025-10-28 (a Tuesday) to 2026-12-01 (a Tuesday) spans 58 Monday-to-Sunday weeks, each with shifts
      expect(boxes, testId).toHaveLength(58);
      for (let index = 1; index < boxes.length; index++) expect(boxes[index].left, `${testId} bar ${index} at ${viewport.width} px`).toBeGreaterThan(boxes[index - 1].right);
    }
    // The weeks add up to the shifts (each tooltip rounds to 0.1 dry short ton).
    const weekly = await chart.locator("rect title").allTextContents();
    const summed = weekly.reduce((sum, text) => sum + Number(/: ([\d,.]+) dry/.exec(text)![1].replaceAll(",", "")), 0);
    expect(Math.abs(summed - pumped)).toBeLessThanOrEqual(0.05 * weekly.length);
    await figure.screenshot({ path: join(shots, `dry-solids-400-days-${viewport.width}.png`) });
    await page.getByTestId("polymer-per-ton-chart-figure").screenshot({ path: join(shots, `polymer-400-days-${viewport.width}.png`) });
    await context.close();
  }
});
