import { describe, expect, it } from "vitest";
import { dateTimeFormat, isAfterLocalDay, localDayOf } from "./local-time";

describe("the project's today (computed: America/New_York is UTC−5 in December)", () => {
  // 2026-12-03 03:30 UTC is 2026-12-02 22:30 in New York.
  const instant = Date.UTC(2026, 11, 3, 3, 30);

  it("reads the local day of an instant in the project's zone, not in UTC", () => {
    expect(localDayOf(instant, "America/New_York")).toBe("2026-12-02");
    expect(localDayOf(instant, "UTC")).toBe("2026-12-03");
  });

  it("counts a day as later only when it is after the local today", () => {
    expect(isAfterLocalDay("2026-12-03", instant, "America/New_York")).toBe(true);
    expect(isAfterLocalDay("2026-12-02", instant, "America/New_York")).toBe(false);
    expect(isAfterLocalDay("2026-11-30", instant, "America/New_York")).toBe(false);
    expect(isAfterLocalDay("2026-12-03", instant, "UTC")).toBe(false);
  });
});

describe("dateTimeFormat (one formatter per locale and options)", () => {
  const options: Intl.DateTimeFormatOptions = { timeZone: "America/New_York", day: "2-digit", month: "short", hour: "2-digit", minute: "2-digit", hour12: false };

  it("keeps one formatter for the same locale and options, and a new one when either differs", () => {
    const first = dateTimeFormat("en-GB", options);
    expect(dateTimeFormat("en-GB", { ...options })).toBe(first);
    expect(dateTimeFormat("en-US", options)).not.toBe(first);
    expect(dateTimeFormat("en-GB", { ...options, timeZone: "UTC" })).not.toBe(first);
  });

  it("formats as a formatter made afresh does (computed: 2026-12-03 03:30 UTC is 2 Dec 22:30 in New York)", () => {
    const instant = new Date(Date.UTC(2026, 11, 3, 3, 30));
    expect(dateTimeFormat("en-GB", options).format(instant)).toBe(new Intl.DateTimeFormat("en-GB", options).format(instant));
    expect(dateTimeFormat("en-GB", options).format(instant)).toBe("02 Dec, 22:30");
  });
});
