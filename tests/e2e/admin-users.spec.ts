import { createMember, expect, signInWithPassword, test, uniqueEmail } from "./fixtures";

// The site admin disables an account of its own making (the demo accounts stay as seeded for the
// other specs): its holder cannot sign in and is told why; re-enabled, they can again.

test("the site admin disables an account, it cannot sign in, the admin re-enables it", async ({ page, signIn, browser, baseURL }) => {
  test.setTimeout(90_000);
  const email = uniqueEmail("disabled-diver");
  const password = "a-long-enough-password-1";
  await createMember(baseURL!, email, password);

  await signIn("admin");
  await page.getByRole("navigation", { name: "Account" }).getByRole("link", { name: "Accounts" }).click();
  await expect(page).toHaveURL("/admin/users");
  await page.getByLabel("Search by name or e-mail").fill(email);
  await page.getByRole("button", { name: "Search" }).click();
  const row = page.getByRole("row").filter({ hasText: email });
  await expect(row).toHaveCount(1);
  await expect(row).toContainText("Active");

  let question = "";
  page.once("dialog", (dialog) => { question = dialog.message(); void dialog.accept(); });
  await row.getByRole("button", { name: /^Disable / }).click();
  await expect(page.getByText(/is disabled and signed out everywhere/)).toBeVisible();
  expect(question).toContain("signed out everywhere");
  await expect(row).toContainText("Disabled");

  const holderContext = await browser.newContext({ baseURL });
  const holder = await holderContext.newPage();
  await signInWithPassword(holder, email, password);
  await expect(holder.getByText("This account is disabled; ask your site administrator.")).toBeVisible();
  await expect(holder).toHaveURL(/\/login/);

  await row.getByRole("button", { name: /^Re-enable / }).click();
  await expect(page.getByText(/may sign in again/)).toBeVisible();
  await expect(row).toContainText("Active");

  await signInWithPassword(holder, email, password);
  await expect(holder).toHaveURL(/\/projects$/);
  await holderContext.close();
});
