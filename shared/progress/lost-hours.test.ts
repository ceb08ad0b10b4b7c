import { describe, expect, it } from "vitest";
import { instantOfLocal } from "../local-time";
import { dayNumber } from "./calendar-days";
import { forecastFinish } from "./forecast";
import { lostWorkingDayShares } from "./lost-hours";
import { productionIntervals } from "./production";
import { workingCalendar, workingDaysBetween } from "./working-days";

// Hours lost to stop-work events and stand-downs come out of the working days that production and
// the forecast divide by. Every figure below is worked by hand (computed).
const zone = "America/New_York";
const hours = { startMinutes: 7 * 60, endMinutes: 19 * 60 }; // a 12-hour working day
const local = (day: string, clock: string) => instantOfLocal(day, Number(clock.slice(0, 2)) * 60 + Number(clock.slice(3, 5)), zone);

describe("lost shares of working days", () => {
  it("a stop-work 09:00–12:00 and a stand-down 11:00–13:00 on Wed 2031-05-07 overlap: 4 h lost once, a third of the 12-h day", () => {
    const lost = lostWorkingDayShares([
      { startMs: local("2031-05-07", "09:00"), endMs: local("2031-05-07", "12:00") },
      { startMs: local("2031-05-07", "11:00"), endMs: local("2031-05-07", "13:00") },
    ], hours, zone);
    expect([...lost]).toEqual([[dayNumber("2031-05-07"), 4 / 12]]);
  });
  it("a stop-work from 17:00 to 09:00 next day loses 2 h of each day (19:00–07:00 nobody works)", () => {
    const lost = lostWorkingDayShares([{ startMs: local("2031-05-07", "17:00"), endMs: local("2031-05-08", "09:00") }], hours, zone);
    expect([...lost]).toEqual([[dayNumber("2031-05-07"), 2 / 12], [dayNumber("2031-05-08"), 2 / 12]]);
  });
  it("a stoppage wholly outside the working hours loses nothing (negative control)", () => {
    expect(lostWorkingDayShares([{ startMs: local("2031-05-07", "19:30"), endMs: local("2031-05-07", "22:00") }], hours, zone).size).toBe(0);
  });
});

describe("production and forecast count the lost hours", () => {
  // Surveys Mon 2031-05-05 and Fri 2031-05-09: the interval's weekdays are Tue, Wed, Thu, Fri (4);
  // Wednesday lost a third (above), so 4 − 1/3 = 11/3 working days; 110 yd³ removed → 30 yd³/day.
  const lost = lostWorkingDayShares([
    { startMs: local("2031-05-07", "09:00"), endMs: local("2031-05-07", "12:00") },
    { startMs: local("2031-05-07", "11:00"), endMs: local("2031-05-07", "13:00") },
  ], hours, zone);
  const dates = ["2031-05-05", "2031-05-09"];
  const removed = [0, 110];

  it("working days: 11/3 instead of 4; the rate 30 yd³ a day instead of 27.5", () => {
    expect(workingDaysBetween(workingCalendar([], lost), "2031-05-05", "2031-05-09")).toBeCloseTo(11 / 3, 12);
    const [interval] = productionIntervals(dates, removed, workingCalendar([], lost));
    expect(interval.volumePerWorkingDay).toBeCloseTo(30, 9);
    const [without] = productionIntervals(dates, removed, workingCalendar([]));
    expect(without.volumePerWorkingDay).toBe(27.5); // 110 / 4, the negative control
  });

  it("on the dive-log basis, a lost share counts only on a day that was worked: 3 logged days less Wednesday's third", () => {
    const calendar = workingCalendar(["2031-05-06", "2031-05-07", "2031-05-08"], lost);
    expect(workingDaysBetween(calendar, "2031-05-05", "2031-05-09")).toBeCloseTo(3 - 1 / 3, 12);
    const notWorked = workingCalendar(["2031-05-06", "2031-05-08"], lost); // no dive on Wednesday: nothing to take off
    expect(workingDaysBetween(notWorked, "2031-05-05", "2031-05-09")).toBe(2);
  });

  it("the forecast: 300 yd³ left at 30 yd³ a day is 10 weekdays (11 at 27.5 without the lost hours)", () => {
    const options = { finishedBelowVolume: 0.5, changeThresholdVolume: 1, windowCalendarDays: 42 };
    const withLost = forecastFinish(dates, removed, 300, { ...options, lostShares: lost });
    expect(withLost.volumePerWorkingDay).toBeCloseTo(30, 9);
    expect(withLost.workingDaysLeft).toBe(10);
    expect(withLost.finishDate).toBe("2031-05-23"); // 10 weekdays after Fri 9 May (computed)
    const plain = forecastFinish(dates, removed, 300, options);
    expect(plain.workingDaysLeft).toBe(11); // ceil(300 / 27.5) = ceil(10.9) (computed)
  });
});
