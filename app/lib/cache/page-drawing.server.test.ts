import { describe, expect, it } from "vitest";
import { dataFingerprint, drawnOnce } from "./page-drawing.server";

// A page is sent again as drawn only when its loaders' data has the same fingerprint: two values a
// page could draw differently must never share one.

describe("dataFingerprint", () => {
  const overview = () => ({
    root: { user: { id: 7, name: "Hollis Brandt", email: "viewer@example.org", isSiteAdmin: false } },
    "routes/projects.$projectId": { stoppages: { stopWork: [], standDowns: [], nowMs: null, timeZone: "America/New_York" } },
    "routes/projects.$projectId._index": { zones: [{ id: 1, name: "North run" }], drawnOn: new Date("2026-11-12T15:00:00Z"), shares: new Map([[1, 0.25]]) },
  });

  it("is the same for the same content read twice, built apart", () => {
    expect(dataFingerprint(overview())).toBe(dataFingerprint(overview()));
    expect(dataFingerprint(overview())).toMatch(/^[A-Za-z0-9_-]{43}$/);
  });

  it("differs for every change a page could show", () => {
    const base = dataFingerprint(overview());
    const changed = [
      (data: ReturnType<typeof overview>) => { data.root.user.name = "Hollis Brandt "; },
      (data: ReturnType<typeof overview>) => { data["routes/projects.$projectId._index"].zones[0]!.id = 2; },
      (data: ReturnType<typeof overview>) => { data["routes/projects.$projectId._index"].drawnOn = new Date("2026-11-12T15:00:01Z"); },
      // A Map's content (JSON.stringify would write {} for both).
      (data: ReturnType<typeof overview>) => { data["routes/projects.$projectId._index"].shares.set(1, 0.5); },
      (data: ReturnType<typeof overview>) => { data["routes/projects.$projectId"].stoppages.nowMs = 1796350913365 as never; },
      (data: ReturnType<typeof overview>) => { (data.root.user as Record<string, unknown>).isSiteAdmin = undefined; },
      (data: ReturnType<typeof overview>) => { delete (data.root.user as Record<string, unknown>).isSiteAdmin; },
    ];
    for (const [index, change] of changed.entries()) {
      const data = overview();
      change(data);
      expect(dataFingerprint(data), `change ${index}`).not.toBe(base);
    }
  });

  it("tells apart values that written out plainly would read the same", () => {
    const pairs: Array<[unknown, unknown]> = [
      [["ab", "c"], ["a", "bc"]],
      [{ a: "1" }, { a: 1 }],
      [0, -0],
      [null, undefined],
      [[undefined], []],
      [new Set([1]), [1]],
      [new Map([["a", 1]]), { a: 1 }],
      [new Date(0), 0],
      [{ a: 1, b: 2 }, { b: 2, a: 1 }], // a page listing the entries draws them in this order
      [new Uint8Array([1, 2]), new Uint8Array([1, 3])],
      [1n, 1],
    ];
    for (const [one, other] of pairs) expect(dataFingerprint(one), JSON.stringify([String(one), String(other)])).not.toBe(dataFingerprint(other));
  });

  it("gives none for content it cannot read, so such a page is drawn every time", () => {
    class Figures { constructor(readonly total = 1) {} }
    const loop: Record<string, unknown> = { a: 1 };
    loop.self = loop;
    for (const value of [{ later: Promise.resolve(1) }, { figures: new Figures() }, { run: () => 1 }, { tag: Symbol("x") }, loop]) {
      expect(dataFingerprint(value)).toBeNull();
    }
    // The same object twice (not inside itself) is read both times.
    const zone = { id: 1 };
    expect(dataFingerprint({ first: zone, second: zone })).toBe(dataFingerprint({ first: { id: 1 }, second: { id: 1 } }));
  });
});

describe("drawnOnce", () => {
  it("draws once per reader and data, says when it drew, and keeps no failed drawing", async () => {
    let draws = 0;
    const draw = async () => `<p>drawing ${++draws}</p>`;
    const reader = `reader-${Math.random()}`;
    const first = await drawnOnce(reader, "data-1", draw);
    expect(first.html).toBe("<p>drawing 1</p>");
    expect(first.drawnMs).toBeGreaterThanOrEqual(0);
    expect(await drawnOnce(reader, "data-1", draw)).toEqual({ html: "<p>drawing 1</p>", drawnMs: null });
    // Other data, another reader: drawn for itself.
    expect((await drawnOnce(reader, "data-2", draw)).html).toBe("<p>drawing 2</p>");
    expect((await drawnOnce(`${reader}-other`, "data-1", draw)).html).toBe("<p>drawing 3</p>");

    const failing = async () => { throw new Error("the page threw while drawing"); };
    await expect(drawnOnce(reader, "data-3", failing)).rejects.toThrow("the page threw while drawing");
    expect(await drawnOnce(reader, "data-3", draw)).toMatchObject({ html: "<p>drawing 4</p>" });
  });
});
