import { expect, test } from "./fixtures";

// The dive teams page: the dive supervisor adds a team from the page (crew one a line, hoses and
// pumps one a line with their diameters); a person listed twice and a diameter typed in millimetres
// on this feet project are refused naming the line; the team shows with its crew, its hoses and
// pumps with their diameters, and the below-minimum flag; removing a team with nothing on record deletes it.

test("the dive supervisor adds a team, is told which crew line is wrong, and removes it", async ({ page, signIn }) => {
  test.setTimeout(60_000);
  const name = `Team Coot ${Date.now().toString(36)}`;
  await signIn("dive-supervisor");
  await page.getByRole("link", { name: /Wickerbill/ }).first().click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Dive plans" }).click();
  await page.getByRole("link", { name: "Dive teams" }).click();
  await expect(page.getByRole("heading", { name: "Dive teams", level: 2 })).toBeVisible();
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.screenshot({ path: test.info().outputPath("teams-1440.png"), fullPage: true });

  const form = page.getByRole("form", { name: "New dive team" });
  await form.getByLabel("Team name").fill(name);
  await form.getByLabel("Station").fill("South landing");
  await form.getByLabel("Crew, one person a line").fill("Maren Voss, diver\nIsak Brenner, tender\nmaren voss, standby diver");
  await form.getByLabel("Hoses", { exact: true }).fill("Hose 7, 6\nHose 8, 152");
  await form.getByLabel("Pumps", { exact: true }).fill("Pump 2, 8");
  await form.getByRole("button", { name: "Add team" }).click();
  await expect(form.getByText("Line 3: maren voss is listed twice on this team.")).toBeVisible();
  await expect(form.getByLabel("Crew, one person a line")).toHaveAttribute("aria-invalid", "true");

  await form.getByLabel("Crew, one person a line").fill("Maren Voss, diver\nIsak Brenner, tender");
  await form.getByRole("button", { name: "Add team" }).click();
  await expect(form.getByText('Line 2: The hose "Hose 8": its diameter must be from 1 to 24 in (this project gives diameters in inches). Was it given in millimetres? 152 mm is 5.98 in.')).toBeVisible();
  await expect(form.getByLabel("Hoses", { exact: true })).toHaveAttribute("aria-invalid", "true");
  await page.setViewportSize({ width: 390, height: 844 });
  await form.getByLabel("Hoses", { exact: true }).scrollIntoViewIfNeeded();
  await page.screenshot({ path: test.info().outputPath("teams-form-error-390.png") });
  await page.setViewportSize({ width: 1440, height: 900 });

  await form.getByLabel("Hoses", { exact: true }).fill("Hose 7, 6\nHose 8");
  await form.getByRole("button", { name: "Add team" }).click();
  await expect(page.getByRole("status")).toContainText(`${name} saved.`);
  const card = page.getByRole("listitem").filter({ has: page.getByRole("heading", { name, level: 3 }) });
  await expect(card).toContainText("Maren Voss — diver");
  await expect(card.getByRole("listitem").filter({ hasText: "Hose 7" })).toHaveText("Hose 7 — 6 in");
  await expect(card.getByRole("listitem").filter({ hasText: "Hose 8" })).toHaveText("Hose 8 — diameter not given");
  await expect(card.getByRole("listitem").filter({ hasText: "Pump 2" })).toHaveText("Pump 2 — 8 in");
  // The demo's teams, seeded through the same service, have their pumps and diameters.
  const limpkin = page.getByRole("listitem").filter({ has: page.getByRole("heading", { name: "Team Limpkin", level: 3 }) });
  await expect(limpkin.getByRole("listitem").filter({ hasText: "Pump P1" })).toHaveText("Pump P1 — 8 in");
  await page.screenshot({ path: test.info().outputPath("teams-1440-after.png"), fullPage: true });
  await expect(card).toContainText("below the minimum team size");
  await page.setViewportSize({ width: 390, height: 844 });
  await card.scrollIntoViewIfNeeded();
  await page.screenshot({ path: test.info().outputPath("teams-390.png") });

  page.once("dialog", (dialog) => dialog.accept());
  await card.getByRole("button", { name: `Remove ${name}` }).click();
  await expect(page.getByRole("status")).toContainText(`${name} deleted.`);
  await expect(page.getByRole("heading", { name, level: 3 })).toHaveCount(0);
});
