import { linearScale, niceTicks } from "../../shared/progress/chart-scale";
import { CHART_FONT_PX, MONO_CHAR_PX } from "./progress-charts";
import { useMeasuredWidth, widthLinkedHeight } from "./use-measured-width";

/**
 * An SVG chart of one station's turbidity readings: the limit each was held to, the paired
 * background, exceedances marked, missed sampling intervals shaded. Drawn at its panel's width
 * (measured; 640 px before scripts run) so its text is 12 px at any width.
 */

// The right margin holds half of the last day's label ("11-17") at 12 px.
const MARGIN = { top: 24, right: 3 * MONO_CHAR_PX + 4, bottom: 34, left: 52 };

export interface ChartReading {
  takenAt: string;
  value: number;
  limit: number | null;
  background: number | null;
  exceeds: boolean | null;
}

type TurbidityChartProps = {
  station: string;
  readings: ChartReading[];
  missed: Array<{ fromMs: number; toMs: number }>;
  fromMs: number;
  toMs: number;
  unit?: string;
  /** Local day label of an instant (the project time zone). */
  dayLabel: (instantMs: number) => string;
};

export function TurbidityChart(props: TurbidityChartProps) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(640);
  return (
    <div className="min-w-0 [container-type:inline-size]">
      <div ref={ref} className="w-full min-w-0 overflow-hidden" style={{ height: widthLinkedHeight({ perWidth: 0.4, min: 200, max: 280 }) }}><TurbiditySvg {...props} width={width} /></div>
    </div>
  );
}

function TurbiditySvg({ station, readings, missed, fromMs, toMs, unit = "NTU", dayLabel, width: WIDTH }: TurbidityChartProps & { width: number }) {
  const HEIGHT = Math.min(280, Math.max(200, Math.round(WIDTH * 0.4)));
  const x = linearScale([fromMs, toMs], [MARGIN.left, WIDTH - MARGIN.right]);
  const max = Math.max(1, ...readings.flatMap((reading) => [reading.value, reading.limit ?? 0, reading.background ?? 0]));
  const ticks = niceTicks(max, 4);
  const y = linearScale([0, ticks[ticks.length - 1]], [HEIGHT - MARGIN.bottom, MARGIN.top]);
  const points = readings.map((reading) => ({ ...reading, atMs: Date.parse(reading.takenAt) })).sort((a, b) => a.atMs - b.atMs);
  const pathOf = (values: Array<{ atMs: number; value: number | null }>) => {
    let path = "";
    let pen = false;
    for (const point of values) {
      if (point.value === null) { pen = false; continue; }
      path += `${pen ? "L" : "M"}${x(point.atMs).toFixed(1)} ${y(point.value).toFixed(1)}`;
      pen = true;
    }
    return path;
  };
  const dayTicks: number[] = [];
  const spanDays = Math.max(1, Math.round((toMs - fromMs) / 86_400_000));
  // As many day labels as fit at 12 px (a MM-DD label and its gap, in the mono font at 0.6 em a character).
  const labelsThatFit = Math.max(2, Math.floor((WIDTH - MARGIN.left - MARGIN.right) / (6 * CHART_FONT_PX * 0.6 + 16)));
  const everyDays = Math.max(1, Math.ceil(spanDays / labelsThatFit));
  for (let at = fromMs; at <= toMs; at += everyDays * 86_400_000) dayTicks.push(at);
  return (
    <svg width={WIDTH} height={HEIGHT} viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={`Turbidity at ${station} (${unit}), with the limit and background`} className="block max-w-full" data-testid={`turbidity-chart-${station}`}>
      {missed.map((gap) => (
        <rect key={gap.fromMs} x={x(Math.max(gap.fromMs, fromMs))} y={MARGIN.top} width={Math.max(1, x(Math.min(gap.toMs, toMs)) - x(Math.max(gap.fromMs, fromMs)))} height={HEIGHT - MARGIN.top - MARGIN.bottom} fill="#9a5b00" opacity={0.15}><title>Missed sampling interval</title></rect>
      ))}
      <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870">
        {ticks.map((tick) => (
          <g key={tick}>
            <line x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(tick)} y2={y(tick)} stroke="#d5dcdf" />
            <text x={MARGIN.left - 6} y={y(tick) + 4} textAnchor="end">{tick}</text>
          </g>
        ))}
        <text x={4} y={MARGIN.top - 10}>{unit}</text>
        {dayTicks.map((at) => <text key={at} x={x(at)} y={HEIGHT - MARGIN.bottom + 18} textAnchor="middle">{dayLabel(at)}</text>)}
      </g>
      <path d={pathOf(points.map((point) => ({ atMs: point.atMs, value: point.limit })))} fill="none" stroke="#a3242a" strokeWidth={1.5} strokeDasharray="5 3" />
      <path d={pathOf(points.map((point) => ({ atMs: point.atMs, value: point.background })))} fill="none" stroke="#5b6870" strokeWidth={1} />
      <path d={pathOf(points.map((point) => ({ atMs: point.atMs, value: point.value })))} fill="none" stroke="#14606e" strokeWidth={2} />
      {points.map((point, index) => (
        <circle key={index} cx={x(point.atMs)} cy={y(point.value)} r={point.exceeds ? 5 : 3} fill={point.exceeds ? "#a3242a" : "#14606e"}>
          <title>{`${point.takenAt}: ${point.value} ${unit}${point.limit !== null ? `, limit ${point.limit}` : ""}${point.exceeds ? " — EXCEEDS" : ""}`}</title>
        </circle>
      ))}
    </svg>
  );
}
