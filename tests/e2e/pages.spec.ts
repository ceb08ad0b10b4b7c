import { createMember, expect, linkIn, signInWithPassword, test, uniqueEmail, waitForMail } from "./fixtures";

test("no page asks for anything beyond 127.0.0.1", async ({ page, signIn }) => {
  // The offlineGuard fixture fails this test on any non-loopback request.
  for (const path of ["/", "/login", "/forgot-password"]) await page.goto(path);
  await signIn("manager");
  await page.getByRole("link", { name: /Spring run restoration/ }).click();
  for (const name of ["Map", "Surveys", "Members", "Audit log", "Overview"]) {
    await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name }).click();
    await page.waitForLoadState("networkidle");
  }
  await page.goto("/account");
});

test("the audit log shows sign-ins to the manager", async ({ page, signIn }) => {
  await signIn("manager");
  await page.getByRole("link", { name: /Spring run restoration/ }).click();
  await page.getByRole("link", { name: "Audit log" }).click();
  await expect(page.getByRole("cell", { name: "Sign in", exact: true }).first()).toBeVisible();
});

test("the site admin reads sent mail at /dev/mail", async ({ page, signIn }) => {
  const since = new Date().toISOString();
  await page.goto("/forgot-password");
  await page.getByLabel("E-mail").fill("outreach@example.org");
  await page.getByRole("button", { name: "Send a reset link" }).click();
  await expect(page.getByRole("status")).toContainText("reset link is on its way");
  const mail = await waitForMail("outreach@example.org", since);
  expect(linkIn(mail, "/reset-password")).toContain("/reset-password/");

  await signIn("admin");
  await page.goto("/dev/mail");
  await page.getByRole("link", { name: "Reset your Firmsand password" }).first().click();
  await expect(page.getByRole("article")).toContainText("/reset-password/");
});

test("a password reset link works once", async ({ page, browser, baseURL }) => {
  const email = uniqueEmail("reset");
  await createMember(baseURL!, email, "first-password-1");
  const since = new Date().toISOString();
  await page.goto("/forgot-password");
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Send a reset link" }).click();
  await expect(page.getByRole("status")).toContainText("on its way");
  const link = linkIn(await waitForMail(email, since), "/reset-password");
  await page.goto(link);
  await page.getByLabel("New password", { exact: true }).fill("second-password-2");
  await page.getByLabel("New password again").fill("second-password-2");
  await page.getByRole("button", { name: "Set the new password" }).click();
  await expect(page).toHaveURL(/\/login\?reset=done$/);
  await expect(page.getByRole("status")).toContainText("Your password was changed");
  await page.goto(link);
  await expect(page.getByRole("alert")).toContainText("already been used");

  const context = await browser.newContext();
  const check = await context.newPage();
  await signInWithPassword(check, email, "first-password-1");
  await expect(check.getByRole("alert")).toContainText("do not match");
  await signInWithPassword(check, email, "second-password-2");
  await expect(check).toHaveURL(/\/projects$/);
  await context.close();
});
