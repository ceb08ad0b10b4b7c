import { describe, expect, it } from "vitest";
import { BoundedCache } from "./bounded-cache";

describe("BoundedCache", () => {
  it("computes once per key and returns the same promise after", async () => {
    const cache = new BoundedCache<number>(2);
    let calls = 0;
    const compute = async () => ++calls;
    const first = cache.getOrCompute("a", compute);
    expect(cache.getOrCompute("a", compute)).toBe(first);
    expect(await first).toBe(1);
    expect(calls).toBe(1);
  });

  it("holds at most its capacity and drops the least recently read", async () => {
    const cache = new BoundedCache<string>(2);
    await cache.getOrCompute("a", async () => "a");
    await cache.getOrCompute("b", async () => "b");
    await cache.getOrCompute("a", async () => "a again"); // "a" read last, so "b" is the oldest
    await cache.getOrCompute("c", async () => "c");
    expect(cache.size).toBe(2);
    expect(cache.has("a")).toBe(true);
    expect(cache.has("b")).toBe(false);
    expect(cache.has("c")).toBe(true);
  });

  it("forgets a computation that failed, so the next read tries again", async () => {
    const cache = new BoundedCache<number>(2);
    await expect(cache.getOrCompute("a", async () => { throw new Error("database away"); })).rejects.toThrow("database away");
    await Promise.resolve();
    expect(cache.has("a")).toBe(false);
    expect(await cache.getOrCompute("a", async () => 7)).toBe(7);
  });

  it("drops one project's entries by prefix and keeps the others", async () => {
    const cache = new BoundedCache<number>(4);
    await cache.getOrCompute("1:x", async () => 1);
    await cache.getOrCompute("12:x", async () => 12);
    cache.dropPrefix("1:");
    expect(cache.has("1:x")).toBe(false);
    expect(cache.has("12:x")).toBe(true);
  });

  it("peeks without computing and without marking the entry as read", async () => {
    const cache = new BoundedCache<string>(2);
    expect(cache.peek("a")).toBeUndefined();
    expect(cache.size).toBe(0); // a peek computes nothing
    await cache.getOrCompute("a", async () => "a");
    await cache.getOrCompute("b", async () => "b");
    expect(await cache.peek("a")).toBe("a");
    await cache.getOrCompute("c", async () => "c"); // the peek did not make "a" the most recent
    expect(cache.has("a")).toBe(false);
    expect(cache.has("b")).toBe(true);
  });

  it("drops the entries a predicate picks (a project's older stamps) and keeps the rest", async () => {
    const cache = new BoundedCache<number>(4);
    await cache.getOrCompute("1:old:x", async () => 1);
    await cache.getOrCompute("1:new:x", async () => 2);
    await cache.getOrCompute("2:old:x", async () => 3);
    cache.dropWhere((key) => key.startsWith("1:") && !key.startsWith("1:new:"));
    expect([cache.has("1:old:x"), cache.has("1:new:x"), cache.has("2:old:x")]).toEqual([false, true, true]);
  });
});
