import { describe, expect, it } from "vitest";
import { isAfterLocalDay, localDayOf } from "./local-time";

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
