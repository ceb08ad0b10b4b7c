import { GRID, PROJECT, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { test as base, expect, request as playwrightRequest, type APIRequestContext, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "firmsand-demo";

/** The demo accounts by role (seeded by db/seed.ts demo). */
export const DEMO_ACCOUNTS = {
  manager: "manager@example.org",
  surveyor: "surveyor@example.org",
  "dive-supervisor": "divesup@example.org",
  dewatering: "dewatering@example.org",
  "resource-monitor": "monitor@example.org",
  outreach: "outreach@example.org",
  viewer: "viewer@example.org",
  admin: "admin@example.org",
} as const;
export type DemoAccount = keyof typeof DEMO_ACCOUNTS;

const LOOPBACK_HOSTS = new Set(["127.0.0.1", "localhost", "[::1]"]);

function isLoopback(url: string): boolean {
  const { protocol, hostname } = new URL(url);
  if (protocol === "data:" || protocol === "blob:" || protocol === "about:") return true;
  return LOOPBACK_HOSTS.has(hostname);
}

export const test = base.extend<{ offlineGuard: void; signIn: (account: DemoAccount) => Promise<void> }>({
  /** Fails any test whose pages ask for anything beyond loopback (fonts, tiles, analytics...). */
  offlineGuard: [
    async ({ page }, use) => {
      const outside: string[] = [];
      page.on("request", (request) => {
        if (!isLoopback(request.url())) outside.push(request.url());
      });
      await page.route((url) => !isLoopback(url.href), (route) => route.abort());
      await use();
      expect(outside, "requests to hosts other than 127.0.0.1").toEqual([]);
    },
    { auto: true },
  ],
  signIn: async ({ page }, use) => {
    await use(async (account) => {
      await signInWithPassword(page, DEMO_ACCOUNTS[account], DEMO_PASSWORD);
      await expect(page).toHaveURL(/\/projects$/);
    });
  },
});
export { expect };

export async function signInWithPassword(page: Page, email: string, password: string) {
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Signs an API request context in with the login form's POST (cookie kept by the context). */
export async function signInRequest(request: APIRequestContext, baseURL: string, email: string, password = DEMO_PASSWORD) {
  const response = await request.post("/login", {
    form: { email, password, next: "" },
    headers: { Origin: new URL(baseURL).origin },
    maxRedirects: 0,
  });
  expect(response.status(), `sign-in of ${email}`).toBe(302);
}

export interface CapturedMail {
  id: string;
  receivedAt: string;
  envelopeTo: string[];
  subject: string;
  text: string;
}

function mailboxDir(): string {
  const dir = process.env.MAILBOX_DIR;
  if (!dir) throw new Error("MAILBOX_DIR is not set: run the browser tests through npm test");
  return dir;
}

/** Waits for the newest message the fake SMTP server stored for `to` (after `since`, if given). */
export async function waitForMail(to: string, since = "", timeoutMs = 10_000): Promise<CapturedMail> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    let files: string[] = [];
    try {
      files = readdirSync(mailboxDir()).filter((file) => file.endsWith(".json"));
    } catch {
      files = [];
    }
    const messages = files
      .map((file) => JSON.parse(readFileSync(join(mailboxDir(), file), "utf8")) as CapturedMail)
      .filter((message) => message.envelopeTo.includes(to) && message.receivedAt > since)
      .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
    if (messages[0]) return messages[0];
    await new Promise((done) => setTimeout(done, 200));
  }
  throw new Error(`no mail for ${to} within ${timeoutMs} ms`);
}

export function linkIn(mail: CapturedMail, path: string): string {
  const match = mail.text.match(new RegExp(`https?://\\S+${path}/\\S+`));
  if (!match) throw new Error(`no ${path} link in mail "${mail.subject}"`);
  return match[0];
}

export function uniqueEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}-${Math.floor(Math.random() * 1e6)}@example.org`;
}

/** The demo project's id, read from the manager's project list. */
export async function demoProjectId(request: APIRequestContext, baseURL: string): Promise<number> {
  await signInRequest(request, baseURL, DEMO_ACCOUNTS.manager);
  const html = await (await request.get("/projects")).text();
  // By the demo project's name: projects are listed by name, and other tests make projects of their own.
  const match = [...html.matchAll(/href="\/projects\/(\d+)"[^>]*>([^<]+)</g)].find((link) => link[2]!.trim() === PROJECT.name);
  if (!match) throw new Error(`the manager sees no project named ${PROJECT.name}`);
  return Number(match[1]);
}

/**
 * Makes a new member of the demo project through the real invitation flow (manager's invite
 * form, the e-mailed link, the set-password form), over HTTP. For tests that need an account
 * of their own (lockouts, password changes) so the demo accounts stay as seeded.
 */
export async function createMember(baseURL: string, email: string, password: string, role = "viewer"): Promise<void> {
  const origin = new URL(baseURL).origin;
  const manager = await playwrightRequest.newContext({ baseURL });
  const projectId = await demoProjectId(manager, baseURL);
  const invited = await manager.post(`/projects/${projectId}/members`, { form: { intent: "invite", email, role }, headers: { Origin: origin } });
  expect(invited.status(), "invitation sent").toBe(200);
  await manager.dispose();
  const link = linkIn(await waitForMail(email), "/invite");
  const invitee = await playwrightRequest.newContext({ baseURL });
  const accepted = await invitee.post(new URL(link).pathname, { form: { name: "Test Member", password }, headers: { Origin: origin }, maxRedirects: 0 });
  expect(accepted.status(), "invitation accepted").toBe(302);
  await invitee.dispose();
}

/**
 * A project of a test's own, with the demo spring's outline, grid and zones, created through the API
 * by a context signed in as the site admin; the demo manager manages it. Answers its id.
 */
export async function createSpringProject(admin: APIRequestContext, baseURL: string, name: string): Promise<number> {
  const created = await admin.post("/api/projects", {
    headers: { Origin: new URL(baseURL).origin },
    data: {
      name, crs: PROJECT.crs, lengthUnit: PROJECT.lengthUnit, timeZone: PROJECT.timeZone,
      workLimit: WORK_LIMIT, grid: { cellSize: GRID.cellSizeFt }, zones: ZONES.map((zone) => ({ name: zone.name, geometry: zone.polygon })), manager: DEMO_ACCOUNTS.manager,
    },
  });
  expect(created.status(), await created.text()).toBe(201);
  return ((await created.json()) as { id: number }).id;
}
