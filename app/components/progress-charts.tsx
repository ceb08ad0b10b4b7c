import { useId } from "react";
import { linearScale, niceTicks, spreadLabels } from "../../shared/progress/chart-scale";
import { dayNumber } from "../../shared/progress/calendar-days";
import { binDays, chooseBinSize, type BinSize, type DayBin } from "../../shared/progress/daily-bins";
import type { ProductionInterval } from "../../shared/progress/production";
import { formatNumber } from "./progress-figures";
import { useMeasuredWidth, widthLinkedHeight } from "./use-measured-width";

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
  const [ref, width, measured] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  const keyId = useId();
  if (props.dates.length === 0) return <p className="text-sm text-muted">{props.emptyText}</p>;
  // Names beside the lines' ends while they fit in a third of the panel; otherwise (a phone, long
  // zone names) a key under the chart, so no name is cut off at the panel's edge.
  const endLabelsPx = Math.max(...props.series.map((line) => line.name.length)) * 7 + 14;
  const endLabels = endLabelsPx <= width * 0.34;
  const key = (
    <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs" data-testid={`${props.testId}-key`} data-chart-key={keyId}>
      {props.series.map((line, lineIndex) => (
        <li key={line.name} className="flex items-center gap-1.5">
          <svg aria-hidden="true" width="24" height="8" className="shrink-0"><line x1={0} x2={24} y1={4} y2={4} stroke={lineColour(line, lineIndex)} strokeWidth={line.total ? 3 : 2} strokeDasharray={lineDash(line, lineIndex)} /></svg>
          {line.name}
        </li>
      ))}
    </ul>
  );
  // Before the width is measured (the server's page, before scripts run) the browser decides by
  // the panel's width whether the key shows, by the same rule, so the page does not move when the
  // scripts start.
  return (
    <div className="min-w-0 [container-type:inline-size]">
      <div ref={ref} className="w-full min-w-0 overflow-hidden">
        <div style={{ height: widthLinkedHeight({ perWidth: 0.55, min: 220, max: 320 }) }}><DatedLinesSvg {...props} width={width} endLabels={endLabels} /></div>
        {measured ? (endLabels ? null : key) : <>{containerRule(`(width >= ${Math.ceil(endLabelsPx / 0.34)}px)`, `[data-chart-key="${keyId}"]`)}{key}</>}
      </div>
    </div>
  );
}

/** A style element hiding `selector` while its container's width matches `condition` (before a chart is measured). */
function containerRule(condition: string, selector: string) {
  return <style>{`@container ${condition} { ${selector} { display: none; } }`}</style>;
}

const lineColour = (line: RemovedSeries, lineIndex: number) => (line.total ? "#1d2528" : line.colour ?? LINE_COLOURS[lineIndex % LINE_COLOURS.length]);
const lineDash = (line: RemovedSeries, lineIndex: number) => (line.total ? undefined : lineIndex % 2 ? "6 3" : undefined);

