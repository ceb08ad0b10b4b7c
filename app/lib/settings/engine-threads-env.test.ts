import { afterEach, describe, expect, it, vi } from "vitest";

// ENGINE_THREADS as the server reads it (app/lib/env.server.ts), parsed afresh for each case.
async function engineThreads(value: string | undefined): Promise<number> {
  vi.resetModules();
  if (value === undefined) delete process.env.ENGINE_THREADS;
  else process.env.ENGINE_THREADS = value;
  const { getEnv } = await import("./env.server");
  return getEnv().ENGINE_THREADS;
}

describe("ENGINE_THREADS", () => {
  const before = process.env.ENGINE_THREADS;
  afterEach(() => {
    if (before === undefined) delete process.env.ENGINE_THREADS;
    else process.env.ENGINE_THREADS = before;
  });

  it("is one thread when unset, and takes 0 (on the request thread) to 4", async () => {
    expect(await engineThreads(undefined)).toBe(1);
    expect(await engineThreads("0")).toBe(0);
    expect(await engineThreads("2")).toBe(2);
    expect(await engineThreads("4")).toBe(4);
  });

  it("refuses anything else with a clear message", async () => {
    for (const value of ["", "two", "-1", "1.5", "5"]) {
      await expect(engineThreads(value), value).rejects.toThrow(/ENGINE_THREADS/);
    }
  });
});
