import { readFile } from "node:fs/promises";
import { request as playwrightRequest } from "@playwright/test";
import { pdfPages } from "../pdf-text";
import { instantOfLocal, localDayOf } from "../../shared/local-time";
import { PROJECT } from "../../sample-data/scenario";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, demoProjectId, expect, linkIn, test, uniqueEmail, waitForMail } from "./fixtures";

// The dive supervisor's day report end to end on the demo project: yesterday's report lists what
// is missing, takes the weather, is signed with a typed name; the agency's inspector countersigns
// through the link e-mailed to them (read from the fake mailbox); the report refuses edits, takes an
// amendment, and its PDF downloads with the day's figures.

let projectId: number;

test.beforeAll(async ({ baseURL }) => {
  const context = await playwrightRequest.newContext({ baseURL });
  projectId = await demoProjectId(context, baseURL!);
  await context.dispose();
});

test("daily report: missing items, weather, signature, countersignature by e-mailed link, locked, amendment, PDF", async ({ page, browser }) => {
  // The whole day's round (two countersignatures by mailed link, a PDF read back) runs past the default 30 s on a busy machine.
  test.setTimeout(120_000);
  const today = localDayOf(Date.now(), PROJECT.timeZone);
  // Noon of the day before today's local midnight is yesterday, whatever the offset.
  const yesterday = localDayOf(instantOfLocal(today, 0, PROJECT.timeZone) - 12 * 3_600_000, PROJECT.timeZone);
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(DEMO_ACCOUNTS["dive-supervisor"]);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/projects/);

  await page.goto(`/projects/${projectId}/days?month=${yesterday.slice(0, 7)}`);
  await page.getByRole("link", { name: new RegExp(`^${yesterday}, `) }).click();
  await expect(page.getByRole("heading", { name: `Daily report · ${yesterday}` })).toBeVisible();
  await expect(page.getByTestId("missing")).toContainText("no weather entered");

  await page.getByLabel("Conditions").fill("Overcast, light chop");
  await page.getByLabel("Air temperature").fill("18 °C");
  await page.getByLabel("Effect on the work").fill("None");
  await page.getByRole("button", { name: "Save weather and notes" }).click();
  await expect(page.getByText("Weather and notes saved.")).toBeVisible();
  await expect(page.getByTestId("missing")).not.toContainText("no weather entered");

  // Equipment working and idle: an idle spell needs its reason, said on the line's own field.
  const equipmentLine = page.getByTestId("equipment-line").first();
  await equipmentLine.getByLabel("Line 1: equipment").fill("Suction pump 1");
  await equipmentLine.getByLabel("Working (h)").fill("6.5");
  await equipmentLine.getByLabel("Idle (h)").fill("1.5");
  await page.getByRole("button", { name: "Save equipment hours" }).click();
  await expect(equipmentLine.getByText(/^line 1: say why it stood idle/)).toBeVisible();
  await equipmentLine.getByLabel("Idle reason").fill("waiting on the turbidity stop");
  await page.getByRole("button", { name: "Add a line" }).click();
  const second = page.getByTestId("equipment-line").nth(1);
  await second.getByLabel("Line 2: equipment").fill("Work boat");
  await second.getByLabel("Working (h)").fill("8");
  await page.getByRole("button", { name: "Save equipment hours" }).click();
  await expect(page.getByText("Equipment hours saved.")).toBeVisible();
  await expect(page.getByTestId("equipment-hours")).toContainText("waiting on the turbidity stop");
  await expect(page.getByTestId("equipment-hours")).toContainText("2 pieces: 14.5 h working, 1.5 h idle");

  // A head count entered over the compiled one: a whole number 0–99, said on the crew's own field; the compiled figure stays beside it.
  const crew = page.getByTestId("crew-line").first();
  const team = (await crew.locator("span.font-medium").textContent())!;
  await crew.getByLabel(`${team}: head count`).fill("120");
  await page.getByRole("button", { name: "Save head counts" }).click();
  await expect(crew.getByText(new RegExp(`^line 1 \\(${team}\\): the head count is a whole number of people from 0 to 99$`))).toBeVisible();
  await crew.getByLabel(`${team}: head count`).fill("6");
  await crew.getByLabel("Reason (optional)").fill("two tenders and the supervisor on the barge");
  await page.getByRole("button", { name: "Save head counts" }).click();
  await expect(page.getByText("Head counts saved.")).toBeVisible();
  await expect(page.getByTestId("entered-head-counts")).toContainText(new RegExp(`${team} (\\d+ from the (day plan|dive log)|none compiled), entered 6 \\(two tenders and the supervisor on the barge\\)`));

  // Weather downtime: the end after the start, said on the line's own field; then listed with the interruptions.
  const spell = page.getByTestId("weather-downtime-line").first();
  await spell.getByLabel("Spell 1: start").fill("14:00");
  await spell.getByLabel("End").fill("13:00");
  await spell.getByLabel("Weather").fill("lightning within 10 miles");
  await page.getByRole("button", { name: "Save weather downtime" }).click();
  await expect(spell.getByText("line 1: the end (13:00) comes after the start (14:00); downtime through midnight is entered on each day")).toBeVisible();
  await spell.getByLabel("End").fill("15:30");
  await page.getByRole("button", { name: "Save weather downtime" }).click();
  await expect(page.getByText("Weather downtime saved.")).toBeVisible();
  await expect(page.getByText("Weather downtime (lightning within 10 miles) from 14:00 to 15:30: 1.5 h lost on the day")).toBeVisible();

  // Inspections and visitors with their times.
  const visitor = page.getByTestId("visitors-line").first();
  await visitor.getByLabel("Visitor 1: arrived").fill("09:30");
  await visitor.getByLabel("Left").fill("11:05");
  await visitor.getByLabel("Name").fill("Priya Natarajan");
  await visitor.getByLabel("Organisation").fill("District water agency");
  await visitor.getByLabel("Purpose or notes").fill("silt curtain inspection");
  await page.getByRole("button", { name: "Save inspections and visitors" }).click();
  await expect(page.getByText("Inspections and visitors saved.")).toBeVisible();
  await expect(page.getByTestId("visitors")).toContainText("Priya Natarajan");
  await expect(page.getByTestId("visitors").getByRole("row", { name: /09:30 11:05 Priya Natarajan District water agency silt curtain inspection/ })).toBeVisible();

  await page.getByLabel("Your name (typed, as your signature)").fill("Dana Reyes");
  await page.getByRole("button", { name: "Sign the report" }).click();
  await expect(page.getByTestId("signed")).toContainText("Dana Reyes");
  // Locked: the forms are gone, and a direct post is refused.
  await expect(page.getByTestId("notes-form")).toHaveCount(0);
  for (const form of ["crews-form", "weather-downtime-form", "visitors-form"]) await expect(page.getByTestId(form)).toHaveCount(0);
  const origin = new URL(page.url()).origin;
  const refused = await page.request.post(`/projects/${projectId}/days/${yesterday}`, { form: { intent: "notes", conditions: "Sunny" }, headers: { Origin: origin } });
  expect(refused.status()).toBe(409);
  const refusedLines = await page.request.put(`/api/projects/${projectId}/days/${yesterday}/visitors`, { data: { visitors: [] }, headers: { Origin: origin } });
  expect(refusedLines.status()).toBe(409);


  // The inspector's countersignature, through the one-time link e-mailed to them.
  const inspector = uniqueEmail("inspector");
  const since = new Date(Date.now() - 1000).toISOString();
  await page.getByLabel("Inspector's e-mail").fill(inspector);
  await page.getByRole("button", { name: "Send countersign link" }).click();
  await expect(page.getByText(`A one-time countersign link goes to ${inspector} now.`)).toBeVisible();
  const mail = await waitForMail(inspector, since);
  expect(mail.subject).toContain(`Please countersign the daily report of ${yesterday}`);
  const link = linkIn(mail, "/countersign");
  const figures = (await page.getByTestId("dive-summary").textContent())!.replace(/\s+/g, " ").trim();
  const away = await browser.newContext();
  const inspectorPage = await away.newPage();
  await inspectorPage.goto(link);
  await expect(inspectorPage.getByRole("heading", { level: 1 })).toHaveText(`Countersign the daily report of ${yesterday}`);
  // The same figures as the supervisor's page, read-only: no form but the countersignature.
  await expect(inspectorPage.getByTestId("dive-summary")).toHaveText(figures);
  await expect(inspectorPage.getByLabel("Conditions")).toHaveCount(0);
  await expect(inspectorPage.getByTestId("visitors")).toContainText("Priya Natarajan");
  await expect(inspectorPage.getByText("Weather downtime (lightning within 10 miles) from 14:00 to 15:30")).toBeVisible();
  await inspectorPage.getByLabel("Your name (typed, as your countersignature)").fill("Morgan Alvarez");
  await inspectorPage.getByRole("button", { name: "Countersign the report" }).click();
  await expect(inspectorPage.getByTestId("countersign-done")).toContainText("is countersigned");
  // Spent once used.
  await inspectorPage.goto(link);
  await expect(inspectorPage.getByRole("alert")).toContainText("already been used");
  await away.close();
  await page.reload();
  await expect(page.getByTestId("countersigned")).toContainText("Morgan Alvarez");
  await page.goto(`/projects/${projectId}/days?month=${yesterday.slice(0, 7)}`);
  await expect(page.locator(`[data-date="${yesterday}"]`)).toHaveAttribute("data-state", "countersigned");
  await page.goto(`/projects/${projectId}/days/${yesterday}`);

  await page.getByLabel("Amendment").fill("Air temperature read at 07:00, not noon.");
  await page.getByRole("button", { name: "Add amendment" }).click();
  await expect(page.getByTestId("amendments")).toContainText("Air temperature read at 07:00, not noon.");

  // The PDF: the day's figures as the page shows them, the signatures and the amendment.
  const downloading = page.waitForEvent("download");
  await page.getByRole("link", { name: "Download PDF" }).click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(new RegExp(`-daily-report-${yesterday}\\.pdf$`));
  const pages = await pdfPages(await readFile((await download.path())!));
  expect(pages.length).toBeLessThanOrEqual(2);
  const text = pages.join(" ");
  expect(text).toContain(`Daily report · ${yesterday}`);
  expect(text).toContain(figures);
  expect(text).toContain("Dana Reyes");
  expect(text).toContain("Morgan Alvarez");
  expect(text).toContain("Air temperature read at 07:00, not noon.");
  expect(text).toContain("Overcast, light chop");
  expect(text).toMatch(/Suction pump 1\s*6\.5\s*1\.5\s*waiting on the turbidity stop/);
  expect(text).toContain("Weather downtime (lightning within 10 miles) from 14:00 to 15:30: 1.5 h lost on the day");
  expect(text).toMatch(/09:30\s*11:05\s*Priya Natarajan\s*District water agency\s*silt curtain inspection/);
  expect(text).toContain(`${team} `);
  expect(text).toMatch(/entered 6 \(two tenders and the supervisor on the barge\)/);
  expect(text).toContain("Amended after this countersignature");

  await page.goto(`/projects/${projectId}/days?month=${yesterday.slice(0, 7)}`);
  // Countersigned, then amended: the latest event shows, the countersignature beside it.
  const day = page.getByTestId("day").filter({ has: page.getByRole("link", { name: new RegExp(`^${yesterday}, amended after countersignature`) }) });
  await expect(day).toContainText("amended");
  await expect(day.getByTestId("day-note")).toHaveText("after countersignature");
  await expect(page.getByRole("group", { name: "Legend" })).toContainText("countersigned: countersigned by the agency's inspector, with any amendment made before it");

  // Amended after the countersignature: a new countersignature is asked for; the first stays on record.
  await page.goto(`/projects/${projectId}/days/${yesterday}`);
  await expect(page.getByTestId("countersign-outdated")).toBeVisible();
  await expect(page.getByLabel("Inspector's e-mail")).toHaveValue(inspector);
  const againSince = new Date(Date.now() - 1000).toISOString();
  await page.getByRole("button", { name: "Ask for a new countersignature" }).click();
  await expect(page.getByText(`A one-time countersign link goes to ${inspector} now.`)).toBeVisible();
  const again = await browser.newContext();
  const againPage = await again.newPage();
  await againPage.goto(linkIn(await waitForMail(inspector, againSince), "/countersign"));
  await expect(againPage.getByTestId("countersign-again")).toContainText("Morgan Alvarez countersigned this report");
  await againPage.getByLabel("Your name (typed, as your countersignature)").fill("Morgan Alvarez");
  await againPage.getByRole("button", { name: "Countersign the report" }).click();
  await expect(againPage.getByTestId("countersign-done")).toContainText("is countersigned");
  await again.close();
  await page.reload();
  await expect(page.getByTestId("earlier-countersignatures")).toContainText("Earlier countersignature: Morgan Alvarez");
  await expect(page.getByTestId("earlier-countersignatures")).toContainText("of the report as signed, before any amendment");
  await expect(page.getByTestId("countersign-outdated")).toHaveCount(0);
});

