import { describe, expect, it } from "vitest";
import { instantOfClock, mergeSpans, unionHours } from "./local-periods";

// Wall-clock times of a report's local day as instants, and hours counted once where periods overlap.
// published (US Energy Policy Act of 2005, 15 U.S.C. § 260a): daylight time begins at 02:00 on the
// second Sunday of March and ends at 02:00 on the first Sunday of November; New York is UTC−5 in
// standard time and UTC−4 in daylight time (published: IANA tz database, America/New_York).

const TZ = "America/New_York";
const HOUR = 3_600_000;

describe("instantOfClock", () => {
  it("reads a local time on an ordinary summer day as UTC−4", () => {
    expect(new Date(instantOfClock("2031-06-10", "13:10", TZ)!).toISOString()).toBe("2031-06-10T17:10:00.000Z");
    // 24:00 ends the day: the next day's midnight.
    expect(new Date(instantOfClock("2031-06-10", "24:00", TZ)!).toISOString()).toBe("2031-06-11T04:00:00.000Z");
  });

  it("has no 02:00–02:59 on the day the clocks go forward (2031-03-09), and that day lasts 23 hours", () => {
    expect(instantOfClock("2031-03-09", "02:30", TZ)).toBeNull();
    expect(instantOfClock("2031-03-09", "02:00", TZ)).toBeNull();
    expect(new Date(instantOfClock("2031-03-09", "01:59", TZ)!).toISOString()).toBe("2031-03-09T06:59:00.000Z");
    expect(new Date(instantOfClock("2031-03-09", "03:00", TZ)!).toISOString()).toBe("2031-03-09T07:00:00.000Z");
    expect((instantOfClock("2031-03-09", "24:00", TZ)! - instantOfClock("2031-03-09", "00:00", TZ)!) / HOUR).toBe(23);
  });

  it("reads the repeated hour of the day the clocks go back (2031-11-02) as its first occurrence, and that day lasts 25 hours", () => {
    // 01:30 EDT (UTC−4) comes first; 01:30 EST (UTC−5) an hour later.
    expect(new Date(instantOfClock("2031-11-02", "01:30", TZ)!).toISOString()).toBe("2031-11-02T05:30:00.000Z");
    expect((instantOfClock("2031-11-02", "24:00", TZ)! - instantOfClock("2031-11-02", "00:00", TZ)!) / HOUR).toBe(25);
    // 00:00 to 03:00 on the wall is four hours of time.
    expect((instantOfClock("2031-11-02", "03:00", TZ)! - instantOfClock("2031-11-02", "00:00", TZ)!) / HOUR).toBe(4);
  });
});

describe("unionHours", () => {
  const span = (from: number, to: number) => ({ startMs: from * HOUR, endMs: to * HOUR });

  it("counts an overlap once, sums disjoint spans, and joins touching ones (hand-computed)", () => {
    // 13–15 and 14–16.5 cover 13–16.5: 3.5 h, not 2 + 2.5 = 4.5.
    expect(unionHours([span(13, 15), span(14, 16.5)])).toBe(3.5);
    // A span inside another adds nothing.
    expect(unionHours([span(8, 12), span(9, 10)])).toBe(4);
    // Disjoint: 1 + 2.
    expect(unionHours([span(8, 9), span(10, 12)])).toBe(3);
    expect(mergeSpans([span(10, 12), span(8, 10)])).toEqual([span(8, 12)]);
    // Empty or backwards spans count nothing; no spans, no hours.
    expect(unionHours([span(5, 5), span(7, 6)])).toBe(0);
    expect(unionHours([])).toBe(0);
  });

  it("is the sum when nothing overlaps and never more than the covered stretch (invariant)", () => {
    const spans = [span(1, 2), span(3, 7), span(4, 5), span(6, 9), span(12, 13)];
    // Covered: 1–2, 3–9, 12–13 = 1 + 6 + 1 = 8.
    expect(unionHours(spans)).toBe(8);
    expect(unionHours(spans)).toBeLessThanOrEqual(spans.reduce((sum, item) => sum + (item.endMs - item.startMs) / HOUR, 0));
    expect(unionHours([...spans].reverse())).toBe(8);
  });
});
