import { fitOutlineFrame, ringsPath, scaleBar, type LonLatRing } from "../../shared/progress/outline-svg";
import { NorthArrow } from "./map/north-arrow";
import { percentColour } from "./progress-colour";

/** The work limit and the zones coloured by percent complete, drawn on the server as SVG. */
export interface OutlineMapZone {
  name: string;
  /** The zone's own colour, for its outline; white when absent. */
  colour?: string | null;
  percentComplete: number | null;
  polygons: LonLatRing[][];
}

/**
 * The zones coloured by percent complete inside the work limit, over the shoreline when the project
 * has one: a small north-up outline (no tiles) with a north arrow and a scale bar, so a reader sees
 * where the water body is. The bar is HTML under the drawing, so its text keeps its size at any width.
 */
export function ProgressOutlineMap({ workLimit, zones, title, shoreline = [], scaleUnit = "ft" }: {
  workLimit: LonLatRing[][];
  zones: OutlineMapZone[];
  title: string;
  shoreline?: LonLatRing[][];
  scaleUnit?: "ft" | "m";
}) {
  const allRings = [...shoreline.flat(), ...workLimit.flat(), ...zones.flatMap((zone) => zone.polygons.flat())];
  const frame = fitOutlineFrame(allRings, 1000, 16);
  const bar = scaleBar(frame, frame.width / 4, scaleUnit);
  return (
    <div className="relative">
      <svg viewBox={`0 0 ${frame.width} ${frame.height}`} role="img" aria-labelledby="outline-map-title" className="h-auto w-full" data-testid="progress-map">
        <title id="outline-map-title">{title}</title>
        {shoreline.length > 0 ? (
          <path d={shoreline.map((polygon) => ringsPath(frame, polygon)).join("")} fill="#dcebee" fillRule="evenodd" stroke="#5b8e97" strokeWidth={2} data-testid="progress-map-shoreline">
            <title>Shoreline</title>
          </path>
        ) : null}
        {zones.map((zone) => (
          <path
            key={zone.name}
            d={zone.polygons.map((polygon) => ringsPath(frame, polygon)).join("")}
            fill={percentColour(zone.percentComplete)}
            fillRule="evenodd"
            stroke={zone.colour ?? "#ffffff"}
            strokeWidth={2}
            strokeDasharray={zone.colour ? "6 3" : undefined}
            data-zone={zone.name}
          >
            <title>{`${zone.name}: ${zone.percentComplete === null ? "no figures yet" : `${zone.percentComplete} % complete`}`}</title>
          </path>
        ))}
        {workLimit.map((polygon, index) => (
          <path key={index} d={ringsPath(frame, polygon)} fill="none" stroke="#0d4650" strokeWidth={3} strokeDasharray="10 6" fillRule="evenodd" />
        ))}
      </svg>
      {/* The drawing is north-up (an equirectangular view): the arrow never turns. */}
      <div className="absolute right-1 top-1 rounded bg-panel/80 p-0.5" data-testid="progress-map-north"><NorthArrow bearing={0} /></div>
      {bar ? (
        <div className="mt-1 flex items-center gap-2 text-xs text-muted" data-testid="progress-map-scale">
          <span aria-hidden="true" className="block h-2 border-x-2 border-b-2 border-ink" style={{ width: `${(bar.units / frame.width) * 100}%` }} />
          <span className="figures whitespace-nowrap">{bar.label}</span>
          <span className="sr-only">Scale bar: the bar is {bar.label} on the ground.</span>
        </div>
      ) : null}
    </div>
  );
}

export function PercentLegend({ shoreline = false }: { shoreline?: boolean }) {
  const steps = [0, 25, 50, 75, 100];
  return (
    <p className="flex flex-wrap items-center gap-2 text-xs text-muted" aria-label="Colour key">
      <span>Complete:</span>
      {steps.map((step) => (
        <span key={step} className="figures inline-flex items-center gap-1">
          <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm border border-line" style={{ background: percentColour(step) }} />
          {step} %
        </span>
      ))}
      <span className="inline-flex items-center gap-1"><span aria-hidden="true" className="inline-block h-0 w-5 border-t-2 border-dashed border-lagoon-dark" /> work limit</span>
      {shoreline ? <span className="inline-flex items-center gap-1"><span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm border border-[#5b8e97] bg-[#dcebee]" /> water (shoreline)</span> : null}
    </p>
  );
}