test("a manager adds an outside subscriber, who receives the signed report with its PDF attached", async ({ page, signIn }) => {
  const today = localDayOf(Date.now(), PROJECT.timeZone);
  // Three days back: a day the other test leaves alone.
  const day = localDayOf(instantOfLocal(today, 0, PROJECT.timeZone) - 2.5 * 86_400_000, PROJECT.timeZone);
  const address = uniqueEmail("contracts");
  await signIn("manager");
  await page.goto(`/projects/${projectId}/days`);
  await page.getByLabel("Outside address").fill(address);
  await page.getByRole("button", { name: "Add address" }).click();
  await expect(page.getByText(`${address} will receive each signed report.`)).toBeVisible();
  await expect(page.getByTestId("subscribers")).toContainText(`${address} (outside address)`);
  const since = new Date(Date.now() - 1000).toISOString();
  await page.goto(`/projects/${projectId}/days/${day}`);
  await page.getByLabel("Your name (typed, as your signature)").fill("Imogen Tallis");
  await page.getByRole("button", { name: "Sign the report" }).click();
  await expect(page.getByTestId("signed")).toContainText("Imogen Tallis");
  const mail = await waitForMail(address, since) as Awaited<ReturnType<typeof waitForMail>> & { attachments: Array<{ filename: string; contentType: string; size: number }> };
  expect(mail.subject).toBe(`Daily report ${day} signed · ${PROJECT.name}`);
  expect(mail.attachments).toEqual([expect.objectContaining({ filename: expect.stringMatching(new RegExp(`-daily-report-${day}\\.pdf$`)), contentType: "application/pdf" })]);
  expect(mail.attachments[0]!.size).toBeGreaterThan(1000);
});

test("a day that cannot exist is the app's not-found page, and its PDF a 404", async ({ page, signIn }) => {
  await signIn("viewer");
  for (const date of ["2026-13-45", "abc"]) {
    const response = await page.goto(`/projects/${projectId}/days/${date}`);
    expect(response!.status()).toBe(404);
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(/^404/);
    await expect(page.getByText(/There is no (such )?day/)).toBeVisible();
    await expect(page.getByRole("link", { name: "Back to your projects" })).toBeVisible();
  }
  expect((await page.request.get(`/projects/${projectId}/days/2026-02-30/report.pdf`)).status()).toBe(404);
});
