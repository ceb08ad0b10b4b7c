import { linearScale, niceTicks, spreadLabels } from "../../shared/progress/chart-scale";
import { dayNumber } from "../../shared/progress/calendar-days";
import type { ProductionInterval } from "../../shared/progress/production";
import { formatNumber } from "./progress-figures";

/** Server-rendered SVG charts of progress: readable before (and without) scripts. */

const WIDTH = 640;
const HEIGHT = 260;
const MARGIN = { top: 24, right: 120, bottom: 36, left: 64 };
const LINE_COLOURS = ["#14606e", "#9a5b00", "#6b4c9a", "#2f6f3e", "#a3242a", "#3c6e9f"];

export interface RemovedSeries {
  name: string;
  values: Array<number | null>;
  total?: boolean;
}

function ValueAxis({ ticks, y, unit }: { ticks: number[]; y: (value: number) => number; unit: string }) {
  return (
    <g className="figures" fontSize={11} fill="#5b6870">
      {ticks.map((tick) => (
        <g key={tick}>
          <line x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(tick)} y2={y(tick)} stroke="#d5dcdf" />
          <text x={MARGIN.left - 6} y={y(tick) + 4} textAnchor="end">{formatNumber(tick)}</text>
        </g>
      ))}
      <text x={MARGIN.left - 6} y={MARGIN.top - 12} fontSize={11} textAnchor="end">{unit}</text>
    </g>
  );
}

/** Cumulative removed volume by survey date: one line per zone and a heavier one for the project. */
export function CumulativeRemovedChart({ dates, series, unit }: { dates: string[]; series: RemovedSeries[]; unit: string }) {
  if (dates.length === 0) return <p className="text-sm text-muted">No surveys yet.</p>;
  const days = dates.map(dayNumber);
  const x = linearScale([days[0], days[days.length - 1]], [MARGIN.left, WIDTH - MARGIN.right]);
  const max = Math.max(0, ...series.flatMap((line) => line.values.filter((value): value is number => value !== null)));
  const ticks = niceTicks(max);
  const y = linearScale([0, ticks[ticks.length - 1]], [HEIGHT - MARGIN.bottom, MARGIN.top]);
  // End labels sit beside each line's last value, pushed apart where lines end close together.
  const lastValues = series.map((line) => [...line.values].reverse().find((value): value is number => value !== null) ?? 0);
  const labelY = spreadLabels(lastValues.map((value) => y(value) + 4), 12, MARGIN.top, HEIGHT - MARGIN.bottom + 4);
  return (
    <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby="cumulative-title" className="h-auto w-full" data-testid="cumulative-chart">
      {/* One string: React renders a <title> of several text children empty on the server. */}
      <title id="cumulative-title">{`Cumulative removed volume by survey date, per zone and for the project (${unit})`}</title>
      <ValueAxis ticks={ticks} y={y} unit={unit} />
      <g className="figures" fontSize={10} fill="#5b6870">
        {dates.map((date, index) => (
          <text key={date} x={x(days[index])} y={HEIGHT - MARGIN.bottom + 14 + (index % 2) * 11} textAnchor="middle">{date.slice(5)}</text>
        ))}
      </g>
      {series.map((line, lineIndex) => {
        const colour = line.total ? "#1d2528" : LINE_COLOURS[lineIndex % LINE_COLOURS.length];
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
            {line.values.map((value, index) => value === null ? null : <circle key={index} cx={x(days[index])} cy={y(value)} r={3} fill={colour}><title>{`${line.name}, ${dates[index]}: ${formatNumber(value)} ${unit}`}</title></circle>)}
            <text x={WIDTH - MARGIN.right + 8} y={labelY[lineIndex]} fontSize={11} fill={colour}>{line.name}</text>
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
export function ProductionChart({ intervals, unit }: { intervals: ProductionInterval[]; unit: string }) {
  if (intervals.length === 0) return <p className="text-sm text-muted">Production needs two survey dates.</p>;
  const rates = intervals.map((interval) => interval.volumePerWorkingDay ?? 0);
  const ticks = niceTicks(Math.max(0, ...rates));
  const bottom = HEIGHT - MARGIN.bottom - 12; // room for a third label line: the basis
  const y = linearScale([0, ticks[ticks.length - 1]], [bottom, MARGIN.top]);
  const slot = (WIDTH - MARGIN.left - MARGIN.right) / intervals.length;
  return (
    <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby="production-title" className="h-auto w-full" data-testid="production-chart">
      <title id="production-title">{`Production per working day between survey dates (${unit} per working day)`}</title>
      <defs>
        <pattern id="thin-interval-hatch" width={6} height={6} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width={6} height={6} fill="#e3eef0" />
          <line x1={0} y1={0} x2={0} y2={6} stroke="#14606e" strokeWidth={1.5} strokeOpacity={0.5} />
        </pattern>
      </defs>
      <ValueAxis ticks={ticks} y={y} unit={`${unit}/day`} />
      {intervals.map((interval, index) => {
        const rate = Math.max(0, interval.volumePerWorkingDay ?? 0);
        const left = MARGIN.left + index * slot + slot * 0.15;
        const centre = left + slot * 0.35;
        const basis = interval.basis === "dives-logged" ? "dives logged" : "weekdays";
        return (
          <g key={interval.toDate} data-thin={interval.thin ? "" : undefined}>
            <rect x={left} width={slot * 0.7} y={y(rate)} height={y(0) - y(rate)} fill={interval.thin ? "url(#thin-interval-hatch)" : "#14606e"} stroke={interval.thin ? "#14606e" : undefined} strokeDasharray={interval.thin ? "3 2" : undefined}>
              <title>{`${interval.fromDate} → ${interval.toDate}: ${formatNumber(interval.removedVolume)} ${unit} over ${interval.workingDays} working days (${basis}) = ${formatNumber(interval.volumePerWorkingDay, 1)} ${unit}/day${interval.thin ? "; thin: too few working days for this rate to compare with the others" : ""}`}</title>
            </rect>
            <text className="figures" x={centre} y={y(rate) - 4} textAnchor="middle" fontSize={11} fill={interval.thin ? "#5b6870" : "#1d2528"}>
              {`${formatNumber(interval.volumePerWorkingDay, 0)}${interval.thin ? " thin" : ""}`}
            </text>
            <text className="figures" x={centre} y={bottom + 14} textAnchor="middle" fontSize={10} fill="#5b6870">{`${interval.fromDate.slice(5)}→${interval.toDate.slice(5)}`}</text>
            <text className="figures" x={centre} y={bottom + 26} textAnchor="middle" fontSize={10} fill="#5b6870">{`${interval.workingDays} d`}</text>
            <text className="figures" x={centre} y={bottom + 38} textAnchor="middle" fontSize={10} fill="#5b6870">{basis}</text>
          </g>
        );
      })}
    </svg>
  );
}
