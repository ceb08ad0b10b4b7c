import { useId } from "react";
import { linearScale, niceTicks, spreadLabels } from "../../shared/progress/chart-scale";
import { dayNumber } from "../../shared/progress/calendar-days";
import type { ProductionInterval } from "../../shared/progress/production";
import { formatNumber } from "./progress-figures";
import { useMeasuredWidth } from "./use-measured-width";

/**
 * SVG charts of progress, drawn at the width of their panel (measured in the browser; 640 px
 * before scripts run), so one user unit is one pixel and no text is ever under 12 px.
 */

/** The smallest text any chart draws, in CSS pixels. */
export const CHART_FONT_PX = 12;
/** Roboto Mono's advance is 0.6 em: the width of a figure label, for spacing labels apart. */
export const MONO_CHAR_PX = CHART_FONT_PX * 0.6;
const FALLBACK_WIDTH = 640;
const LINE_COLOURS = ["#14606e", "#9a5b00", "#6b4c9a", "#2f6f3e", "#a3242a", "#3c6e9f"];

const clamp = (value: number, low: number, high: number) => Math.min(high, Math.max(low, value));

export interface Frame {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
}

export interface RemovedSeries {
  name: string;
  values: Array<number | null>;
  total?: boolean;
  /** The line's colour (a zone's own); else one of the chart's in turn. */
  colour?: string | null;
  /** Which values get a dot (a record of its own on that date); every value when absent. */
  marked?: boolean[];
}

export function ValueAxis({ frame, ticks, y, unit }: { frame: Frame; ticks: number[]; y: (value: number) => number; unit: string }) {
  const { margin, width } = frame;
  // As many decimals as the step between ticks needs: 0.1, 0.2… never all "0".
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
  const digits = step > 0 && step < 1 ? Math.min(6, Math.ceil(-Math.log10(step) - 1e-9)) : 0;
  return (
    <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870">
      {ticks.map((tick) => (
        <g key={tick}>
          <line x1={margin.left} x2={width - margin.right} y1={y(tick)} y2={y(tick)} stroke="#d5dcdf" />
          <text x={margin.left - 6} y={y(tick) + 4} textAnchor="end">{formatNumber(tick, digits)}</text>
        </g>
      ))}
      <text x={4} y={margin.top - 10}>{unit}</text>
    </g>
  );
}

/** Which of the positions (in order) get a label, so that labels on alternate rows keep `gap` apart. */
export function thinLabels(positions: number[], gap: number): boolean[] {
  let last = -Infinity;
  return positions.map((position) => {
    if (position - last < gap / 2) return false;
    last = position;
    return true;
  });
}

/** Cumulative removed volume by survey date: one line per zone and a heavier one for the project. */
export function CumulativeRemovedChart(props: { dates: string[]; series: RemovedSeries[]; unit: string }) {
  return (
    <DatedLinesChart
      {...props} testId="cumulative-chart" emptyText="No surveys yet."
      title={`Cumulative removed volume by survey date, per zone and for the project (${props.unit})`}
    />
  );
}

interface DatedLinesProps {
  dates: string[];
  /** Each line's values on `dates`; null lifts the pen. */
  series: RemovedSeries[];
  unit: string;
  /** What the chart shows, for screen readers and as the tooltip of the whole. */
  title: string;
  testId: string;
  emptyText: string;
}

/** Lines over dates, each named at its end; a `total` line is drawn heavier. */
export function DatedLinesChart(props: DatedLinesProps) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  if (props.dates.length === 0) return <p className="text-sm text-muted">{props.emptyText}</p>;
  return <div ref={ref} className="w-full min-w-0 overflow-hidden"><DatedLinesSvg {...props} width={width} /></div>;
}

