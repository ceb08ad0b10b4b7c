import { describe, expect, it } from "vitest";
import { dayPlanState } from "./day-plan-state";

describe("a day plan's state against the project's today (practice: a dive is logged once made)", () => {
  it("calls a later day upcoming even with dives (none can be logged; counted as it stands)", () => {
    expect(dayPlanState("2026-12-04", "2026-12-03", 0)).toBe("upcoming");
  });
  it("calls today today, whatever is logged", () => {
    expect(dayPlanState("2026-12-03", "2026-12-03", 0)).toBe("today");
    expect(dayPlanState("2026-12-03", "2026-12-03", 2)).toBe("today");
  });
  it("splits earlier days by whether any dive was logged", () => {
    expect(dayPlanState("2026-11-30", "2026-12-03", 3)).toBe("dives-logged");
    expect(dayPlanState("2026-11-30", "2026-12-03", 0)).toBe("no-dives-logged");
    // Across a year end, the text order is the calendar order (computed).
    expect(dayPlanState("2026-12-31", "2027-01-01", 0)).toBe("no-dives-logged");
  });
});
