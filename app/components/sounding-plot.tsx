/**
 * A small plan view of soundings and the work limit (project coordinates, north up), drawn as
 * SVG: enough to see where a file lies and which points fall outside the limit.
 */
export interface SoundingPlotData {
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  workLimit: Array<Array<[number, number]>>;
  points: Array<[number, number]>;
  highlighted?: Array<[number, number]>;
}

export function SoundingPlot({ data, title, width = 640 }: { data: SoundingPlotData; title: string; width?: number }) {
  const { bounds } = data;
  const spanX = Math.max(bounds.maxX - bounds.minX, 1);
  const spanY = Math.max(bounds.maxY - bounds.minY, 1);
  const margin = 8;
  const scale = (width - 2 * margin) / spanX;
  const height = Math.min(Math.max(spanY * scale + 2 * margin, 120), 900);
  const fit = Math.min(scale, (height - 2 * margin) / spanY);
  const x = (easting: number) => margin + (easting - bounds.minX) * fit;
  const y = (northing: number) => height - margin - (northing - bounds.minY) * fit;
  const path = data.workLimit.map((ring) => ring.map(([e, n], index) => `${index === 0 ? "M" : "L"}${x(e).toFixed(1)},${y(n).toFixed(1)}`).join("") + "Z").join("");
  const highlighted = data.highlighted ?? [];
  return (
    <figure className="rounded border border-line bg-panel p-2">
      <svg role="img" aria-label={title} viewBox={`0 0 ${width} ${height.toFixed(0)}`} className="h-auto w-full max-w-full">
        <title>{title}</title>
        {path ? <path d={path} fill="#e8f1f2" stroke="#14606e" strokeWidth={1.5} fillRule="evenodd" /> : null}
        {data.points.map(([e, n], index) => (
          <circle key={index} cx={x(e).toFixed(1)} cy={y(n).toFixed(1)} r={1} fill="#1d2528" />
        ))}
        {highlighted.map(([e, n], index) => (
          <circle key={`h${index}`} cx={x(e).toFixed(1)} cy={y(n).toFixed(1)} r={4} fill="none" stroke="#a3242a" strokeWidth={2} />
        ))}
      </svg>
      <figcaption className="mt-1 text-sm text-muted">
        {title}: {data.points.length.toLocaleString("en-US")} soundings drawn{highlighted.length ? `, ${highlighted.length} outside the work limit circled in red` : ""}; work limit shaded.
      </figcaption>
    </figure>
  );
}
