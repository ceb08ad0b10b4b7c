import { describe, expect, it } from "vitest";
import { lastDayOfMonth, monthName, monthPeriod, monthsWithPeriods } from "./named-period";

// The surveys in force of a project, by date (the demo's dates): baseline in September, then
// progress surveys on 29 September, 27 October, 17 and 24 November.
const surveys = [{ surveyedOn: "2026-09-08" }, { surveyedOn: "2026-09-29" }, { surveyedOn: "2026-10-27" }, { surveyedOn: "2026-11-17" }, { surveyedOn: "2026-11-24" }];

describe("a month as a pay period", () => {
  it("runs from the survey that closed the month before to the month's last survey (computed by hand)", () => {
    // October: closed September with the survey of 29 September (position 1), ends 27 October (2).
    expect(monthPeriod(surveys, "2026-10")).toEqual({ from: 1, to: 2 });
    // November: from 27 October to the last November survey, 24 November.
    expect(monthPeriod(surveys, "2026-11")).toEqual({ from: 2, to: 4 });
    // September: the project began within it, so it runs from the baseline.
    expect(monthPeriod(surveys, "2026-09")).toEqual({ from: 0, to: 1 });
  });

  it("says why a month has no period: nothing surveyed in it, or before the first survey", () => {
    expect(monthPeriod(surveys, "2026-12").error).toContain("no survey in force was made in December 2026 after the one of 2026-11-24");
    expect(monthPeriod(surveys, "2026-08").error).toContain("by the end of August 2026");
    expect(monthPeriod(surveys, "2026-13").error).toContain("YYYY-MM");
    expect(monthPeriod([{ surveyedOn: "2026-09-08" }], "2026-09").error).toContain("no period of its own");
  });

  it("lists the months that have a period, newest first, and names them", () => {
    expect(monthsWithPeriods(surveys)).toEqual(["2026-11", "2026-10", "2026-09"]);
    expect(monthName("2026-10")).toBe("October 2026");
  });

  it("knows the length of each month, February of a leap year included (Gregorian calendar)", () => {
    expect(lastDayOfMonth("2028-02")).toBe("2028-02-29");
    expect(lastDayOfMonth("2026-02")).toBe("2026-02-28");
    expect(lastDayOfMonth("2026-04")).toBe("2026-04-30");
    expect(lastDayOfMonth("2026-12")).toBe("2026-12-31");
  });
});
