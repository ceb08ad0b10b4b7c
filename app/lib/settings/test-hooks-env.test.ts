import { afterEach, describe, expect, it, vi } from "vitest";

// RECOMPUTE_HOLD_MS as the server reads it (app/lib/settings/env.server.ts), parsed afresh for each
// case: a test setting, honoured outside production and on the browser tests' server only.
const NAMES = ["NODE_ENV", "FIRMSAND_TEST_SERVER", "RECOMPUTE_HOLD_MS"] as const;

async function holdMs(env: Partial<Record<(typeof NAMES)[number], string>>): Promise<number> {
  vi.resetModules();
  for (const name of NAMES) {
    if (env[name] === undefined) delete process.env[name];
    else process.env[name] = env[name];
  }
  const { getTestHooksEnv } = await import("./env.server");
  return getTestHooksEnv().recomputeHoldMs;
}

describe("RECOMPUTE_HOLD_MS", () => {
  const before = Object.fromEntries(NAMES.map((name) => [name, process.env[name]]));
  afterEach(() => {
    vi.restoreAllMocks();
    for (const name of NAMES) {
      if (before[name] === undefined) delete process.env[name];
      else process.env[name] = before[name];
    }
  });

  it("holds nothing when unset, anywhere", async () => {
    expect(await holdMs({ NODE_ENV: "test" })).toBe(0);
    expect(await holdMs({ NODE_ENV: "production", FIRMSAND_TEST_SERVER: "1" })).toBe(0);
  });

  it("is honoured under Vitest and in development", async () => {
    expect(await holdMs({ NODE_ENV: "test", RECOMPUTE_HOLD_MS: "1500" })).toBe(1500);
    expect(await holdMs({ NODE_ENV: "development", RECOMPUTE_HOLD_MS: "250" })).toBe(250);
  });

  it("is ignored in production, with a warning, unless the server is the browser tests' own", async () => {
    const warn = vi.spyOn(process.stderr, "write").mockImplementation(() => true);
    expect(await holdMs({ NODE_ENV: "production", RECOMPUTE_HOLD_MS: "5000" })).toBe(0);
    expect(warn).toHaveBeenCalledWith(expect.stringContaining("RECOMPUTE_HOLD_MS is a test setting and is ignored in production"));
    expect(await holdMs({ NODE_ENV: "production", FIRMSAND_TEST_SERVER: "0", RECOMPUTE_HOLD_MS: "5000" })).toBe(0);
    expect(await holdMs({ NODE_ENV: "production", FIRMSAND_TEST_SERVER: "1", RECOMPUTE_HOLD_MS: "5000" })).toBe(5000);
  });

  it("refuses what is not a whole number of milliseconds from 0 to 60000, naming the setting", async () => {
    for (const value of ["soon", "-1", "1.5", "60001"]) {
      await expect(holdMs({ NODE_ENV: "test", RECOMPUTE_HOLD_MS: value }), value).rejects.toThrow(/RECOMPUTE_HOLD_MS/);
    }
  });
});
