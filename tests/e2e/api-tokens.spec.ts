import { request as playwrightRequest } from "@playwright/test";
import { demoProjectId, expect, test } from "./fixtures";

// A surveyor creates a personal API token on the account page, a program uses it as a Bearer
// token on the survey API (no cookie), and once revoked the same token is refused.
test("a personal API token works on the API until it is revoked", async ({ page, signIn, request, baseURL }) => {
  const projectId = await demoProjectId(request, baseURL!);
  await signIn("surveyor");
  await page.goto("/account");
  await page.getByLabel("Token name").fill("office upload script");
  await page.getByRole("button", { name: "Create token" }).click();
  const token = (await page.getByTestId("new-api-token").textContent())?.trim() ?? "";
  expect(token).toMatch(/^fs_/);

  const program = await playwrightRequest.newContext({ baseURL });
  const listed = await program.get(`/api/projects/${projectId}/surveys`, { headers: { Authorization: `Bearer ${token}` } });
  expect(listed.status()).toBe(200);
  expect(Array.isArray((await listed.json()).surveys ?? (await listed.json()))).toBe(true);
  const forged = await program.get(`/api/projects/${projectId}/surveys`, { headers: { Authorization: `Bearer ${token}x` } });
  expect(forged.status()).toBe(401);

  await page.reload();
  page.once("dialog", (dialog) => dialog.accept());
  await page.getByRole("button", { name: "Revoke office upload script" }).click();
  await expect(page.getByText("Token revoked")).toBeVisible();
  const refused = await program.get(`/api/projects/${projectId}/surveys`, { headers: { Authorization: `Bearer ${token}` } });
  expect(refused.status()).toBe(401);
  await program.dispose();
});
