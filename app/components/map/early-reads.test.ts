import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

// The module keeps its reads per page: a fresh copy for each test.
async function freshModule() {
  vi.resetModules();
  return { ...(await import("./early-reads")), ...(await import("./map-urls")) };
}

function onPage(pathname: string) {
  vi.stubGlobal("window", { location: { pathname, origin: "https://firmsand.example.org" } });
}

describe("the map page's early reads", () => {
  let fetched: Array<{ url: string; init?: RequestInit }>;
  beforeEach(() => {
    fetched = [];
    vi.stubGlobal("fetch", (url: string, init?: RequestInit) => {
      fetched.push({ url, init });
      return Promise.resolve(new Response(`answer to ${url}`));
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    vi.useRealTimers();
  });

  it("on the map page, starts its style and cells reads, each taken once by the code that would have asked", async () => {
    onPage("/projects/12/map");
    const reads = await freshModule();
    reads.startMapPageReads();
    expect(fetched.map((read) => read.url)).toEqual(["https://firmsand.example.org/projects/12/map/style.json", "/api/projects/12/cells"]);
    // The cells are read as the page reads them: never from the browser's cache.
    expect(fetched[1].init).toEqual({ cache: "no-store" });
    const style = reads.takeEarlyRead(reads.mapStyleUrl("https://firmsand.example.org", 12));
    expect(await (await style)!.text()).toBe("answer to https://firmsand.example.org/projects/12/map/style.json");
    expect(reads.takeEarlyRead(reads.mapStyleUrl("https://firmsand.example.org", 12))).toBeNull();
    expect(reads.takeEarlyRead(reads.mapCellsUrl(12))).not.toBeNull();
    expect(reads.takeEarlyRead(reads.mapCellsUrl(12))).toBeNull();
  });

  it("does nothing on any other page, nor on the server", async () => {
    for (const path of ["/projects/12", "/projects/12/map/style.json", "/projects/12/mapping", "/projects/x/map", "/"]) {
      onPage(path);
      const reads = await freshModule();
      reads.startMapPageReads();
      expect(reads.takeEarlyRead(reads.mapCellsUrl(12))).toBeNull();
    }
    vi.unstubAllGlobals();
    vi.stubGlobal("fetch", () => { throw new Error("no read on the server"); });
    const reads = await freshModule();
    expect(() => reads.startMapPageReads()).not.toThrow();
    expect(fetched).toEqual([]);
  });

  it("an early read no longer fresh is not taken: the page asks again", async () => {
    vi.useFakeTimers();
    onPage("/projects/3/map/");
    const reads = await freshModule();
    reads.startMapPageReads();
    vi.advanceTimersByTime(10_001);
    expect(reads.takeEarlyRead(reads.mapCellsUrl(3))).toBeNull();
  });

  it("a failed early read is handed over as it failed, never left unhandled", async () => {
    vi.stubGlobal("fetch", () => Promise.reject(new TypeError("network down")));
    onPage("/projects/4/map");
    const reads = await freshModule();
    reads.startMapPageReads();
    await expect(reads.takeEarlyRead(reads.mapCellsUrl(4))!).rejects.toThrow("network down");
  });
});
