import { describe, expect, it } from "vitest";
import { dayNumber, isoDateOf } from "./calendar-days";
import { binDays, binStart, chooseBinSize, type DayFigure } from "./daily-bins";

/** A seeded record of `days` calendar days from 2025-11-01: most days logged, some not, some logged with nothing to draw. */
function longRecord(days: number, ratio: boolean): DayFigure[] {
  let state = 20261203;
  const random = () => ((state = (Math.imul(state, 1103515245) + 12345) >>> 0) / 4294967296);
  const first = dayNumber("2025-11-01");
  const record: DayFigure[] = [];
  for (let day = 0; day < days; day++) {
    const draw = random();
    if (draw < 0.2) continue; // no shift that day
    const date = isoDateOf(first + day);
    if (draw < 0.25) {
      record.push({ date, value: null, ratio: null });
      continue;
    }
    if (ratio) {
      const numerator = 5 + 40 * random(); // lb of polymer
      const denominator = 1 + 9 * random(); // dry tons
      record.push({ date, value: numerator / denominator, ratio: { numerator, denominator } });
    } else {
      record.push({ date, value: Math.round(1000 * 30 * random()) / 1000 });
    }
  }
  return record;
}

describe("bins of days", () => {
  it("start weeks on Monday and months on the 1st", () => {
    // published (the calendar): 2026-12-03 is a Thursday, 2026-11-30 the Monday before; 2027-01-03 a Sunday
    expect(isoDateOf(binStart(dayNumber("2026-12-03"), "week"))).toBe("2026-11-30");
    expect(isoDateOf(binStart(dayNumber("2026-11-30"), "week"))).toBe("2026-11-30");
    expect(isoDateOf(binStart(dayNumber("2027-01-03"), "week"))).toBe("2026-12-28");
    expect(isoDateOf(binStart(dayNumber("2028-02-29"), "month"))).toBe("2028-02-01");
    const bins = binDays([{ date: "2028-01-31", value: 1 }, { date: "2028-03-01", value: 2 }], "month");
    // computed: 2028 is a leap year, so February runs to the 29th
    expect(bins.map((bin) => [bin.from, bin.to])).toEqual([["2028-01-01", "2028-01-31"], ["2028-02-01", "2028-02-29"], ["2028-03-01", "2028-03-31"]]);
    expect(bins[1]).toMatchObject({ value: null, recordDays: 0 }); // a month without a record stays a gap
  });

  it("choose days while a bar per day keeps its minimum width, then weeks, then months", () => {
    // computed: 400 days at 2 px need 800 px; 58 weeks (Monday 2025-10-27 to Sunday 2026-12-06) need 116 px
    expect(chooseBinSize("2025-11-01", "2026-12-05", 268, 2)).toBe("week");
    expect(chooseBinSize("2025-11-01", "2026-12-05", 1100, 2)).toBe("day");
    expect(chooseBinSize("2025-11-01", "2026-12-05", 100, 2)).toBe("month");
    expect(chooseBinSize("2026-11-01", "2026-11-30", 60, 2)).toBe("day");
  });

  it("keep the totals of a 400-day record by week and by month", () => {
    const record = longRecord(400, false);
    const total = record.reduce((sum, day) => sum + (day.value ?? 0), 0);
    for (const size of ["day", "week", "month"] as const) {
      const bins = binDays(record, size);
      // invariant: every day in exactly one bin, so the bins add up to the days
      expect(bins.reduce((sum, bin) => sum + (bin.value ?? 0), 0), size).toBeCloseTo(total, 6);
      expect(bins.reduce((sum, bin) => sum + bin.recordDays, 0), size).toBe(record.length);
      expect(bins.reduce((sum, bin) => sum + bin.valueDays, 0), size).toBe(record.filter((day) => day.value !== null).length);
      // Bins follow each other without gap or overlap.
      for (let index = 1; index < bins.length; index++) expect(dayNumber(bins[index].from)).toBe(dayNumber(bins[index - 1].to) + 1);
    }
    expect(binDays(record, "week")).toHaveLength(58);
    expect(binDays(record, "month")).toHaveLength(14); // computed: November 2025 to December 2026
  });

  it("gather a ratio as its parts, never as a mean of the days' ratios", () => {
    // computed: 10 lb over 2 t (5 lb/t) and 30 lb over 3 t (10 lb/t) in one week: 40 lb over 5 t = 8 lb/t, not 7.5
    const [week] = binDays([
      { date: "2026-11-30", value: 5, ratio: { numerator: 10, denominator: 2 } },
      { date: "2026-12-02", value: 10, ratio: { numerator: 30, denominator: 3 } },
      { date: "2026-12-03", value: null, ratio: null },
    ], "week");
    expect(week).toMatchObject({ from: "2026-11-30", to: "2026-12-06", value: 8, recordDays: 3, valueDays: 2, ratio: { numerator: 40, denominator: 5 } });
    const record = longRecord(400, true);
    const parts = record.reduce((sum, day) => ({ numerator: sum.numerator + (day.ratio?.numerator ?? 0), denominator: sum.denominator + (day.ratio?.denominator ?? 0) }), { numerator: 0, denominator: 0 });
    for (const size of ["week", "month"] as const) {
      const bins = binDays(record, size);
      const summed = bins.reduce((sum, bin) => ({ numerator: sum.numerator + (bin.ratio?.numerator ?? 0), denominator: sum.denominator + (bin.ratio?.denominator ?? 0) }), { numerator: 0, denominator: 0 });
      // invariant: the whole record's ratio is the same from its days and from its bins
      expect(summed.numerator / summed.denominator, size).toBeCloseTo(parts.numerator / parts.denominator, 9);
    }
    // A day is its own bin, its value as given.
    expect(binDays(record, "day").filter((bin) => bin.recordDays > 0).map((bin) => bin.value)).toEqual(record.map((day) => day.value));
  });
});
