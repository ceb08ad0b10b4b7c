/** A small SVG chart of one cell's remaining and removed volume at each survey date. */
export function HistoryChart({ history, volumeLabel }: { history: Array<{ date: string; remainingVolume: number; removedVolume: number }>; volumeLabel: string }) {
  if (history.length === 0) return <p className="text-sm text-muted">No survey history yet.</p>;
  // The legend sits under the dates, clear of the lines; the right margin leaves room for the last date.
  const width = 260, height = 126, left = 34, bottom = 32, top = 8, right = 16;
  const largest = Math.max(1, ...history.flatMap((point) => [point.remainingVolume, point.removedVolume]));
  const x = (index: number) => left + (history.length === 1 ? 0 : (index / (history.length - 1)) * (width - left - right));
  const y = (value: number) => top + (1 - value / largest) * (height - top - bottom);
  const path = (key: "remainingVolume" | "removedVolume") => history.map((point, index) => `${index === 0 ? "M" : "L"}${x(index).toFixed(1)},${y(point[key]).toFixed(1)}`).join(" ");
  return (
    <svg role="img" aria-label={`History of the cell across ${history.length} survey dates`} viewBox={`0 0 ${width} ${height}`} className="w-full max-w-xs">
      <line x1={left} y1={height - bottom} x2={width - right} y2={height - bottom} stroke="#d5dcdf" />
      <text x={2} y={top + 8} fontSize="9">{largest.toFixed(0)}</text>
      <text x={2} y={height - bottom} fontSize="9">0 {volumeLabel}</text>
      <path d={path("remainingVolume")} fill="none" stroke="#a4541f" strokeWidth="2" />
      <path d={path("removedVolume")} fill="none" stroke="#2f72ad" strokeWidth="2" strokeDasharray="4 2" />
      {history.map((point, index) => (
        <g key={point.date}>
          <circle cx={x(index)} cy={y(point.remainingVolume)} r="2.5" fill="#a4541f"><title>{`${point.date}: remaining ${point.remainingVolume} ${volumeLabel}, removed ${point.removedVolume} ${volumeLabel}`}</title></circle>
          <text x={x(index)} y={height - bottom + 12} fontSize="8" textAnchor="middle">{point.date.slice(5)}</text>
        </g>
      ))}
      <line x1={left} y1={height - 7} x2={left + 14} y2={height - 7} stroke="#a4541f" strokeWidth="2" />
      <text x={left + 18} y={height - 4} fontSize="9" fill="#a4541f">remaining</text>
      <line x1={left + 84} y1={height - 7} x2={left + 98} y2={height - 7} stroke="#2f72ad" strokeWidth="2" strokeDasharray="4 2" />
      <text x={left + 102} y={height - 4} fontSize="9" fill="#2f72ad">removed</text>
    </svg>
  );
}