function DatedLinesSvg({ dates, series, unit, title, testId, width }: DatedLinesProps & { width: number }) {
  const titleId = useId();
  const longestName = Math.max(...series.map((line) => line.name.length));
  const frame: Frame = {
    width,
    height: clamp(Math.round(width * 0.55), 220, 320),
    margin: { top: 28, right: clamp(longestName * 7 + 14, 60, Math.round(width * 0.34)), bottom: 2 * CHART_FONT_PX + 20, left: 56 },
  };
  const { margin, height } = frame;
  const days = dates.map(dayNumber);
  const x = linearScale([days[0], days[days.length - 1]], [margin.left, width - margin.right]);
  const max = Math.max(0, ...series.flatMap((line) => line.values.filter((value): value is number => value !== null)));
  const ticks = niceTicks(max);
  const y = linearScale([0, ticks[ticks.length - 1]], [height - margin.bottom, margin.top]);
  // End labels sit beside each line's last value, pushed apart where lines end close together.
  const lastValues = series.map((line) => [...line.values].reverse().find((value): value is number => value !== null) ?? 0);
  const labelY = spreadLabels(lastValues.map((value) => y(value) + 4), CHART_FONT_PX + 2, margin.top, height - margin.bottom + 4);
  // Dates as MM-DD on two alternating rows, thinned where they would touch.
  const shown = thinLabels(days.map((day) => x(day)), 5 * MONO_CHAR_PX + 8);
  let row = 0;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby={titleId} className="block max-w-full" data-testid={testId}>
      {/* One string: React renders a <title> of several text children empty on the server. */}
      <title id={titleId}>{title}</title>
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={unit} />
      <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870">
        {dates.map((date, index) => {
          if (!shown[index]) return null;
          const line = row++ % 2;
          return <text key={date} x={x(days[index])} y={height - margin.bottom + 16 + line * (CHART_FONT_PX + 2)} textAnchor="middle">{date.slice(5)}</text>;
        })}
      </g>
      {series.map((line, lineIndex) => {
        const colour = line.total ? "#1d2528" : line.colour ?? LINE_COLOURS[lineIndex % LINE_COLOURS.length];
        let path = "";
        let pen = false;
        line.values.forEach((value, index) => {
          if (value === null) {
            pen = false;
            return;
          }
          path += `${pen ? "L" : "M"}${x(days[index]).toFixed(1)} ${y(value).toFixed(1)}`;
          pen = true;
        });
        return (
          <g key={line.name} data-series={line.name}>
            <path d={path} fill="none" stroke={colour} strokeWidth={line.total ? 3 : 2} strokeDasharray={line.total ? undefined : lineIndex % 2 ? "6 3" : undefined} />
            {line.values.map((value, index) => value === null || line.marked?.[index] === false ? null : <circle key={index} cx={x(days[index])} cy={y(value)} r={3} fill={colour}><title>{`${line.name}, ${dates[index]}: ${formatNumber(value)} ${unit}`}</title></circle>)}
            <text x={width - margin.right + 8} y={labelY[lineIndex]} fontSize={CHART_FONT_PX} fill={colour}>{line.name}</text>
          </g>
        );
      })}
    </svg>
  );
}

/**
 * Production per working day for each interval between survey dates, as bars; under each, its
 * working days and what they were counted from. A thin interval (too few working days for its rate
 * to compare) is drawn hatched and pale with "thin" over it, not as a bar of the same weight.
 */
export function ProductionChart(props: { intervals: ProductionInterval[]; unit: string }) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  if (props.intervals.length === 0) return <p className="text-sm text-muted">Production needs two survey dates.</p>;
  // Each bar keeps room for its labels; more bars than the panel holds scroll sideways.
  return <div ref={ref} className="w-full min-w-0 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Production chart, scrollable"><ProductionSvg {...props} width={width} /></div>;
}

/** Room under and beside each bar for its four label lines at 12 px ("05-26→", "10-27", "12 d", "weekdays"). */
const PRODUCTION_SLOT_PX = 8 * MONO_CHAR_PX + 12;

function ProductionSvg({ intervals, unit, width: panelWidth }: { intervals: ProductionInterval[]; unit: string; width: number }) {
  const line = CHART_FONT_PX + 2;
  const margin = { top: 28, right: 12, bottom: 4 * line + 8, left: 56 };
  const width = Math.max(panelWidth, margin.left + margin.right + intervals.length * PRODUCTION_SLOT_PX);
  const height = clamp(Math.round(panelWidth * 0.55), 240, 320);
  const frame: Frame = { width, height, margin };
  const rates = intervals.map((interval) => interval.volumePerWorkingDay ?? 0);
  const ticks = niceTicks(Math.max(0, ...rates));
  const bottom = height - margin.bottom;
  const y = linearScale([0, ticks[ticks.length - 1]], [bottom, margin.top]);
  const slot = (width - margin.left - margin.right) / intervals.length;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="production-title" className="block" data-testid="production-chart">
      <title id="production-title">{`Production per working day between survey dates (${unit} per working day)`}</title>
      <defs>
        <pattern id="thin-interval-hatch" width={6} height={6} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width={6} height={6} fill="#e3eef0" />
          <line x1={0} y1={0} x2={0} y2={6} stroke="#14606e" strokeWidth={1.5} strokeOpacity={0.5} />
        </pattern>
      </defs>
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={`${unit}/day`} />
      {intervals.map((interval, index) => {
        const rate = Math.max(0, interval.volumePerWorkingDay ?? 0);
        const left = margin.left + index * slot + slot * 0.15;
        const centre = left + slot * 0.35;
        const basis = interval.basis === "dives-logged" ? "dives logged" : "weekdays";
        return (
          <g key={interval.toDate} data-thin={interval.thin ? "" : undefined}>
            <rect x={left} width={slot * 0.7} y={y(rate)} height={y(0) - y(rate)} fill={interval.thin ? "url(#thin-interval-hatch)" : "#14606e"} stroke={interval.thin ? "#14606e" : undefined} strokeDasharray={interval.thin ? "3 2" : undefined}>
              <title>{`${interval.fromDate} → ${interval.toDate}: ${formatNumber(interval.removedVolume)} ${unit} over ${Number(interval.workingDays.toFixed(2))} working days (${basis}) = ${formatNumber(interval.volumePerWorkingDay, 1)} ${unit}/day${interval.thin ? "; thin: too few working days for this rate to compare with the others" : ""}`}</title>
            </rect>
            <text className="figures" x={centre} y={y(rate) - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill={interval.thin ? "#5b6870" : "#1d2528"}>
              {`${formatNumber(interval.volumePerWorkingDay, 0)}${interval.thin ? " thin" : ""}`}
            </text>
            <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870" textAnchor="middle">
              <text x={centre} y={bottom + line}>{`${interval.fromDate.slice(5)}→`}</text>
              <text x={centre} y={bottom + 2 * line}>{interval.toDate.slice(5)}</text>
              <text x={centre} y={bottom + 3 * line}>{`${Number(interval.workingDays.toFixed(1))} d`}</text>
              <text x={centre} y={bottom + 4 * line}>{interval.basis === "dives-logged" ? "dives" : "weekdays"}</text>
            </g>
          </g>
        );
      })}
    </svg>
  );
}

