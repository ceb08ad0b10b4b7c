import { test, expect, demoProjectId } from "./fixtures";

// Issue 12 ("Hardening"), the items seen from outside the production server.

test.describe("hardening 12: standard response headers", () => {
  test("every answer says nosniff; pages are not framed, the share page may be", async ({ request, baseURL }) => {
    const origin = new URL(baseURL!).origin;
    const login = await request.get("/login");
    expect(login.headers()["x-content-type-options"]).toBe("nosniff");
    expect(login.headers()["referrer-policy"]).toBe("same-origin");
    expect(login.headers()["x-frame-options"]).toBe("DENY");
    expect(login.headers()["content-security-policy"]).toContain("frame-ancestors 'none'");

    const asset = (await login.text()).match(/\/assets\/[^"]+\.js/)?.[0];
    expect(asset, "a script of the page").toBeDefined();
    expect((await request.get(asset!)).headers()["x-content-type-options"]).toBe("nosniff");

    const projectId = await demoProjectId(request, baseURL!);
    const created = await request.post(`/api/projects/${projectId}/share-links`, { data: { name: "hardening headers" }, headers: { Origin: origin } });
    expect(created.status()).toBe(201);
    const { url } = (await created.json()) as { url: string };
    const share = await request.get(new URL(url).pathname);
    expect(share.status()).toBe(200);
    expect(share.headers()["x-content-type-options"]).toBe("nosniff");
    expect(share.headers()["x-frame-options"]).toBeUndefined();
    expect(share.headers()["content-security-policy"]).toBe("frame-ancestors *");
    // The share page's own stricter policy comes last, and the last policy a browser knows wins.
    expect(share.headers()["referrer-policy"]?.split(/\s*,\s*/).at(-1)).toBe("no-referrer");
  });
});
