import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { dayNumber, isoDateOf } from "../../shared/progress/calendar-days";
import { binDays, chooseBinSize } from "../../shared/progress/daily-bins";
import { CHART_FONT_PX, DailyBarsSvg, MIN_BAR_SLOT_PX, type DailyBar } from "./progress-charts";

// The daily bars of a long record, drawn at a phone's panel width: one bar per week (or month)
// once days would be narrower than MIN_BAR_SLOT_PX, bars never overlapping, and the totals the same.

/** 400 calendar days of dry solids from 2025-11-01, a shift on most days (seeded). */
function longRecord(): DailyBar[] {
  let state = 7;
  const random = () => ((state = (Math.imul(state, 1103515245) + 12345) >>> 0) / 4294967296);
  const bars: DailyBar[] = [];
  for (let day = 0; day < 400; day++) {
    if (random() < 0.2) continue;
    const date = isoDateOf(dayNumber("2025-11-01") + day);
    const value = Math.round(300 * random()) / 10;
    bars.push({ date, value, label: `${date}: ${value} dry yd³` });
  }
  return bars;
}

function draw(bars: DailyBar[], width: number) {
  const margin = { left: 56, right: 3 * CHART_FONT_PX * 0.6 + 4 };
  const size = chooseBinSize(bars[0].date, bars[bars.length - 1].date, width - margin.left - margin.right, MIN_BAR_SLOT_PX);
  const markup = renderToStaticMarkup(createElement(DailyBarsSvg, {
    bars, bins: binDays(bars, size), size, width, unit: "dry yd³", kind: "total", digits: 1, testId: "dry-solids-chart", emptyText: "",
    title: (per) => `Dry solids pumped per ${per}`, caption: (per) => `Dry solids pumped per ${per}`,
  }));
  const rects = [...markup.matchAll(/<rect x="([-\d.e]+)" width="([\d.e]+)"/g)].map((match) => ({ x: Number(match[1]), width: Number(match[2]) }));
  const tooltips = [...markup.matchAll(/<rect [^>]*><title>([^<]*)<\/title>/g)].map((match) => match[1]);
  return { size, markup, rects, tooltips };
}

describe("the daily bars of a 400-day record", () => {
  // practice: a 390 px phone leaves the chart its panel less the page's padding; both are checked
  for (const width of [342, 390]) {
    it(`are gathered into weeks at ${width} px, none overlapping, every one inside the chart`, () => {
      const bars = longRecord();
      const { size, markup, rects } = draw(bars, width);
      expect(size).toBe("week");
      expect(markup).toContain('data-per="week"');
      expect(markup).toContain("Dry solids pumped per week");
      expect(rects.length).toBeGreaterThan(50);
      for (let index = 1; index < rects.length; index++) {
        const before = rects[index - 1];
        // Each bar starts after the one before it ends, with a gap (sub-pixel at the least).
        expect(rects[index].x, `bar ${index}`).toBeGreaterThan(before.x + before.width);
        expect(rects[index].width).toBeGreaterThanOrEqual(1);
      }
      expect(rects[0].x).toBeGreaterThanOrEqual(56);
      expect(rects[rects.length - 1].x + rects[rects.length - 1].width).toBeLessThanOrEqual(width);
    });
  }

  it("keep their total: the weeks' tooltips add up to the days", () => {
    const bars = longRecord();
    const { tooltips } = draw(bars, 342);
    // invariant: every day in exactly one week, so the weekly bars add up to the daily record
    const weekly = tooltips.map((tooltip) => Number(/: ([\d,.]+) dry yd³/.exec(tooltip)![1].replace(/,/g, "")));
    const daily = bars.reduce((sum, bar) => sum + bar.value!, 0);
    // The tooltips round to 0.1 dry yd³: within half of that per week.
    expect(Math.abs(weekly.reduce((sum, value) => sum + value, 0) - daily)).toBeLessThanOrEqual(0.05 * weekly.length);
  });

  it("stay one bar a day where the days fit (a desktop panel)", () => {
    const { size, rects } = draw(longRecord().slice(0, 60), 1100);
    expect(size).toBe("day");
    expect(rects).toHaveLength(60);
  });
});