function DatedLinesSvg({ dates, series, unit, title, testId, width, endLabels }: DatedLinesProps & { width: number; endLabels: boolean }) {
  const titleId = useId();
  const longestName = Math.max(...series.map((line) => line.name.length));
  const frame: Frame = {
    width,
    height: clamp(Math.round(width * 0.55), 220, 320),
    // Without end labels the right margin holds half of the last date's label ("11-17").
    margin: { top: 28, right: endLabels ? clamp(longestName * 7 + 14, 60, Math.round(width * 0.34)) : 3 * MONO_CHAR_PX + 4, bottom: 2 * CHART_FONT_PX + 20, left: 56 },
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
        const colour = lineColour(line, lineIndex);
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
            <path d={path} fill="none" stroke={colour} strokeWidth={line.total ? 3 : 2} strokeDasharray={lineDash(line, lineIndex)} />
            {line.values.map((value, index) => value === null || line.marked?.[index] === false ? null : <circle key={index} cx={x(days[index])} cy={y(value)} r={3} fill={colour}><title>{`${line.name}, ${dates[index]}: ${formatNumber(value)} ${unit}`}</title></circle>)}
            {endLabels ? <text x={width - margin.right + 8} y={labelY[lineIndex]} fontSize={CHART_FONT_PX} fill={colour}>{line.name}</text> : null}
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
  const [ref, width, measured] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  const layoutId = useId();
  if (props.intervals.length === 0) return <p className="text-sm text-muted">Production needs two survey dates.</p>;
  // Columns while each keeps room for its labels; in a narrower panel (a phone) one row per
  // interval, so the chart always fits its panel and never scrolls sideways.
  const columnsFrom = PRODUCTION_MARGIN_X + props.intervals.length * PRODUCTION_SLOT_PX;
  const columns = width >= columnsFrom;
  const columnsBox = (svg: React.ReactNode) => <div style={{ height: widthLinkedHeight({ perWidth: 0.55, min: 240, max: 320 }) }}>{svg}</div>;
  if (measured) {
    return (
      <div className="min-w-0 [container-type:inline-size]">
        <div ref={ref} className="w-full min-w-0 overflow-hidden">
          {columns ? columnsBox(<ProductionColumnsSvg {...props} width={width} />) : <ProductionRowsSvg {...props} width={width} />}
        </div>
      </div>
    );
  }
  // Before the width is measured both layouts are sent and the browser shows the one the panel's
  // width calls for (the same rule), so the page does not move when the scripts start.
  return (
    <div className="min-w-0 [container-type:inline-size]">
      <div ref={ref} className="w-full min-w-0 overflow-hidden">
        {containerRule(`(width < ${columnsFrom}px)`, `[data-production-columns="${layoutId}"]`)}
        {containerRule(`(width >= ${columnsFrom}px)`, `[data-production-rows="${layoutId}"]`)}
        {/* Test ids only once the layout is chosen: until then there are two. */}
        <div data-production-columns={layoutId}>{columnsBox(<ProductionColumnsSvg {...props} width={width} tagged={false} />)}</div>
        <div data-production-rows={layoutId}><ProductionRowsSvg {...props} width={width} tagged={false} /></div>
      </div>
    </div>
  );
}

/** Room under and beside each bar for its four label lines at 12 px ("05-26→", "10-27", "12 d", "weekdays"). */
export const PRODUCTION_SLOT_PX = 8 * MONO_CHAR_PX + 12;
/** The columns' left and right margins together (value axis and a little air). */
const PRODUCTION_MARGIN_X = 56 + 12;

const productionTitle = (unit: string) => `Production per working day between survey dates (${unit} per working day)`;

function productionTooltip(interval: ProductionInterval, unit: string): string {
  const basis = interval.basis === "days-logged" ? "days logged" : "weekdays";
  return `${interval.fromDate} → ${interval.toDate}: ${formatNumber(interval.removedVolume)} ${unit} over ${Number(interval.workingDays.toFixed(2))} working days (${basis}) = ${formatNumber(interval.volumePerWorkingDay, 1)} ${unit}/day${interval.thin ? "; thin: too few working days for this rate to compare with the others" : ""}`;
}

const productionValueText = (interval: ProductionInterval) => `${formatNumber(interval.volumePerWorkingDay, 0)}${interval.thin ? " thin" : ""}`;

function ThinIntervalHatch() {
  return (
    <defs>
      <pattern id="thin-interval-hatch" width={6} height={6} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
        <rect width={6} height={6} fill="#e3eef0" />
        <line x1={0} y1={0} x2={0} y2={6} stroke="#14606e" strokeWidth={1.5} strokeOpacity={0.5} />
      </pattern>
    </defs>
  );
}

function barPaint(interval: ProductionInterval) {
  return interval.thin ? { fill: "url(#thin-interval-hatch)", stroke: "#14606e", strokeDasharray: "3 2" } : { fill: "#14606e" };
}

function ProductionColumnsSvg({ intervals, unit, width, tagged = true }: { intervals: ProductionInterval[]; unit: string; width: number; tagged?: boolean }) {
  const line = CHART_FONT_PX + 2;
  const margin = { top: 28, right: 12, bottom: 4 * line + 8, left: 56 };
  const height = clamp(Math.round(width * 0.55), 240, 320);
  const frame: Frame = { width, height, margin };
  const rates = intervals.map((interval) => interval.volumePerWorkingDay ?? 0);
  const ticks = niceTicks(Math.max(0, ...rates));
  const bottom = height - margin.bottom;
  const y = linearScale([0, ticks[ticks.length - 1]], [bottom, margin.top]);
  const slot = (width - margin.left - margin.right) / intervals.length;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="production-title" className="block" data-testid={tagged ? "production-chart" : undefined} data-layout="columns">
      <title id="production-title">{productionTitle(unit)}</title>
      <ThinIntervalHatch />
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={`${unit}/day`} />
      {intervals.map((interval, index) => {
        const rate = Math.max(0, interval.volumePerWorkingDay ?? 0);
        const left = margin.left + index * slot + slot * 0.15;
        const centre = left + slot * 0.35;
        return (
          <g key={interval.toDate} data-thin={interval.thin ? "" : undefined}>
            <rect x={left} width={slot * 0.7} y={y(rate)} height={y(0) - y(rate)} {...barPaint(interval)}>
              <title>{productionTooltip(interval, unit)}</title>
            </rect>
            <text className="figures" x={centre} y={y(rate) - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill={interval.thin ? "#5b6870" : "#1d2528"}>
              {productionValueText(interval)}
            </text>
            <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870" textAnchor="middle">
              <text x={centre} y={bottom + line}>{`${interval.fromDate.slice(5)}→`}</text>
              <text x={centre} y={bottom + 2 * line}>{interval.toDate.slice(5)}</text>
              <text x={centre} y={bottom + 3 * line}>{`${Number(interval.workingDays.toFixed(1))} d`}</text>
              <text x={centre} y={bottom + 4 * line}>{interval.basis === "days-logged" ? "logged" : "weekdays"}</text>
            </g>
          </g>
        );
      })}
    </svg>
  );
}

/**
 * The same figures for a narrow panel: one row per interval, its dates and working days on a line
 * above a horizontal bar, the rate at the bar's end, and the value axis along the bottom with as
 * many round ticks as fit their labels.
 */
function ProductionRowsSvg({ intervals, unit, width, tagged = true }: { intervals: ProductionInterval[]; unit: string; width: number; tagged?: boolean }) {
  const line = CHART_FONT_PX + 2;
  const barHeight = 14;
  const rowHeight = line + barHeight + 10;
  const valueRoom = Math.max(...intervals.map((interval) => productionValueText(interval).length)) * MONO_CHAR_PX + 8;
  const margin = { top: line + 6, right: Math.max(valueRoom, 3 * MONO_CHAR_PX), bottom: 2 * line + 6, left: 4 };
  const height = margin.top + intervals.length * rowHeight + margin.bottom;
  const rates = intervals.map((interval) => interval.volumePerWorkingDay ?? 0);
  const right = width - margin.right;
  // Round ticks, fewer while their widest label would crowd the next.
  let count = 5;
  let ticks = niceTicks(Math.max(0, ...rates), count);
  const labelWidth = (values: number[]) => Math.max(...values.map((value) => formatNumber(value, 0).length)) * MONO_CHAR_PX + 10;
  while (count > 1 && ((right - margin.left) / (ticks.length - 1)) < labelWidth(ticks)) ticks = niceTicks(Math.max(0, ...rates), --count);
  const x = linearScale([0, ticks[ticks.length - 1]], [margin.left, right]);
  const axisY = height - margin.bottom;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="production-title" className="block" data-testid={tagged ? "production-chart" : undefined} data-layout="rows">
      <title id="production-title">{productionTitle(unit)}</title>
      <ThinIntervalHatch />
      <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870">
        {ticks.map((tick, index) => (
          <g key={tick}>
            <line x1={x(tick)} x2={x(tick)} y1={margin.top} y2={axisY} stroke="#d5dcdf" />
            <text x={x(tick)} y={axisY + line} textAnchor={index === 0 ? "start" : index === ticks.length - 1 ? "end" : "middle"}>{formatNumber(tick, 0)}</text>
          </g>
        ))}
        <text x={margin.left} y={axisY + 2 * line}>{`${unit}/day`}</text>
      </g>
      {intervals.map((interval, index) => {
        const rate = Math.max(0, interval.volumePerWorkingDay ?? 0);
        const top = margin.top + index * rowHeight;
        const basis = interval.basis === "days-logged" ? "logged" : "weekdays";
        return (
          <g key={interval.toDate} data-thin={interval.thin ? "" : undefined}>
            <text className="figures" x={margin.left} y={top + CHART_FONT_PX - 2} fontSize={CHART_FONT_PX} fill="#5b6870">
              {`${interval.fromDate.slice(5)}→${interval.toDate.slice(5)} · ${Number(interval.workingDays.toFixed(1))} d ${basis}`}
            </text>
            <rect x={margin.left} y={top + line} width={Math.max(1, x(rate) - margin.left)} height={barHeight} {...barPaint(interval)}>
              <title>{productionTooltip(interval, unit)}</title>
            </rect>
            <text className="figures" x={x(rate) + 4} y={top + line + barHeight - 2} fontSize={CHART_FONT_PX} fill={interval.thin ? "#5b6870" : "#1d2528"}>
              {productionValueText(interval)}
            </text>
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
  /** For a ratio (polymer per dry ton): its parts, which a week or a month adds before dividing. */
  ratio?: { numerator: number; denominator: number } | null;
}

/** The narrowest slot a bar is given: past it, days are gathered into weeks, then months, so bars never overlap. */
export const MIN_BAR_SLOT_PX = 2;
/** The narrowest a bar is drawn (within its slot). */
const MIN_BAR_PX = 1;
const PER_WORDS: Record<BinSize, string> = { day: "day", week: "week (Monday to Sunday)", month: "calendar month" };

interface DailyBarsProps {
  bars: DailyBar[];
  unit: string;
  /** What the chart shows per day, week or month: the accessible name. */
  title: (per: BinSize) => string;
  /** The caption over the chart, per day, week or month. */
  caption: (per: BinSize) => string;
  /** "total": a week's or month's value is the sum of its days'; "ratio": its parts added, then divided. */
  kind: "total" | "ratio";
  testId: string;
  emptyText: string;
  digits: number;
}

/** Room for the plot's bars: the panel less the value axis and half of the last label. */
function dailyMargin(size: BinSize) {
  const labelChars = size === "month" ? 7 : 5;
  return { top: 28, right: Math.ceil(labelChars / 2) * MONO_CHAR_PX + 4, bottom: 2 * CHART_FONT_PX + 16, left: 56, labelChars };
}

/**
 * One bar per calendar day from the first to the last date given, so days without a record show
 * as gaps rather than closing up; a day with a record and no value is marked with a dash. When a
 * day's slot would be narrower than MIN_BAR_SLOT_PX (a long record on a phone), one bar per week,
 * or per month, gathered as `kind` says (shared/progress/daily-bins.ts), and the caption and the
 * chart's description say so.
 */
export function DailyBarsChart(props: DailyBarsProps) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(FALLBACK_WIDTH);
  const noteId = useId();
  if (props.bars.length === 0) return <p className="text-sm text-muted">{props.emptyText}</p>;
  const dayMargin = dailyMargin("day");
  const size = chooseBinSize(props.bars[0].date, props.bars[props.bars.length - 1].date, width - dayMargin.left - dayMargin.right, MIN_BAR_SLOT_PX);
  const bins = binDays(props.bars, size);
  const span = dayNumber(props.bars[props.bars.length - 1].date) - dayNumber(props.bars[0].date) + 1;
  const note = size === "day" ? null
    : `${span} days are too many for a bar each at this width: one bar per ${PER_WORDS[size]}, ${props.kind === "total" ? "the sum of its days" : "its days' parts added before dividing (not their ratios averaged)"}.`;
  return (
    <figure className="min-w-0 space-y-1 [container-type:inline-size]" data-testid={`${props.testId}-figure`}>
      <figcaption className="text-sm font-medium">{props.caption(size)}</figcaption>
      <div ref={ref} className="w-full min-w-0 overflow-hidden" style={{ height: widthLinkedHeight({ perWidth: 0.45, min: 200, max: 280 }) }}>
        <DailyBarsSvg {...props} bins={bins} size={size} width={width} noteId={note ? noteId : undefined} />
      </div>
      {note ? <p id={noteId} className="text-xs text-muted" data-testid={`${props.testId}-binning`}>{note}</p> : null}
    </figure>
  );
}

function binTooltip(bin: DayBin, byDate: Map<string, DailyBar>, unit: string, digits: number): string {
  if (bin.size === "day") return byDate.get(bin.from)?.label ?? bin.from;
  const days = (count: number) => (count === 1 ? "1 day" : `${count} days`);
  if (bin.value === null) return `${bin.from} to ${bin.to}: ${days(bin.recordDays)} logged, nothing to draw`;
  return `${bin.from} to ${bin.to}: ${formatNumber(bin.value, digits)} ${unit} from ${days(bin.valueDays)}${bin.recordDays > bin.valueDays ? ` (of ${days(bin.recordDays)} logged)` : ""}`;
}

/** The bars' SVG at `width` (exported for the layout's unit test; pages use DailyBarsChart). */
export function DailyBarsSvg({ bars, bins, size, unit, title, testId, digits, width, noteId }: DailyBarsProps & { bins: DayBin[]; size: BinSize; width: number; noteId?: string }) {
  const titleId = useId();
  // The right margin holds half of the last bin's label ("11-17", or "2026-11" by month).
  const { labelChars, ...margin } = dailyMargin(size);
  const height = clamp(Math.round(width * 0.45), 200, 280);
  const frame: Frame = { width, height, margin };
  const ticks = niceTicks(Math.max(0, ...bins.map((bin) => bin.value ?? 0)));
  const bottom = height - margin.bottom;
  const y = linearScale([0, ticks[ticks.length - 1]], [bottom, margin.top]);
  const slot = (width - margin.left - margin.right) / bins.length;
  const centre = (index: number) => margin.left + (index + 0.5) * slot;
  const barWidth = Math.min(slot - 0.5, Math.max(MIN_BAR_PX, slot * 0.7));
  const valueLabels = slot >= 6 * MONO_CHAR_PX;
  const recorded = bins.map((bin, index) => ({ bin, index })).filter(({ bin }) => bin.recordDays > 0);
  const shown = thinLabels(recorded.map(({ index }) => centre(index)), labelChars * MONO_CHAR_PX + 8);
  const byDate = new Map(bars.map((bar) => [bar.date, bar]));
  let row = 0;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby={titleId} aria-describedby={noteId} className="block" data-testid={testId} data-per={size}>
      <title id={titleId}>{title(size)}</title>
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={unit} />
      {recorded.map(({ bin, index }, position) => {
        const x = centre(index);
        const line = shown[position] ? row++ % 2 : 0;
        const tooltip = binTooltip(bin, byDate, unit, digits);
        return (
          <g key={bin.from} data-date={bin.from}>
            {bin.value === null ? (
              <text x={x} y={bottom - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#5b6870">–<title>{tooltip}</title></text>
            ) : (
              <rect x={x - barWidth / 2} width={barWidth} y={y(Math.max(0, bin.value))} height={y(0) - y(Math.max(0, bin.value))} fill="#14606e"><title>{tooltip}</title></rect>
            )}
            {valueLabels && bin.value !== null ? <text className="figures" x={x} y={y(Math.max(0, bin.value)) - 4} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#1d2528">{formatNumber(bin.value, digits)}</text> : null}
            {shown[position] ? <text className="figures" x={x} y={bottom + 16 + line * (CHART_FONT_PX + 2)} textAnchor="middle" fontSize={CHART_FONT_PX} fill="#5b6870">{size === "month" ? bin.from.slice(0, 7) : bin.from.slice(5)}</text> : null}
          </g>
        );
      })}
    </svg>
  );
}
