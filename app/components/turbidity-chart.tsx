import { linearScale, niceTicks } from "../../shared/progress/chart-scale";

/** A server-rendered SVG chart of one station's turbidity readings: the limit each was held to, the paired background, exceedances marked, missed sampling intervals shaded. */

const WIDTH = 640;
const HEIGHT = 220;
const MARGIN = { top: 20, right: 16, bottom: 32, left: 52 };

export interface ChartReading {
  takenAt: string;
  value: number;
  limit: number | null;
  background: number | null;
  exceeds: boolean | null;
}

export function TurbidityChart({ station, readings, missed, fromMs, toMs, unit = "NTU", dayLabel }: {
  station: string;
  readings: ChartReading[];
  missed: Array<{ fromMs: number; toMs: number }>;
  fromMs: number;
  toMs: number;
  unit?: string;
  /** Local day label of an instant (the project time zone). */
  dayLabel: (instantMs: number) => string;
}) {
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
  const everyDays = Math.max(1, Math.ceil(spanDays / 7));
  for (let at = fromMs; at <= toMs; at += everyDays * 86_400_000) dayTicks.push(at);
  return (
    <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={`Turbidity at ${station} (${unit}), with the limit and background`} className="h-auto w-full max-w-3xl" data-testid={`turbidity-chart-${station}`}>
      {missed.map((gap) => (
        <rect key={gap.fromMs} x={x(Math.max(gap.fromMs, fromMs))} y={MARGIN.top} width={Math.max(1, x(Math.min(gap.toMs, toMs)) - x(Math.max(gap.fromMs, fromMs)))} height={HEIGHT - MARGIN.top - MARGIN.bottom} fill="#9a5b00" opacity={0.15}><title>Missed sampling interval</title></rect>
      ))}
      <g className="figures" fontSize={10} fill="#5b6870">
        {ticks.map((tick) => (
          <g key={tick}>
            <line x1={MARGIN.left} x2={WIDTH - MARGIN.right} y1={y(tick)} y2={y(tick)} stroke="#d5dcdf" />
            <text x={MARGIN.left - 6} y={y(tick) + 4} textAnchor="end">{tick}</text>
          </g>
        ))}
        <text x={MARGIN.left - 6} y={MARGIN.top - 8} textAnchor="end">{unit}</text>
        {dayTicks.map((at) => <text key={at} x={x(at)} y={HEIGHT - MARGIN.bottom + 14} textAnchor="middle">{dayLabel(at)}</text>)}
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
