import { describe, expect, it } from "vitest";
import { AIR_NO_DECOMPRESSION_ROWS, exceedsNoDecompressionLimit, noDecompressionLimit } from "./no-decompression";

// Figures: memory, matching a transcription of US Navy Diving Manual rev. 7 table 9-7 (air
// no-decompression limits); verify against the current US Navy Diving Manual before relying on them.
// Entry rule: published (US Navy Diving Manual): enter at the exact or the next deeper depth.

describe("air no-decompression limits (information only)", () => {
  it("reads each listed depth exactly (memory: USN rev. 7 table 9-7)", () => {
    expect(noDecompressionLimit(25)).toEqual({ kind: "limit", tableDepthFsw: 25, limitMinutes: 1102 });
    expect(noDecompressionLimit(30)).toEqual({ kind: "limit", tableDepthFsw: 30, limitMinutes: 371 });
    expect(noDecompressionLimit(40)).toEqual({ kind: "limit", tableDepthFsw: 40, limitMinutes: 163 });
    expect(noDecompressionLimit(60)).toEqual({ kind: "limit", tableDepthFsw: 60, limitMinutes: 63 });
    expect(noDecompressionLimit(20)).toEqual({ kind: "unlimited", tableDepthFsw: 20 });
  });

  it("enters at the next deeper depth between rows (published rule)", () => {
    expect(noDecompressionLimit(30.1)).toEqual({ kind: "limit", tableDepthFsw: 35, limitMinutes: 232 });
    expect(noDecompressionLimit(20.01)).toEqual({ kind: "limit", tableDepthFsw: 25, limitMinutes: 1102 });
    expect(noDecompressionLimit(4)).toEqual({ kind: "unlimited", tableDepthFsw: 10 });
    expect(noDecompressionLimit(54.5).tableDepthFsw).toBe(55);
  });

  it("never reads a shallower row than the depth (invariant of the rule, checked on a fine sweep)", () => {
    for (let depth = 0; depth <= 60; depth += 0.05) {
      const lookup = noDecompressionLimit(depth);
      expect(lookup.tableDepthFsw).not.toBeNull();
      expect(lookup.tableDepthFsw!).toBeGreaterThanOrEqual(depth - 1e-12);
    }
  });

  it("limits shrink as depth grows (invariant of any no-decompression table)", () => {
    const limited = AIR_NO_DECOMPRESSION_ROWS.filter((row) => row.limitMinutes !== null);
    for (let index = 1; index < limited.length; index++) expect(limited[index].limitMinutes!).toBeLessThan(limited[index - 1].limitMinutes!);
  });

  it("offers no figure beyond the rows held, and refuses nonsense depths", () => {
    expect(noDecompressionLimit(61)).toEqual({ kind: "beyond-table", tableDepthFsw: null });
    expect(() => noDecompressionLimit(-1)).toThrow(/at or below the surface/);
    expect(() => noDecompressionLimit(Number.NaN)).toThrow();
  });

  it("flags a planned bottom time over the limit (memory figures)", () => {
    expect(exceedsNoDecompressionLimit(38, 163)).toBe(false); // 40 fsw row: 163 min
    expect(exceedsNoDecompressionLimit(38, 164)).toBe(true);
    expect(exceedsNoDecompressionLimit(12, 10_000)).toBe(false); // unlimited row
    expect(exceedsNoDecompressionLimit(70, 5)).toBe(true); // beyond the rows held: no figure, flagged
  });
});
