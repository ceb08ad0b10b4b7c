import { describe, expect, it } from "vitest";
import { dayNumber, isWeekday, isoDateOf, localDateIn } from "./calendar-days";
import { RATE_WINDOW_CALENDAR_DAYS, forecastFinish } from "./forecast";
import { percentCellsAtFirmSand, percentCompleteByVolume, percentDifference } from "./percent-complete";
import { productionIntervals } from "./production";
import { progressSeries } from "./time-series";
import { THIN_INTERVAL_WORKING_DAYS, addWeekdays, intervalBasis, workingCalendar, workingDaysBetween } from "./working-days";

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

  it("counts days with a logged dive after the first survey up to and including the second", () => {
    // practice: a survey measures the work done after the previous survey; several dives on one day are one day
    const logged = workingCalendar(["2026-09-10", "2026-09-08", "2026-09-12", "2026-09-12", "2026-09-20"]);
    expect(logged.basis).toBe("days-logged");
    expect(workingDaysBetween(logged, "2026-09-08", "2026-09-12")).toBe(2);
    expect(workingDaysBetween(logged, "2026-09-12", "2026-09-30")).toBe(1);
    // practice: an interval without any logged dive (before the log was kept) falls back to weekdays
    expect(workingDaysBetween(logged, "2026-10-01", "2026-10-08")).toBe(bruteWeekdays("2026-10-01", "2026-10-08"));
    expect(intervalBasis(logged, "2026-10-01", "2026-10-08")).toBe("weekdays");
    expect(intervalBasis(logged, "2026-09-08", "2026-09-12")).toBe("days-logged");
    // a dewatering shift's day is a day worked too; a day with both counts once
    const withShifts = workingCalendar(["2026-09-10", "2026-09-12", "2026-09-11", "2026-09-12"]);
    expect(workingDaysBetween(withShifts, "2026-09-08", "2026-09-12")).toBe(3);
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

  it("marks an interval resting on fewer than three working days as thin", () => {
    // computed: 2026-11-20 is a Friday; the days after it up to Tue 11-24 are Sat, Sun, Mon, Tue → 2 weekdays
    // (150 yd³ → 75 per day, thin); Tue 11-24 → Fri 11-27 holds Wed, Thu, Fri → 3 weekdays (90 → 30 per day, not thin)
    const intervals = productionIntervals(["2026-11-20", "2026-11-24", "2026-11-27"], [0, 150, 240], weekdays);
    expect(THIN_INTERVAL_WORKING_DAYS).toBe(3);
    expect(intervals.map((interval) => interval.workingDays)).toEqual([2, 3]);
    expect(intervals.map((interval) => interval.thin)).toEqual([true, false]);
    expect(intervals[0].volumePerWorkingDay).toBeCloseTo(75, 12);
    // computed: dives logged on Tue 11-10 and Thu 11-12 only: the interval Tue 11-03 → Tue 11-17 rests on those
    // 2 days (not its 10 weekdays), says so, and is thin; 11-17 → 11-24 has no logged dive: 5 weekdays, not thin
    const logged = workingCalendar(["2026-11-10", "2026-11-12", "2026-11-10"]);
    const [divesLogged, noDives] = productionIntervals(["2026-11-03", "2026-11-17", "2026-11-24"], [0, 956, 1056], logged);
    expect([divesLogged.workingDays, divesLogged.basis, divesLogged.thin]).toEqual([2, "days-logged", true]);
    expect(divesLogged.volumePerWorkingDay).toBeCloseTo(478, 12);
    expect([noDives.workingDays, noDives.basis, noDives.thin]).toEqual([5, "weekdays", false]);
  });

  const options = { finishedBelowVolume: 0.5, changeThresholdVolume: 0.5 };

  it("counts the finish from the latest survey date, never from an older change", () => {
    // computed: the zone changed only between Tue 09-08 and Tue 09-29 (15 weekdays, 300) → 20 per day; it ends on
    // 09-29, within the 42 days before the latest survey (10-27 − 42 d = 09-15). 100 left → 5 weekdays counted from
    // Tue 10-27 (not from 09-29, which would give 10-06, before the latest survey): Wed 28, Thu 29, Fri 30, Mon 11-02, Tue 11-03
    const forecast = forecastFinish(["2026-09-08", "2026-09-29", "2026-10-27"], [0, 300, 300], 100, options);
    expect(forecast.state).toBe("forecast");
    expect([forecast.windowFromDate, forecast.windowToDate]).toEqual(["2026-09-15", "2026-10-27"]);
    expect([forecast.rateFromDate, forecast.rateToDate]).toEqual(["2026-09-08", "2026-09-29"]);
    expect(forecast.volumePerWorkingDay).toBeCloseTo(20, 12);
    expect(forecast.workingDaysLeft).toBe(5);
    expect(forecast.finishDate).toBe("2026-11-03");
    // one interval: its rate is the slowest, the mean and the fastest, so the range closes on the date
    expect([forecast.slowestVolumePerWorkingDay, forecast.fastestVolumePerWorkingDay]).toEqual([20, 20]);
    expect([forecast.earliestFinishDate, forecast.latestFinishDate]).toEqual(["2026-11-03", "2026-11-03"]);
  });

  it("takes the mean rate over the window, with a range from the slowest to the fastest interval", () => {
    // computed, weekdays, every date a Tuesday; the window is the 42 days before Tue 11-24, from 10-13:
    //   09-08 → 10-06: 20 weekdays, 1200 → 60/day, ends before 10-13: left out
    //   10-06 → 10-20: 10 weekdays,  200 → 20/day (slowest)
    //   10-20 → 11-03: 10 weekdays,  300 → 30/day
    //   11-03 → 11-24: 15 weekdays,  600 → 40/day (fastest)
    // mean 1100 / 35 = 31.43/day; 510 left → 16.2 → 17 weekdays from Tue 11-24: 15 to Tue 12-15, then Wed, Thu → 12-17;
    // fastest 510 / 40 = 12.75 → 13: 10 to Tue 12-08, then Wed, Thu, Fri → 12-11; slowest 510 / 20 = 25.5 → 26: 25 to Tue 12-29, then Wed → 12-30
    const forecast = forecastFinish(["2026-09-08", "2026-10-06", "2026-10-20", "2026-11-03", "2026-11-24"], [0, 1200, 1400, 1700, 2300], 510, options);
    expect(RATE_WINDOW_CALENDAR_DAYS).toBe(42);
    expect(forecast.state).toBe("forecast");
    expect(forecast.windowFromDate).toBe("2026-10-13");
    expect(forecast.intervals.map((interval) => [interval.fromDate, interval.workingDays, interval.removedVolume])).toEqual([
      ["2026-10-06", 10, 200], ["2026-10-20", 10, 300], ["2026-11-03", 15, 600],
    ]);
    expect(forecast.volumePerWorkingDay).toBeCloseTo(1100 / 35, 12);
    expect(forecast.slowestVolumePerWorkingDay).toBeCloseTo(20, 12);
    expect(forecast.fastestVolumePerWorkingDay).toBeCloseTo(40, 12);
    expect(forecast.workingDaysLeft).toBe(17);
    expect([forecast.earliestFinishDate, forecast.finishDate, forecast.latestFinishDate]).toEqual(["2026-12-11", "2026-12-17", "2026-12-30"]);
    // invariant: the range brackets the mean, in rate and in date
    expect(forecast.slowestVolumePerWorkingDay!).toBeLessThanOrEqual(forecast.volumePerWorkingDay!);
    expect(forecast.volumePerWorkingDay!).toBeLessThanOrEqual(forecast.fastestVolumePerWorkingDay!);
    expect(forecast.earliestFinishDate! <= forecast.finishDate! && forecast.finishDate! <= forecast.latestFinishDate!).toBe(true);
  });

  it("never dates a finish before the latest survey, and the range always brackets the mean (invariant)", () => {
    // invariant: series whose last change lies at every distance before the latest survey, with small and large amounts left
    const dates = ["2026-09-01", "2026-09-15", "2026-10-06", "2026-10-27", "2026-11-10", "2026-11-24"];
    let forecasts = 0;
    for (let lastChange = 1; lastChange < dates.length; lastChange++) {
      const removed = dates.map((_, index) => 70 * Math.min(index, lastChange) + 55 * (Math.min(index, lastChange) % 2));
      for (const remaining of [1, 40, 333, 5000]) {
        const forecast = forecastFinish(dates, removed, remaining, options);
        if (forecast.state !== "forecast") continue;
        forecasts++;
        expect(forecast.finishDate! > "2026-11-24", `${lastChange} ${remaining}`).toBe(true);
        expect(forecast.earliestFinishDate! > "2026-11-24").toBe(true);
        expect(forecast.earliestFinishDate! <= forecast.finishDate! && forecast.finishDate! <= forecast.latestFinishDate!).toBe(true);
      }
    }
    expect(forecasts).toBeGreaterThan(8); // the loop did test something
  });

  it("says no recent rate when the zone's last change is older than the window", () => {
    // computed: the only change (09-08 → 09-29) ends 56 days before the latest survey of Tue 11-24: outside 42 days
    const forecast = forecastFinish(["2026-09-08", "2026-09-29", "2026-11-24"], [0, 300, 300], 100, options);
    expect(forecast.state).toBe("no-recent-rate");
    expect(forecast.finishDate).toBeNull();
    expect(forecast.volumePerWorkingDay).toBeNull();
    expect([forecast.windowFromDate, forecast.windowToDate]).toEqual(["2026-10-13", "2026-11-24"]);
  });

  it("gives no latest date when an interval in the window lost volume", () => {
    // computed: 10-20 → 11-03 10 weekdays, +300 → 30/day; 11-03 → 11-24 15 weekdays, −100 (deposited) → −6.7/day;
    // mean 200 / 25 = 8/day: 100 left → 12.5 → 13 weekdays from Tue 11-24 → Fri 12-11; fastest 100 / 30 → 4 → Mon 11-30
    const forecast = forecastFinish(["2026-10-20", "2026-11-03", "2026-11-24"], [0, 300, 200], 100, options);
    expect(forecast.volumePerWorkingDay).toBeCloseTo(8, 12);
    expect([forecast.earliestFinishDate, forecast.finishDate, forecast.latestFinishDate]).toEqual(["2026-11-30", "2026-12-11", null]);
  });

  it("takes the rate per weekday whatever days dives were logged on", () => {
    // computed: the forecast has no calendar argument: Tue 09-08 → Tue 09-29 is 15 weekdays even if dives were
    // logged on two of them only, so 300 → 20 per weekday (not 150 per logged day)
    const forecast = forecastFinish(["2026-09-08", "2026-09-29", "2026-10-27"], [0, 300, 300], 100, options);
    expect(forecast.intervals[0].workingDays).toBe(15);
    expect(workingDaysBetween(workingCalendar(["2026-09-10", "2026-09-11"]), "2026-09-08", "2026-09-29")).toBe(2); // what production per working day counts
  });

  it("says finished, or that there is no rate yet", () => {
    expect(forecastFinish(["2026-09-08"], [0], 0.2, options).state).toBe("finished");
    expect(forecastFinish(["2026-09-08"], [0], 500, options).state).toBe("no-rate");
    // practice: a zone whose every cell is at firm sand is done, whatever thin layer within tolerance remains
    expect(forecastFinish(["2026-09-08", "2026-09-29"], [0, 300], 40, { ...options, everyCellAtFirmSand: true }).state).toBe("finished");
    expect(forecastFinish(["2026-09-08", "2026-09-29"], [0, 0.1], 500, options).state).toBe("no-rate");
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

describe("the project's local date", () => {
  it("is the date in the project's time zone, not UTC's", () => {
    // computed: 03:00 UTC on 2 December is 22:00 on 1 December in New York (UTC−5 in winter)
    expect(localDateIn("America/New_York", new Date("2026-12-02T03:00:00Z"))).toBe("2026-12-01");
    expect(localDateIn("UTC", new Date("2026-12-02T03:00:00Z"))).toBe("2026-12-02");
  });
});
