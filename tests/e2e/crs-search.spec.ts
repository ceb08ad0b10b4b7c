import { DEMO_ACCOUNTS, DEMO_PASSWORD, expect, signInWithPassword, test } from "./fixtures";

// The CRS field of the new-project form: words of a name find the CRS in the bundled EPSG list
// (published names: "NAD83 / Florida East" is EPSG:26958 in metres), chosen with the keyboard
// alone, and the length unit follows the choice.

test("the CRS is found by words of its name and chosen with the keyboard; the length unit follows", async ({ page }) => {
  await signInWithPassword(page, DEMO_ACCOUNTS.admin, DEMO_PASSWORD);
  // Signing in hashes a password: give a loaded machine time.
  await expect(page).toHaveURL(/\/projects$/, { timeout: 20_000 });
  const form = page.getByRole("region", { name: "New project" });
  const field = form.getByRole("combobox", { name: "Coordinate reference system (EPSG code)" });
  await field.click();
  await field.pressSequentially("NAD83 Florida East", { delay: 20 });
  const list = form.getByRole("listbox");
  await expect(list.getByRole("option").first()).toBeVisible();
  await expect(field).toHaveAttribute("aria-expanded", "true");
  const metreOption = list.getByRole("option", { name: /EPSG:26958 NAD83 \/ Florida East · metre/ });
  await expect(metreOption).toBeVisible();
  // Down to it with the arrow keys, Enter to choose.
  const options = await list.getByRole("option").allTextContents();
  const target = options.findIndex((text) => text.startsWith("EPSG:26958"));
  for (let step = 0; step <= target; step++) await field.press("ArrowDown");
  await expect(field).toHaveAttribute("aria-activedescendant", await metreOption.getAttribute("id") as string);
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.screenshot({ path: test.info().outputPath("crs-combobox-1440.png") });
  await field.press("Enter");
  await expect(field).toHaveValue("EPSG:26958");
  await expect(field).toHaveAttribute("aria-expanded", "false");
  await expect(form.getByLabel("Length unit")).toHaveValue("m");
  await expect(form.getByText("NAD83 / Florida East (metre)")).toBeVisible();

  // A code finds its CRS too; Escape closes the list and keeps what was typed.
  await field.fill("");
  await field.pressSequentially("2237", { delay: 20 });
  await expect(list.getByRole("option", { name: /EPSG:2237 NAD83 \/ Florida West \(ftUS\)/ })).toBeVisible();
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: test.info().outputPath("crs-combobox-390.png") });
  await field.press("Escape");
  await expect(field).toHaveAttribute("aria-expanded", "false");
  await expect(field).toHaveValue("2237");
});
