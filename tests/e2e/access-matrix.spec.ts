import { request as playwrightRequest } from "@playwright/test";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test, type DemoAccount } from "./fixtures";

// Who may open which page. Later issues add their routes as rows here.
// "all" = every project role and the site admin; otherwise the accounts listed.
const PROJECT_ROLES: DemoAccount[] = ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "outreach", "viewer"];
const EVERYONE: DemoAccount[] = [...PROJECT_ROLES, "admin"];
const QUANTITY_READERS: DemoAccount[] = ["manager", "surveyor", "dive-supervisor", "viewer", "admin"];

const MATRIX: Array<{ path: string; allowed: DemoAccount[] }> = [
  { path: "/projects", allowed: EVERYONE },
  { path: "/account", allowed: EVERYONE },
  { path: "/projects/{project}", allowed: EVERYONE },
  { path: "/projects/{project}/map", allowed: EVERYONE },
  { path: "/projects/{project}/map/style.json", allowed: EVERYONE },
  { path: "/projects/{project}/plans/2030-01-02", allowed: EVERYONE },
  { path: "/api/projects/{project}/cells", allowed: EVERYONE },
  { path: "/api/projects/{project}/bands?surface=remaining", allowed: EVERYONE },
  { path: "/api/projects/{project}/assignments?date=2030-01-02", allowed: EVERYONE },
  { path: "/projects/{project}/surveys", allowed: EVERYONE },
  { path: "/projects/{project}/members", allowed: ["manager", "admin"] },
  { path: "/projects/{project}/audit", allowed: ["manager", "admin"] },
  // Progress for every member; quantities for those who sign, produce, plan from or fund them
  // (manager, survey technician, dive supervisor, viewer); the public-link page for outreach and the manager.
  { path: "/api/projects/{project}/progress", allowed: EVERYONE },
  { path: "/projects/{project}/quantities", allowed: QUANTITY_READERS },
  { path: "/projects/{project}/quantities/report", allowed: QUANTITY_READERS },
  { path: "/api/projects/{project}/quantities.csv", allowed: QUANTITY_READERS },
  { path: "/api/projects/{project}/quantities.geojson", allowed: QUANTITY_READERS },
  { path: "/projects/{project}/share", allowed: ["manager", "outreach", "admin"] },
  { path: "/dev/mail", allowed: ["admin"] },
];

test.describe("route × role matrix", () => {
  let projectId: number;

  test.beforeAll(async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    projectId = await demoProjectId(context, baseURL!);
    await context.dispose();
  });

  for (const account of EVERYONE) {
    test(`${account}: allowed pages answer 200, the others 403`, async ({ baseURL }) => {
      const context = await playwrightRequest.newContext({ baseURL });
      await signInRequest(context, baseURL!, DEMO_ACCOUNTS[account]);
      for (const { path, allowed } of MATRIX) {
        const url = path.replace("{project}", String(projectId));
        const response = await context.get(url, { maxRedirects: 0 });
        expect(response.status(), `${account} GET ${url}`).toBe(allowed.includes(account) ? 200 : 403);
      }
      await context.dispose();
    });
  }

  test("signed out: every page redirects to sign in and comes back after", async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    for (const { path } of MATRIX) {
      const url = path.replace("{project}", String(projectId));
      const response = await context.get(url, { maxRedirects: 0 });
      expect(response.status(), `signed-out GET ${url}`).toBe(302);
      expect(response.headers().location, url).toBe(`/login?next=${encodeURIComponent(url)}`);
    }
    await context.dispose();
  });

  test("a form posted from another site is refused with 403", async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const foreign = await context.post("/login", {
      form: { email: DEMO_ACCOUNTS.manager, password: "firmsand-demo" },
      headers: { Origin: "http://elsewhere.example" },
      maxRedirects: 0,
    });
    // React Router itself refuses an action whose Origin names another host (400 Bad Request)
    // before Firmsand's own check (403) runs; either way nothing is done and no session is made.
    expect([400, 403]).toContain(foreign.status());
    expect(foreign.headers()["set-cookie"]).toBeUndefined();
    const missing = await context.post("/login", { form: { email: DEMO_ACCOUNTS.manager, password: "firmsand-demo" }, maxRedirects: 0 });
    // A POST without any Origin passes React Router's check; Firmsand's middleware refuses it.
    expect(missing.status()).toBe(403);
    expect(missing.headers()["set-cookie"]).toBeUndefined();
    await context.dispose();
  });

  test("health check reports the database", async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const response = await context.get("/healthz");
    expect(response.status()).toBe(200);
    expect(await response.json()).toEqual({ ok: true, db: "up" });
    await context.dispose();
  });
});
