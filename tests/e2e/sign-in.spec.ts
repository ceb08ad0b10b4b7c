import { DEMO_ACCOUNTS, expect, signInWithPassword, test, type DemoAccount } from "./fixtures";

test.describe("sign-in", () => {
  for (const account of Object.keys(DEMO_ACCOUNTS) as DemoAccount[]) {
    test(`the ${account} demo account signs in and sees the demo project`, async ({ page, signIn }) => {
      await signIn(account);
      const projectLink = page.getByRole("link", { name: /Spring run restoration/ });
      await expect(projectLink).toBeVisible();
      await projectLink.click();
      await expect(page).toHaveURL(/\/projects\/\d+$/);
      await expect(page.getByText("EPSG:2237")).toBeVisible();
      await expect(page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Overview" })).toBeVisible();
    });
  }

  test("the sign-in page lists the demo accounts in demo mode", async ({ page }) => {
    await page.goto("/login");
    const demo = page.getByRole("region", { name: "Demo accounts" });
    for (const email of Object.values(DEMO_ACCOUNTS)) await expect(demo.getByText(email, { exact: true })).toBeVisible();
  });

  test("a wrong password shows an error tied to the form", async ({ page }) => {
    await signInWithPassword(page, DEMO_ACCOUNTS.outreach, "not-the-password");
    await expect(page.getByRole("alert")).toHaveText("That e-mail and password do not match an account.");
    await expect(page.getByLabel("Password")).toHaveAttribute("aria-invalid", "true");
    await expect(page).toHaveURL(/\/login/);
  });

  test("signing out ends the session", async ({ page, signIn }) => {
    await signIn("viewer");
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page).toHaveURL(/\/login$/);
    await page.goto("/projects");
    await expect(page).toHaveURL(/\/login\?next=%2Fprojects$/);
  });

  test("a viewer gets a 403 page on the members page", async ({ page, signIn }) => {
    await signIn("viewer");
    await page.getByRole("link", { name: /Spring run restoration/ }).click();
    await expect(page).toHaveURL(/\/projects\/\d+$/);
    const projectUrl = page.url();
    await expect(page.getByRole("link", { name: "Members" })).toHaveCount(0);
    const response = await page.goto(`${projectUrl}/members`);
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { level: 1 })).toContainText("403");
    await expect(page.getByText("Your role on this project does not allow this page.")).toBeVisible();
  });
});
