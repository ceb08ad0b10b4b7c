import { useMeasuredWidth, widthLinkedHeight } from "./use-measured-width";

/**
 * A small plan view of soundings and the work limit (project coordinates, north up), drawn as
 * SVG: enough to see where a file lies, which points fall outside the limit and which stand out
 * as spikes. The frame is the one the data gives (the work limit with a margin): a point beyond it
 * is drawn on the frame's edge as a small arrow, and each edge counts the points beyond it, so one
 * far-off point can never shrink the work limit to a dot. Drawn at its panel's measured width
 * (640 px before scripts run), so its labels keep their size on a phone.
 */
export interface SoundingPlotData {
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  workLimit: Array<Array<[number, number]>>;
  points: Array<[number, number]>;
  /** Older previews: points outside the work limit, without rows. */
  highlighted?: Array<[number, number]>;
  outside?: Array<{ row: number; at: [number, number] }>;
  spikes?: Array<{ row: number; at: [number, number] }>;
  /** Soundings beyond the frame per edge (the whole file); counted from the points drawn when absent. */
  beyond?: { west: number; east: number; south: number; north: number };
}

const OUTSIDE = "#a3242a";
const SPIKE = "#b45309";

export function SoundingPlot({ data, title }: { data: SoundingPlotData; title: string }) {
  const [ref, width] = useMeasuredWidth<HTMLDivElement>(640);
  const { bounds } = data;
  const spanX = Math.max(bounds.maxX - bounds.minX, 1);
  const spanY = Math.max(bounds.maxY - bounds.minY, 1);
  const margin = 14;
  const scale = (width - 2 * margin) / spanX;
  const height = Math.min(Math.max(spanY * scale + 2 * margin, 160), 900);
  const fit = Math.min(scale, (height - 2 * margin) / spanY);
  const left = margin + ((width - 2 * margin) - spanX * fit) / 2;
  const top = margin + ((height - 2 * margin) - spanY * fit) / 2;
  const frame = { x0: left, y0: top, x1: left + spanX * fit, y1: top + spanY * fit };
  const rawX = (easting: number) => left + (easting - bounds.minX) * fit;
  const rawY = (northing: number) => top + (bounds.maxY - northing) * fit;
  /** A point's place on the plot, held on the frame's edge when it lies beyond it. */
  const place = ([e, n]: [number, number]) => {
    const x = rawX(e);
    const y = rawY(n);
    const inside = x >= frame.x0 && x <= frame.x1 && y >= frame.y0 && y <= frame.y1;
    return { x: Math.min(frame.x1, Math.max(frame.x0, Number.isFinite(x) ? x : frame.x0)), y: Math.min(frame.y1, Math.max(frame.y0, Number.isFinite(y) ? y : frame.y0)), inside };
  };
  const path = data.workLimit.map((ring) => ring.map(([e, n], index) => `${index === 0 ? "M" : "L"}${rawX(e).toFixed(1)},${rawY(n).toFixed(1)}`).join("") + "Z").join("");
  const outside = data.outside ?? (data.highlighted ?? []).map((at) => ({ row: 0, at }));
  const spikes = data.spikes ?? [];
  const beyond = data.beyond ?? data.points.reduce((count, [e, n]) => {
    const x = rawX(e);
    const y = rawY(n);
    if (x < frame.x0) count.west++;
    else if (x > frame.x1) count.east++;
    else if (y > frame.y1) count.south++;
    else if (y < frame.y0) count.north++;
    return count;
  }, { west: 0, east: 0, south: 0, north: 0 });
  const beyondTotal = beyond.west + beyond.east + beyond.south + beyond.north;
  const edgeLabels: Array<{ key: string; count: number; x: number; y: number; anchor: "start" | "middle" | "end"; text: string }> = [
    { key: "west", count: beyond.west, x: frame.x0 + 4, y: (frame.y0 + frame.y1) / 2 - 6, anchor: "start", text: `◀ ${beyond.west} beyond` },
    { key: "east", count: beyond.east, x: frame.x1 - 4, y: (frame.y0 + frame.y1) / 2 - 6, anchor: "end", text: `${beyond.east} beyond ▶` },
    { key: "north", count: beyond.north, x: (frame.x0 + frame.x1) / 2, y: frame.y0 + 14, anchor: "middle", text: `▲ ${beyond.north} beyond` },
    { key: "south", count: beyond.south, x: (frame.x0 + frame.x1) / 2, y: frame.y1 - 6, anchor: "middle", text: `▼ ${beyond.south} beyond` },
  ];
  return (
    <figure className="min-w-0 rounded border border-line bg-panel p-2 [container-type:inline-size]">
      <div ref={ref} className="w-full min-w-0 overflow-hidden" style={{ height: widthLinkedHeight({ perWidth: spanY / spanX, offset: 2 * margin * (1 - spanY / spanX), min: 160, max: 900 }) }}>
        <svg role="img" aria-label={title} width={width} height={Math.round(height)} viewBox={`0 0 ${width} ${height.toFixed(0)}`} className="block max-w-full" data-testid="sounding-plot-chart">
          <title>{title}</title>
          <rect x={frame.x0} y={frame.y0} width={frame.x1 - frame.x0} height={frame.y1 - frame.y0} fill="none" stroke="#c9d3d6" strokeDasharray="4 3" />
          {path ? <path d={path} fill="#e8f1f2" stroke="#14606e" strokeWidth={1.5} fillRule="evenodd" /> : null}
          {data.points.map((point, index) => {
            const { x, y, inside } = place(point);
            return inside
              ? <circle key={index} cx={x.toFixed(1)} cy={y.toFixed(1)} r={1} fill="#1d2528" />
              : <rect key={index} x={(x - 2).toFixed(1)} y={(y - 2).toFixed(1)} width={4} height={4} fill="#1d2528" />;
          })}
          {outside.map((item, index) => {
            const { x, y } = place(item.at);
            return <circle key={`o${index}`} data-mark="outside" cx={x.toFixed(1)} cy={y.toFixed(1)} r={5} fill="none" stroke={OUTSIDE} strokeWidth={2}><title>{item.row ? `Row ${item.row}: outside the work limit` : "Outside the work limit"}</title></circle>;
          })}
          {spikes.map((item, index) => {
            const { x, y } = place(item.at);
            return <path key={`s${index}`} data-mark="spike" d={`M${x.toFixed(1)},${(y - 6).toFixed(1)}L${(x + 5).toFixed(1)},${(y + 4).toFixed(1)}L${(x - 5).toFixed(1)},${(y + 4).toFixed(1)}Z`} fill="none" stroke={SPIKE} strokeWidth={2}><title>{`Row ${item.row}: spike`}</title></path>;
          })}
          {edgeLabels.filter((label) => label.count > 0).map((label) => (
            <text key={label.key} data-edge={label.key} x={label.x} y={label.y} textAnchor={label.anchor} fontSize={13} fill={OUTSIDE} fontWeight={600}>{label.text}</text>
          ))}
        </svg>
      </div>
      <figcaption className="mt-1 text-sm text-muted">
        {title}: {data.points.length.toLocaleString("en-US")} soundings drawn; work limit shaded.
        <span className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
          <span className="inline-flex items-center gap-1"><svg width="12" height="12" aria-hidden="true"><circle cx="6" cy="6" r="4.5" fill="none" stroke={OUTSIDE} strokeWidth="2" /></svg>Outside the work limit ({outside.length})</span>
          <span className="inline-flex items-center gap-1"><svg width="12" height="12" aria-hidden="true"><path d="M6,1L11,10L1,10Z" fill="none" stroke={SPIKE} strokeWidth="2" /></svg>Spike ({spikes.length})</span>
          {beyondTotal > 0 ? (
            <span data-testid="plot-beyond">
              ■ Beyond the frame, drawn on its edge: {edgeLabels.filter((label) => label.count > 0).map((label) => `${label.count.toLocaleString("en-US")} to the ${label.key}`).join(", ")}
            </span>
          ) : null}
        </span>
      </figcaption>
    </figure>
  );
}
