import { describe, expect, it } from "vitest";
import { dayNumber, isWeekday, isoDateOf } from "./calendar-days";
import { forecastFinish } from "./forecast";
import { percentCellsAtFirmSand, percentCompleteByVolume, percentDifference } from "./percent-complete";
import { productionIntervals } from "./production";
import { progressSeries } from "./time-series";
import { addWeekdays, intervalBasis, workingCalendar, workingDaysBetween } from "./working-days";

const weekdays = workingCalendar([]);

/** Independent count: walk every day and ask the platform's own calendar. */
function bruteWeekdays(fromDate: string, toDate: string): number {
  let count = 0;
  for (let time = Date.parse(`${fromDate}T00:00:00Z`) + 86_400_000; time <= Date.parse(`${toDate}T00:00:00Z`); time += 86_400_000) {
    const weekday = new Date(time).getUTCDay();
    if (weekday !== 0 && weekday !== 6) count++;
  }
  return count;
}

describe("calendar", () => {
  it("knows a Saturday and a Monday", () => {
    // published: 1 January 2000 was a Saturday; 3 January 2000 a Monday (Gregorian calendar)
    expect(isWeekday(dayNumber("2000-01-01"))).toBe(false);
    expect(isWeekday(dayNumber("2000-01-03"))).toBe(true);
    expect(isoDateOf(dayNumber("2026-11-01"))).toBe("2026-11-01"); // the day US daylight time ends: no shift
  });

  it("refuses a date that is not YYYY-MM-DD", () => {
    expect(() => dayNumber("09/08/2026")).toThrow(/YYYY-MM-DD/);
  });
});

describe("working days between surveys", () => {
  it("counts five weekdays in the week after a Saturday", () => {
    // published: 2000-01-01 Saturday, so 2000-01-03 … 2000-01-07 are Monday to Friday
    expect(workingDaysBetween(weekdays, "2000-01-01", "2000-01-08")).toBe(5);
    expect(workingDaysBetween(weekdays, "2000-01-08", "2000-01-01")).toBe(0);
  });

  it("agrees with a day-by-day walk over many spans (invariant)", () => {
    // computed: an independent day-by-day count with the platform's Date
    for (let start = 0; start < 14; start++) {
      for (let length = 0; length < 60; length += 3) {
        const from = isoDateOf(dayNumber("2026-09-01") + start);
        const to = isoDateOf(dayNumber(from) + length);
        expect(workingDaysBetween(weekdays, from, to), `${from} → ${to}`).toBe(bruteWeekdays(from, to));
      }
    }
  });

  it("counts dive-plan dates after the first survey up to and including the second", () => {
    // practice: a survey measures the work done after the previous survey
    const plans = workingCalendar(["2026-09-10", "2026-09-08", "2026-09-12", "2026-09-12", "2026-09-20"]);
    expect(plans.basis).toBe("dive-plans");
    expect(workingDaysBetween(plans, "2026-09-08", "2026-09-12")).toBe(2);
    expect(workingDaysBetween(plans, "2026-09-12", "2026-09-30")).toBe(1);
    // practice: an interval without any plan (before plans were kept) falls back to weekdays
    expect(workingDaysBetween(plans, "2026-10-01", "2026-10-08")).toBe(bruteWeekdays("2026-10-01", "2026-10-08"));
    expect(intervalBasis(plans, "2026-10-01", "2026-10-08")).toBe("weekdays");
    expect(intervalBasis(plans, "2026-09-08", "2026-09-12")).toBe("dive-plans");
  });

  it("adds weekdays so that counting them back gives the same number (invariant)", () => {
    // computed: addWeekdays is the inverse of workingDaysBetween on the weekday calendar
    for (let start = 0; start < 7; start++) {
      const from = isoDateOf(dayNumber("2026-11-23") + start);
      for (let count = 0; count < 40; count++) {
        const to = addWeekdays(from, count);
        expect(workingDaysBetween(weekdays, from, to)).toBe(count);
        if (count > 0) expect(isWeekday(dayNumber(to))).toBe(true);
      }
    }
  });
});

