import { afterEach, describe, expect, it, vi } from "vitest";

// The upload settings as the server reads them (app/lib/env.server.ts through settings.server.ts),
// parsed afresh for each case.
const NAMES = ["UPLOAD_DIR", "UPLOAD_MAX_BYTES", "UPLOAD_RETENTION_HOURS"] as const;
const before = Object.fromEntries(NAMES.map((name) => [name, process.env[name]]));

async function settings(values: Partial<Record<(typeof NAMES)[number], string>>) {
  vi.resetModules();
  for (const name of NAMES) {
    if (values[name] === undefined) delete process.env[name];
    else process.env[name] = values[name];
  }
  const { uploadSettings } = await import("./settings.server");
  return uploadSettings();
}

describe("upload settings", () => {
  afterEach(() => {
    for (const name of NAMES) {
      if (before[name] === undefined) delete process.env[name];
      else process.env[name] = before[name];
    }
  });

  it("default to .data/uploads, 200 MB and 24 hours", async () => {
    const value = await settings({});
    expect(value.UPLOAD_DIR).toMatch(/[/\\]\.data[/\\]uploads$/);
    expect(value.UPLOAD_MAX_BYTES).toBe(200 * 1024 * 1024);
    expect(value.UPLOAD_RETENTION_HOURS).toBe(24);
  });

  it("take a directory, a size and a retention of 1 hour to 90 days", async () => {
    const value = await settings({ UPLOAD_DIR: "/var/lib/firmsand/uploads", UPLOAD_MAX_BYTES: "1048576", UPLOAD_RETENTION_HOURS: "1.5" });
    expect(value).toEqual({ UPLOAD_DIR: "/var/lib/firmsand/uploads", UPLOAD_MAX_BYTES: 1048576, UPLOAD_RETENTION_HOURS: 1.5 });
    expect((await settings({ UPLOAD_RETENTION_HOURS: "2160" })).UPLOAD_RETENTION_HOURS).toBe(2160);
  });

  it("refuse a retention that is not a number of hours between 1 and 2160, with a clear message", async () => {
    for (const value of ["", "0", "0.5", "-3", "two days", "2161"]) {
      await expect(settings({ UPLOAD_RETENTION_HOURS: value }), value).rejects.toThrow(/UPLOAD_RETENTION_HOURS/);
    }
    await expect(settings({ UPLOAD_MAX_BYTES: "lots" })).rejects.toThrow(/UPLOAD_MAX_BYTES/);
    await expect(settings({ UPLOAD_DIR: "" })).rejects.toThrow(/UPLOAD_DIR/);
  });
});
