import { afterEach, describe, expect, it, vi } from "vitest";
import type { Transaction } from "sequelize";
import { noteWrite, writeRevision } from "../../../db/models/write-revision";
import { cachedRead, cachedReadFor, keepCached, peekCached, versionedKey } from "./read-cache.server";

// The read cache keeps an answer while nothing is written and for at most its lifetime (computed:
// each case counts how often the answer is computed).

function counter() {
  let calls = 0;
  return { compute: async () => ({ call: ++calls, list: [calls] }), get calls() { return calls; } };
}

afterEach(() => {
  vi.restoreAllMocks();
  delete process.env.READ_CACHE_SECONDS;
});

describe("cachedRead", () => {
  it("computes once while nothing is written, again after a write", async () => {
    const read = counter();
    const first = await cachedRead("test:a", read.compute);
    expect(await cachedRead("test:a", read.compute)).toBe(first);
    expect(read.calls).toBe(1);
    noteWrite();
    const after = await cachedRead("test:a", read.compute);
    expect(after.call).toBe(2);
  });

  it("moves on again when the write's transaction commits, so a read between statement and commit is not kept", async () => {
    const committed: Array<() => void> = [];
    const transaction = { afterCommit: (callback: () => void) => committed.push(callback) } as unknown as Transaction;
    const before = writeRevision();
    noteWrite(transaction);
    expect(writeRevision()).toBe(before + 1);
    const read = counter();
    await cachedRead("test:b", read.compute); // reads the rows as they were before the commit
    committed.forEach((callback) => callback());
    expect(writeRevision()).toBe(before + 2);
    expect((await cachedRead("test:b", read.compute)).call).toBe(2);
  });

  it("keeps an answer at most its lifetime (5 s by default, READ_CACHE_SECONDS), each key's windows shifted so they do not all end together", async () => {
    const now = vi.spyOn(Date, "now").mockReturnValue(1_000_000_000);
    const read = counter();
    await cachedRead("test:c", read.compute);
    // Within any 5 s the answer is computed at most twice (one window's end), and never kept 5 s.
    for (let step = 1; step < 5; step++) {
      now.mockReturnValue(1_000_000_000 + step * 1000);
      await cachedRead("test:c", read.compute);
    }
    expect(read.calls).toBeLessThanOrEqual(2);
    const before = read.calls;
    now.mockReturnValue(1_000_005_000 + 4000); // 5 s after the last read
    await cachedRead("test:c", read.compute);
    expect(read.calls).toBe(before + 1);
    // Two keys read at the same instant end their windows at different times.
    const ends = ["page:a", "page:b", "page:c", "page:d"].map((key) => {
      const start = versionedKey(key);
      let t = 1_000_000_000;
      while (versionedKey(key) === start) now.mockReturnValue(++t);
      return t;
    });
    expect(new Set(ends).size).toBeGreaterThan(1);
    process.env.READ_CACHE_SECONDS = "0";
    await cachedRead("test:c", read.compute);
    await cachedRead("test:c", read.compute);
    expect(read.calls).toBe(before + 3);
    expect(versionedKey("test:c")).toBeNull();
    process.env.READ_CACHE_SECONDS = "soon";
    expect(() => versionedKey("test:c")).toThrow("READ_CACHE_SECONDS must be a number of seconds");
  });

  it("freezes a kept answer outside production, so a caller cannot change what others read", async () => {
    const kept = await cachedRead("test:d", async () => ({ figures: { total: 3 }, rows: [{ name: "North run" }], bytes: new Uint8Array([1, 2]) }));
    expect(() => { (kept.figures as { total: number }).total = 4; }).toThrow(TypeError);
    expect(() => { kept.rows.push({ name: "Upper run" }); }).toThrow(TypeError);
    expect(kept.bytes[1]).toBe(2); // bytes cannot be frozen and are left as they are
  });

  it("forgets an answer that failed", async () => {
    await expect(cachedRead("test:e", async () => { throw new Error("database away"); })).rejects.toThrow("database away");
    await Promise.resolve();
    expect(await cachedRead("test:e", async () => 7)).toBe(7);
  });
});

describe("cachedReadFor", () => {
  it("uses the cache for GET and HEAD only: an action reads afresh", async () => {
    const read = counter();
    await cachedReadFor(new Request("http://x/p"), "test:f", read.compute);
    await cachedReadFor(new Request("http://x/p", { method: "HEAD" }), "test:f", read.compute);
    expect(read.calls).toBe(1);
    await cachedReadFor(new Request("http://x/p", { method: "POST" }), "test:f", read.compute);
    await cachedReadFor(new Request("http://x/p", { method: "POST" }), "test:f", read.compute);
    expect(read.calls).toBe(3);
  });
});

describe("keepCached and peekCached", () => {
  it("keep a value under the key taken before it was computed, which a write retires", async () => {
    const key = versionedKey("test:g")!;
    keepCached(key, "page");
    expect(await peekCached(versionedKey("test:g")!)).toBe("page");
    noteWrite();
    expect(peekCached(versionedKey("test:g")!)).toBeUndefined();
  });
});