describe("series, production and forecast", () => {
  const snapshots = [
    { surveyedOn: "2026-09-29", removedVolume: 300, remainingVolume: 700, zones: [{ zoneId: 1, removedVolume: 300, remainingVolume: 100 }] },
    { surveyedOn: "2026-09-08", removedVolume: 0, remainingVolume: 1000, zones: [{ zoneId: 1, removedVolume: 0, remainingVolume: 400 }] },
    { surveyedOn: "2026-10-27", removedVolume: 650, remainingVolume: 350, zones: [{ zoneId: 1, removedVolume: 300, remainingVolume: 100 }] },
  ];

  it("orders snapshots by date and keeps cumulative values", () => {
    const series = progressSeries(snapshots, [1, 2]);
    expect(series.dates).toEqual(["2026-09-08", "2026-09-29", "2026-10-27"]);
    expect([...series.totalRemovedVolume]).toEqual([0, 300, 650]);
    expect([...series.zones[0].removedVolume]).toEqual([0, 300, 300]);
    expect(series.zones[1].removedVolume.every(Number.isNaN)).toBe(true); // a zone never measured is no data, not zero
  });

  it("divides each interval's removal by its working days", () => {
    // computed: 300 yd³ over the 15 weekdays after 2026-09-08 up to 2026-09-29; 350 over the next 20
    const series = progressSeries(snapshots, []);
    const intervals = productionIntervals(series.dates, series.totalRemovedVolume, weekdays);
    expect(intervals.map((interval) => interval.workingDays)).toEqual([bruteWeekdays("2026-09-08", "2026-09-29"), bruteWeekdays("2026-09-29", "2026-10-27")]);
    expect(intervals[0].volumePerWorkingDay).toBeCloseTo(300 / 15, 12);
    expect(intervals[1].volumePerWorkingDay).toBeCloseTo(350 / 20, 12);
    // invariant: the intervals' volumes add up to the last cumulative value
    expect(intervals.reduce((sum, interval) => sum + interval.removedVolume, 0)).toBe(650);
  });

  it("forecasts from the zone's last measured change, not from surveys that missed it", () => {
    // computed: the zone changed only between 09-08 and 09-29 (15 weekdays, 300) → 20 per day; 100 left → 5 weekdays after 09-29
    const options = { finishedBelowVolume: 0.5, changeThresholdVolume: 0.5 };
    const forecast = forecastFinish(["2026-09-08", "2026-09-29", "2026-10-27"], [0, 300, 300], 100, weekdays, options);
    expect(forecast.state).toBe("forecast");
    expect(forecast.rateFromDate).toBe("2026-09-08");
    expect(forecast.rateToDate).toBe("2026-09-29");
    expect(forecast.volumePerWorkingDay).toBeCloseTo(20, 12);
    expect(forecast.workingDaysLeft).toBe(5);
    expect(forecast.finishDate).toBe("2026-10-06"); // 2026-09-29 is a Tuesday: Wed…Fri, Mon, Tue
    expect(workingDaysBetween(weekdays, "2026-09-29", forecast.finishDate!)).toBe(5);
  });

  it("says finished, or that there is no rate yet", () => {
    const options = { finishedBelowVolume: 0.5, changeThresholdVolume: 0.5 };
    expect(forecastFinish(["2026-09-08"], [0], 0.2, weekdays, options).state).toBe("finished");
    expect(forecastFinish(["2026-09-08"], [0], 500, weekdays, options).state).toBe("no-rate");
    // practice: a zone whose every cell is at firm sand is done, whatever thin layer within tolerance remains
    expect(forecastFinish(["2026-09-08", "2026-09-29"], [0, 300], 40, weekdays, { ...options, everyCellAtFirmSand: true }).state).toBe("finished");
    expect(forecastFinish(["2026-09-08", "2026-09-29"], [0, 0.1], 500, weekdays, options).state).toBe("no-rate");
  });
});

describe("percent complete", () => {
  it("by volume, held within 0–100 %", () => {
    // computed: (planned − remaining) / planned
    expect(percentCompleteByVolume(400, 100)).toBeCloseTo(75, 12);
    expect(percentCompleteByVolume(400, 500)).toBe(0);
    expect(percentCompleteByVolume(400, -1)).toBe(100);
    expect(percentCompleteByVolume(0, 0)).toBeNull();
  });

  it("by cells and as a difference", () => {
    expect(percentCellsAtFirmSand(3, 12)).toBeCloseTo(25, 12);
    expect(percentCellsAtFirmSand(0, 0)).toBeNull();
    // computed: end area 6,933.33 yd³ beside a prismoidal 6,903.70 yd³ (REFERENCES.md handbook example) → +0.429 %
    expect(percentDifference(6903.7, 187_200 / 27)).toBeCloseTo(((187_200 / 27 - 6903.7) / 6903.7) * 100, 12);
    expect(percentDifference(0, 1)).toBeNull();
  });
});