export interface DailyBar {
  /** YYYY-MM-DD. */
  date: string;
  /** Null: the day has a record but nothing to draw (said in its tooltip). */
  value: number | null;
  /** The tooltip, in words with units. */
  label: string;
}

/** The narrowest a day is drawn before the chart scrolls sideways instead. */
const MIN_DAY_PX = 3;

/**
 * One bar per calendar day from the first to the last date given, so days without a record show
 * as gaps rather than closing up; a day with a record and no value is marked with a dash.
 */
export function DailyBarsChart(props: { bars: DailyBar[]; unit: string; title: string; testId: string; emptyText: string; digits: number }) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  if (props.bars.length === 0) return <p className="text-sm text-muted">{props.emptyText}</p>;
  return (
    <div ref={ref} className="w-full min-w-0 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label={`${props.title}, scrollable`}>
      <DailyBarsSvg {...props} width={width} />
    </div>
  );
}

function DailyBarsSvg({ bars, unit, title, testId, digits, width: panelWidth }: { bars: DailyBar[]; unit: string; title: string; testId: string; digits: number; width: number }) {
  const titleId = useId();
  // The right margin holds half of the last date's label ("11-17").
  const margin = { top: 28, right: 3 * MONO_CHAR_PX + 4, bottom: 2 * CHART_FONT_PX + 16, left: 56 };
  const first = dayNumber(bars[0].date);
  const span = dayNumber(bars[bars.length - 1].date) - first + 1;
  const width = Math.max(panelWidth, margin.left + margin.right + span * MIN_DAY_PX);
  const height = clamp(Math.round(panelWidth * 0.45), 200, 280);
  const frame: Frame = { width, height, margin };
  const ticks = niceTicks(Math.max(0, ...bars.map((bar) => bar.value ?? 0)));
  const bottom = height - margin.bottom;
  const y = linearScale([0, ticks[ticks.length - 1]], [bottom, margin.top]);
  const slot = (width - margin.left - margin.right) / span;
  const centre = (date: string) => margin.left + (dayNumber(date) - first + 0.5) * slot;
  const valueLabels = slot >= 6 * MONO_CHAR_PX;
  const shown = thinLabels(bars.map((bar) => centre(bar.date)), 5 * MONO_CHAR_PX + 8);
  let row = 0;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby={titleId} className="block" data-testid={testId}>
      <title id={titleId}>{title}</title>
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={unit} />
      {bars.map((bar, index) => {
        const x = centre(bar.date);
        const barWidth = Math.max(2, slot * 0.7);
        const line = shown[index] ? row++ % 2 : 0;
        return (
          <g key={bar.date} data-date={bar.date}>
            {bar.value === null ? (
              <text x={x} y={bottom - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#5b6870">–<title>{bar.label}</title></text>
            ) : (
              <rect x={x - barWidth / 2} width={barWidth} y={y(Math.max(0, bar.value))} height={y(0) - y(Math.max(0, bar.value))} fill="#14606e"><title>{bar.label}</title></rect>
            )}
            {valueLabels && bar.value !== null ? <text className="figures" x={x} y={y(Math.max(0, bar.value)) - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#1d2528">{formatNumber(bar.value, digits)}</text> : null}
            {shown[index] ? <text className="figures" x={x} y={bottom + 16 + line * (CHART_FONT_PX + 2)} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#5b6870">{bar.date.slice(5)}</text> : null}
          </g>
        );
      })}
    </svg>
  );
}
