import { join } from "node:path";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test } from "./fixtures";

// The survey technician's import in Chromium: upload, fix a column mapping, preview, commit, and
// the cells change; a bad file shows its row errors and stores nothing; a viewer is refused.

const FIXTURES = join(import.meta.dirname, "..", "fixtures", "import");

async function openSurveys(page: import("@playwright/test").Page) {
  await page.getByRole("link", { name: /Spring run restoration/ }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Surveys" }).click();
  await expect(page.getByRole("heading", { name: "Surveys" })).toBeVisible();
}

test("the surveyor uploads a progress file, maps its depth column, previews and commits; the cells change", async ({ page, signIn, request, baseURL }) => {
  test.setTimeout(90_000);
  await signIn("surveyor");
  await openSurveys(page);
  const removedBefore = await page.getByTestId("removed-volume").textContent();
  const firmBefore = await page.getByTestId("cells-at-firm-sand").textContent();

  await page.getByRole("link", { name: "Upload a survey" }).click();
  await page.getByLabel("Sounding file (CSV, up to 200 MB)").setInputFiles(join(FIXTURES, "progress-unguessable-depth-column.csv"));
  await page.getByLabel("Survey kind").selectOption("progress");
  await page.getByLabel("Survey date").fill("2026-12-01");
  await page.getByLabel(/Water-surface elevation/).fill("31.7");
  await page.getByRole("button", { name: "Upload and check" }).click();

  await expect(page).toHaveURL(/\/surveys\/imports\/\d+$/);
  // The depth column "WD" is not guessed: the file cannot be imported until it is mapped.
  await expect(page.getByRole("alert").filter({ hasText: "no water depth column" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Import the survey" })).toBeDisabled();
  await expect(page.getByRole("table", { name: "First rows of the file" })).toContainText("P3-00001");
  await page.getByLabel("Water depth").selectOption("WD");
  await page.getByRole("button", { name: "Check again with these choices" }).click();
  await expect(page.getByText("Every row passes the rules.")).toBeVisible();
  await expect(page.getByRole("img", { name: "Soundings of this file and the work limit" })).toBeVisible();
  await page.getByRole("button", { name: "Import the survey" }).click();

  // The commit runs on the server; the page follows it and opens the new survey when it is done.
  await expect(page).toHaveURL(/\/surveys\/\d+$/, { timeout: 60_000 });
  await expect(page.getByRole("heading", { name: "Progress survey of 2026-12-01" })).toBeVisible();
  await expect(page.getByTestId("survey-status")).toContainText("Active");
  const surveyUrl = page.url();

  await page.getByRole("link", { name: "All surveys" }).click();
  const removedAfter = await page.getByTestId("removed-volume").textContent();
  const firmAfter = await page.getByTestId("cells-at-firm-sand").textContent();
  expect(`${removedAfter} ${firmAfter}`).not.toBe(`${removedBefore} ${firmBefore}`);

  // Leave the demo as seeded for other tests: the manager retracts the test survey.
  const projectId = await demoProjectId(request, baseURL!);
  const surveyId = Number(surveyUrl.split("/").pop());
  const retracted = await request.delete(`/api/projects/${projectId}/surveys/${surveyId}`, {
    data: { reason: "browser test survey" },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(retracted.status()).toBe(200);
});

test("a bad file shows its row errors and cannot be committed", async ({ page, signIn }) => {
  await signIn("surveyor");
  await openSurveys(page);
  const rowsBefore = await page.getByRole("row").count();
  await page.getByRole("link", { name: "Upload a survey" }).click();
  await page.getByLabel("Sounding file (CSV, up to 200 MB)").setInputFiles(join(FIXTURES, "non-number-depth.csv"));
  await page.getByLabel("Survey kind").selectOption("progress");
  await page.getByLabel("Survey date").fill("2026-12-02");
  await page.getByLabel(/Water-surface elevation/).fill("31.7");
  await page.getByRole("button", { name: "Upload and check" }).click();
  await expect(page).toHaveURL(/\/surveys\/imports\/\d+$/);
  const problems = page.getByTestId("problems-table");
  await expect(problems).toContainText("4.1x");
  await expect(problems.getByRole("row", { name: /water depth is not a number/ })).toContainText("5");
  await expect(page.getByTestId("blockers")).toContainText("1 row has problems");
  await expect(page.getByRole("button", { name: "Import the survey" })).toBeDisabled();
  await expect(page.getByRole("link", { name: "Download the problems as CSV" })).toBeVisible();
  await page.getByRole("button", { name: "Discard this upload" }).click();
  await expect(page.getByRole("heading", { name: "Surveys" })).toBeVisible();
  expect(await page.getByRole("row").count()).toBe(rowsBefore);
});

test("depths in metres uploaded as feet: the preview names the likely mistake and holds the import until confirmed", async ({ page, signIn }) => {
  await signIn("surveyor");
  await openSurveys(page);
  await page.getByRole("link", { name: "Upload a survey" }).click();
  await page.getByLabel("Sounding file (CSV, up to 200 MB)").setInputFiles(join(FIXTURES, "progress-depths-in-metres.csv"));
  await page.getByLabel("Survey kind").selectOption("progress");
  await page.getByLabel("Survey date").fill("2026-11-30");
  await page.getByLabel(/Water-surface elevation/).fill("32.1");
  await page.getByRole("button", { name: "Upload and check" }).click();
  await expect(page).toHaveURL(/\/surveys\/imports\/\d+$/);
  const note = page.getByTestId("depth-unit");
  await expect(note).toContainText("The depths look like metres, not US survey feet as declared");
  await expect(page.getByTestId("blockers")).toContainText("another unit than declared");
  await expect(page.getByRole("button", { name: "Import the survey" })).toBeDisabled();
  // The technician may confirm (a real change of the bottom can look like this, rarely).
  await note.getByLabel(/The depths are right as given/).check();
  await page.getByRole("button", { name: "Check again with these choices" }).click();
  await expect(page.getByTestId("depth-unit").getByLabel(/The depths are right as given/)).toBeChecked();
  // Nothing else holds this file back, so the confirmation unlocks the import.
  await expect(page.getByTestId("blockers")).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Import the survey" })).toBeEnabled();
  await page.getByRole("button", { name: "Discard this upload" }).click();
  await expect(page.getByRole("heading", { name: "Surveys" })).toBeVisible();
});

test("a viewer cannot reach the upload page or the API", async ({ page, signIn, request, baseURL }) => {
  const projectId = await demoProjectId(request, baseURL!);
  await signIn("viewer");
  const response = await page.goto(`/projects/${projectId}/surveys/new`);
  expect(response?.status()).toBe(403);
  await page.goto(`/projects/${projectId}/surveys`);
  await expect(page.getByRole("link", { name: "Upload a survey" })).toHaveCount(0);

  await signInRequest(request, baseURL!, DEMO_ACCOUNTS.viewer);
  const upload = await request.post(`/api/projects/${projectId}/surveys`, {
    multipart: { kind: "progress", surveyedOn: "2026-12-03", waterSurfaceElevation: "31.7", file: { name: "x.csv", mimeType: "text/csv", buffer: Buffer.from("easting,northing,depth\n600100,1679950,4\n") } },
    headers: { Origin: new URL(baseURL!).origin },
  });
  expect(upload.status()).toBe(403);
});
