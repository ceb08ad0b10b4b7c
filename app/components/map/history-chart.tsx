import { useId } from "react";
import { linearScale, niceTicks } from "../../../shared/progress/chart-scale";
import { dayNumber } from "../../../shared/progress/calendar-days";
import { CHART_FONT_PX, MONO_CHAR_PX, ValueAxis, thinLabels, type Frame } from "../progress-charts";
import { formatNumber } from "../progress-figures";
import { useMeasuredWidth } from "../use-measured-width";

const REMAINING = "#a4541f";
const REMOVED = "#2f72ad";

type HistoryPoint = { date: string; remainingVolume: number; removedVolume: number };

/**
 * One cell's remaining and removed volume at each survey date, drawn at the inspector panel's
 * measured width (320 px before scripts run) with 12 px text; the key is set under it in HTML.
 */
export function HistoryChart({ history, volumeLabel }: { history: HistoryPoint[]; volumeLabel: string }) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(320);
  if (history.length === 0) return <p className="text-sm text-muted">No survey history yet.</p>;
  return (
    <figure className="min-w-0 space-y-1">
      <div ref={ref} className="w-full min-w-0 overflow-hidden">
        <HistorySvg history={history} volumeLabel={volumeLabel} width={width} />
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-xs">
        <span className="flex items-center gap-1.5"><svg aria-hidden="true" width="24" height="8"><line x1={0} x2={24} y1={4} y2={4} stroke={REMAINING} strokeWidth={2} /></svg>Remaining</span>
        <span className="flex items-center gap-1.5"><svg aria-hidden="true" width="24" height="8"><line x1={0} x2={24} y1={4} y2={4} stroke={REMOVED} strokeWidth={2} strokeDasharray="4 2" /></svg>Removed</span>
      </figcaption>
    </figure>
  );
}

function HistorySvg({ history, volumeLabel, width }: { history: HistoryPoint[]; volumeLabel: string; width: number }) {
  const titleId = useId();
  const largest = Math.max(0, ...history.flatMap((point) => [point.remainingVolume, point.removedVolume]));
  const ticks = niceTicks(largest, 3);
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
  const digits = step > 0 && step < 1 ? Math.min(6, Math.ceil(-Math.log10(step) - 1e-9)) : 0;
  const widestTick = Math.max(...ticks.map((tick) => formatNumber(tick, digits).length));
  const line = CHART_FONT_PX + 2;
  // Left: the value labels; right: half of the last date's label ("11-17"); bottom: two rows of dates.
  const margin = { top: 24, right: 3 * MONO_CHAR_PX + 4, bottom: 2 * line + 6, left: Math.max(36, widestTick * MONO_CHAR_PX + 12) };
  const height = Math.min(220, Math.max(160, Math.round(width * 0.5)));
  const frame: Frame = { width, height, margin };
  const days = history.map((point) => dayNumber(point.date));
  const x = days.length === 1 || days[0] === days[days.length - 1]
    ? () => (margin.left + width - margin.right) / 2
    : linearScale([days[0], days[days.length - 1]], [margin.left, width - margin.right]);
  const y = linearScale([0, ticks[ticks.length - 1]], [height - margin.bottom, margin.top]);
  const path = (key: "remainingVolume" | "removedVolume") => history.map((point, index) => `${index === 0 ? "M" : "L"}${x(days[index]).toFixed(1)},${y(point[key]).toFixed(1)}`).join(" ");
  const shown = thinLabels(days.map((day) => x(day)), 5 * MONO_CHAR_PX + 8);
  let row = 0;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby={titleId} className="block max-w-full" data-testid="cell-history-chart">
      <title id={titleId}>{`Remaining and removed volume of the cell at each of its ${history.length} survey dates (${volumeLabel})`}</title>
      <ValueAxis frame={frame} ticks={ticks} y={y} unit={volumeLabel} />
      <g className="figures" fontSize={CHART_FONT_PX} fill="#5b6870">
        {history.map((point, index) => {
          if (!shown[index]) return null;
          const alternate = row++ % 2;
          return <text key={point.date} x={x(days[index])} y={height - margin.bottom + 16 + alternate * line} textAnchor="middle">{point.date.slice(5)}</text>;
        })}
      </g>
      <path d={path("remainingVolume")} fill="none" stroke={REMAINING} strokeWidth="2" />
      <path d={path("removedVolume")} fill="none" stroke={REMOVED} strokeWidth="2" strokeDasharray="4 2" />
      {history.map((point, index) => (
        <g key={point.date}>
          <circle cx={x(days[index])} cy={y(point.remainingVolume)} r="3" fill={REMAINING}><title>{`${point.date}: remaining ${formatNumber(point.remainingVolume, 1)} ${volumeLabel}, removed ${formatNumber(point.removedVolume, 1)} ${volumeLabel}`}</title></circle>
          <circle cx={x(days[index])} cy={y(point.removedVolume)} r="2.5" fill={REMOVED} />
        </g>
      ))}
    </svg>
  );
}
