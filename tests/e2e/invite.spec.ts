import { createMember, expect, linkIn, signInWithPassword, test, uniqueEmail, waitForMail } from "./fixtures";

test("a manager invites someone by e-mail; the link sets a password and lands on the project; it works once", async ({ page, signIn, browser }) => {
  const email = uniqueEmail("invitee");
  await signIn("manager");
  await page.getByRole("link", { name: /Spring run restoration/ }).click();
  await expect(page).toHaveURL(/\/projects\/\d+$/);
  const projectUrl = new URL(page.url()).pathname;
  await page.getByRole("link", { name: "Members" }).click();
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Role", { exact: true }).selectOption("surveyor");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("status")).toHaveText(`Invitation to ${email} saved; its mail goes out now.`);
  await expect(page.getByRole("region", { name: "Open invitations" }).getByText(email)).toBeVisible();

  const mail = await waitForMail(email);
  expect(mail.subject).toContain("You are invited to");
  const link = linkIn(mail, "/invite");

  const invitee = await browser.newContext();
  const inviteePage = await invitee.newPage();
  await inviteePage.goto(link);
  await expect(inviteePage.getByRole("heading", { level: 1 })).toContainText("Join");
  await inviteePage.getByLabel("Your name").fill("Ada Newcomer");
  await inviteePage.getByLabel("Choose a password").fill("newcomer-password");
  await inviteePage.getByRole("button", { name: "Join the project" }).click();
  await expect(inviteePage).toHaveURL(new RegExp(`${projectUrl}$`));
  await expect(inviteePage.getByText("your role: Survey technician")).toBeVisible();

  // The link is spent now.
  await inviteePage.goto(link);
  await expect(inviteePage.getByRole("alert")).toContainText("already been used");
  await invitee.close();

  // The new member can sign in with the password they chose, and the manager sees them.
  const again = await browser.newContext();
  const againPage = await again.newPage();
  await signInWithPassword(againPage, email, "newcomer-password");
  await expect(againPage).toHaveURL(/\/projects$/);
  await again.close();
  await page.reload();
  await expect(page.getByRole("cell", { name: email })).toBeVisible();
});

test("repeated failed sign-ins lock the account with a clear message", async ({ page, baseURL }) => {
  // An account made for this test only, so the demo accounts other tests use stay open.
  const email = uniqueEmail("locked");
  await createMember(baseURL!, email, "the-right-password");
  for (let attempt = 1; attempt <= 4; attempt++) {
    await signInWithPassword(page, email, `wrong-${attempt}`);
    await expect(page.getByRole("alert")).toHaveText("That e-mail and password do not match an account.");
  }
  await signInWithPassword(page, email, "wrong-5");
  await expect(page.getByRole("alert")).toHaveText("Too many failed sign-ins for this account. Try again in 15 minutes.");
  // Even the right password is refused while the lock lasts.
  await signInWithPassword(page, email, "the-right-password");
  await expect(page.getByRole("alert")).toHaveText(/^Too many failed sign-ins for this account\. Try again in \d+ minutes?\.$/);
  await expect(page).toHaveURL(/\/login/);
});
