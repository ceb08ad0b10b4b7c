import { expect, test } from "./fixtures";

// The dive teams page: the dive supervisor adds a team from the page (crew one a line, hoses one
// a line); a person listed twice is refused naming the line; the team shows with its crew and the
// below-minimum flag; removing a team with nothing on record deletes it.

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
  await form.getByLabel("Hoses and pumps, one a line").fill("Hose 7\nPump 2");
  await form.getByRole("button", { name: "Add team" }).click();
  await expect(form.getByText("Line 3: maren voss is listed twice on this team.")).toBeVisible();
  await expect(form.getByLabel("Crew, one person a line")).toHaveAttribute("aria-invalid", "true");

  await form.getByLabel("Crew, one person a line").fill("Maren Voss, diver\nIsak Brenner, tender");
  await form.getByRole("button", { name: "Add team" }).click();
  await expect(page.getByRole("status")).toContainText(`${name} saved.`);
  const card = page.getByRole("listitem").filter({ has: page.getByRole("heading", { name, level: 3 }) });
  await expect(card).toContainText("Maren Voss — diver");
  await expect(card).toContainText("Hose 7, Pump 2");
  await expect(card).toContainText("below the minimum team size");
  await page.setViewportSize({ width: 390, height: 844 });
  await card.scrollIntoViewIfNeeded();
  await page.screenshot({ path: test.info().outputPath("teams-390.png") });

  page.once("dialog", (dialog) => dialog.accept());
  await card.getByRole("button", { name: `Remove ${name}` }).click();
  await expect(page.getByRole("status")).toContainText(`${name} deleted.`);
  await expect(page.getByRole("heading", { name, level: 3 })).toHaveCount(0);
});
