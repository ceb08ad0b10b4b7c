import { describe, expect, it } from "vitest";
import { countdown, localTime, resumeRule } from "./stop-work-banner";

const MINUTE = 60_000;

describe("the banner's countdown to the agency deadline", () => {
  it("counts hours and minutes ahead, and says when the deadline has passed", () => {
    const now = Date.parse("2026-11-04T13:30:00Z");
    // 24 h after a reading 8 min ago: 23 h 52 min left (computed).
    expect(countdown(now + (24 * 60 - 8) * MINUTE, now)).toBe("in 23 h 52 min");
    expect(countdown(now + 5 * MINUTE, now)).toBe("in 5 min");
    expect(countdown(now - 65 * MINUTE, now)).toBe("overdue by 1 h 05 min");
  });

  it("shows times in the project time zone, not the viewer's or UTC", () => {
    // 04:30 UTC on 5 November is 23:30 on 4 November in New York (EST, UTC−5).
    expect(localTime("2026-11-05T04:30:00Z", "America/New_York")).toBe("Nov 4, 23:30");
  });
});

describe("how work resumes, for what is in force", () => {
  it("names the resample for a turbidity stop-work and the animal's leaving for a stand-down, never one for the other", () => {
    expect(resumeRule(1, 0)).toBe("Resume only after an in-limit resample and a recorded resumption.");
    expect(resumeRule(0, 2)).toBe("In-water work resumes only once the animal has left on its own and the permit's wait has passed; never chase or herd it.");
    const both = resumeRule(1, 1);
    expect(both).toMatch(/^Turbidity: resume only after an in-limit resample/);
    expect(both).toMatch(/Wildlife: in-water work resumes only once the animal has left on its own/);
  });
});
