import { describe, expect, it } from "vitest";
import { checkTimes, surveyDateProblem } from "./time-checks";

// Practice: survey times are written as ISO 8601 (with or without an offset) or US month/day/year;
// "now" is fixed here: 2026-12-03 01:00 UTC, which is 2026-12-02 20:00 in America/New_York (EST, UTC−5).
const NOW = Date.UTC(2026, 11, 3, 1, 0);

function check(times: string[], now: number | null = NOW) {
  return checkTimes({ sourceRow: Uint32Array.from(times, (_, index) => index + 2), time: times, header: "time", fileTimeZone: "America/New_York", projectTimeZone: "America/New_York", surveyedOn: "2026-12-02", now });
}

describe("checkTimes", () => {
  it("takes the usual forms", () => {
    expect(check(["2026-09-08T06:50:00-04:00", "2026-09-08 06:50", "2026-09-08", "9/8/2026 6:50 AM", "06:50:00", "2026-12-02T19:55:00", ""])).toEqual([]);
  });

  it("flags words relative to the day they were typed, naming row and column", () => {
    const problems = check(["2026-09-08", "yesterday", "Today", "2 days ago", "now"]);
    expect(problems.map((problem) => [problem.row, problem.column, problem.rule])).toEqual([[3, "time", "date and time"], [4, "time", "date and time"], [5, "time", "date and time"], [6, "time", "date and time"]]);
    expect(problems[0].message).toBe('time "yesterday" is a word relative to the day it was typed, not a date and time: once stored, nobody can tell which day it meant. Write the date and time, such as 2026-12-02T07:30:00 or 2026-12-02 07:30');
  });

  it("flags what cannot be read, and impossible dates", () => {
    expect(check(["Sept 8", "2026-02-30", "25:10", "13/13/2026"]).map((problem) => problem.row)).toEqual([2, 3, 4, 5]);
  });

  it("flags times in the future in the project's time zone, with ten minutes of slack", () => {
    // computed: 20:05 EST is 01:05 UTC, within the slack; 20:30 EST is 01:30 UTC, 30 min ahead; 2026-12-03 is tomorrow in New York.
    const problems = check(["2026-12-02T20:05:00", "2026-12-02T20:30:00", "2026-12-03", "2026-12-03T01:30:00Z", "2026-12-02"]);
    expect(problems.map((problem) => problem.row)).toEqual([3, 4, 5]);
    expect(problems[0].message).toBe('time "2026-12-02T20:30:00" is in the future: it is now 2026-12-02 20:00 in the project\'s time zone (America/New_York). Check the date and the field computer\'s clock');
    expect(check(["2099-01-01"], null)).toEqual([]); // no clock: only the forms are checked
  });
});

describe("surveyDateProblem", () => {
  it("allows today in the project's time zone and refuses tomorrow", () => {
    expect(surveyDateProblem("2026-12-02", "America/New_York", NOW)).toBeNull();
    expect(surveyDateProblem("2026-12-03", "America/New_York", NOW)).toMatch(/^The survey date 2026-12-03 is after today \(2026-12-02 in the project's time zone, America\/New_York\)/);
    expect(surveyDateProblem("2026-12-03", "UTC", NOW)).toBeNull();
  });
});
