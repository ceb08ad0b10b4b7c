import type { Browser, Page } from "@playwright/test";
import { PROJECT } from "../../sample-data/scenario";
import { expect, test } from "./fixtures";

// Pages stand still when their scripts start. A part drawn one size by the server and another once
// the browser has measured it (a chart sized by its panel's width, a key shown or not) moves
// everything below it at hydration, and a tap aimed at a button as the page loads lands elsewhere.
// Each page is opened with scripts off (as the server drew it) and with them on (once settled);
// every heading and button (a repeated one told apart by its order) must stand within 2 px of its
// first place.

const SIZES = [{ width: 1440, height: 900 }, { width: 390, height: 844 }] as const;
// Not the settings page: its grid preview is laid out in the browser after the page loads (it says
// "Laying out the grid…" until then), so the counts under it arrive later by design.
const PAGES = ["", "/surveys", "/quantities", "/water-quality", "/dewatering", "/days", "/plans", "/finds", "/members", "/audit"];

type Spot = { key: string; x: number; y: number };

function spotsOf(page: Page): Promise<Spot[]> {
  return page.evaluate(() => {
    const shown = [...document.querySelectorAll("main h2, main h3, main button")].filter((element) => (element as HTMLElement).offsetParent !== null);
    const spots = shown.map((element) => {
      const box = element.getBoundingClientRect();
      return { key: `${element.tagName.toLowerCase()} “${(element.textContent ?? "").trim().replace(/\s+/g, " ").slice(0, 60)}”`, x: Math.round(box.left), y: Math.round(box.top + window.scrollY) };
    });
    // A heading or button that appears more than once is told apart by its place in the page's order.
    const seen = new Map<string, number>();
    return spots.map((spot) => {
      const count = (seen.get(spot.key) ?? 0) + 1;
      seen.set(spot.key, count);
      return count === 1 ? spot : { ...spot, key: `${spot.key} (${count})` };
    });
  });
}

async function withoutScripts(browser: Browser, page: Page, baseURL: string) {
  return browser.newContext({ javaScriptEnabled: false, baseURL, viewport: page.viewportSize(), storageState: await page.context().storageState() });
}

for (const size of SIZES) {
  test(`the project's pages stand still when their scripts start (${size.width} × ${size.height})`, async ({ page, signIn, browser, baseURL }) => {
    test.setTimeout(120_000);
    await page.setViewportSize(size);
    await signIn("manager");
    await page.getByRole("link", { name: PROJECT.name }).click();
    await expect(page).toHaveURL(/\/projects\/\d+$/);
    const base = new URL(page.url()).pathname;
    const context = await withoutScripts(browser, page, baseURL!);
    const plain = await context.newPage();
    const moved: string[] = [];
    try {
      for (const path of PAGES) {
        // Other tests write to the demo project meanwhile (a stop-work banner, a recompute): the
        // page drawn without scripts is read again after the settled one, and the pair is taken
        // only when the server drew the same page both times.
        let compared = false;
        for (let attempt = 0; attempt < 4 && !compared; attempt++) {
          expect((await plain.goto(`${base}${path}`))?.status(), path).toBe(200);
          const drawn = await spotsOf(plain);
          expect(drawn.length, `${path}: headings and buttons drawn`).toBeGreaterThan(0);
          await page.goto(`${base}${path}`);
          await page.waitForLoadState("networkidle");
          const settledSpots = await spotsOf(page);
          await plain.reload();
          if (JSON.stringify(await spotsOf(plain)) !== JSON.stringify(drawn)) continue;
          compared = true;
          const settled = new Map(settledSpots.map((spot) => [spot.key, spot]));
          if (path === "") {
            await plain.screenshot({ path: test.info().outputPath(`overview-drawn-${size.width}.png`), fullPage: true });
            await page.screenshot({ path: test.info().outputPath(`overview-settled-${size.width}.png`), fullPage: true });
          }
          for (const spot of drawn) {
            const now = settled.get(spot.key);
            if (now && (Math.abs(now.x - spot.x) > 2 || Math.abs(now.y - spot.y) > 2)) moved.push(`${path || "/"}: ${spot.key} drawn at ${spot.x},${spot.y}, at ${now.x},${now.y} once the scripts ran`);
          }
        }
        expect(compared, `${path}: the server drew the page the same way twice running`).toBe(true);
      }
    } finally {
      await context.close();
    }
    expect(moved, moved.join("\n")).toEqual([]);
  });
}
