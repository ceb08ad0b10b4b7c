import { fitOutlineFrame, ringsPath, type LonLatRing } from "../../shared/progress/outline-svg";
import { percentColour } from "./progress-colour";

/** The work limit and the zones coloured by percent complete, drawn on the server as SVG. */
export interface OutlineMapZone {
  name: string;
  percentComplete: number | null;
  polygons: LonLatRing[][];
}

export function ProgressOutlineMap({ workLimit, zones, title }: { workLimit: LonLatRing[][]; zones: OutlineMapZone[]; title: string }) {
  const allRings = [...workLimit.flat(), ...zones.flatMap((zone) => zone.polygons.flat())];
  const frame = fitOutlineFrame(allRings, 1000, 16);
  return (
    <svg viewBox={`0 0 ${frame.width} ${frame.height}`} role="img" aria-labelledby="outline-map-title" className="h-auto w-full" data-testid="progress-map">
      <title id="outline-map-title">{title}</title>
      {zones.map((zone) => (
        <path
          key={zone.name}
          d={zone.polygons.map((polygon) => ringsPath(frame, polygon)).join("")}
          fill={percentColour(zone.percentComplete)}
          fillRule="evenodd"
          stroke="#ffffff"
          strokeWidth={2}
          data-zone={zone.name}
        >
          <title>{`${zone.name}: ${zone.percentComplete === null ? "no figures yet" : `${zone.percentComplete} % complete`}`}</title>
        </path>
      ))}
      {workLimit.map((polygon, index) => (
        <path key={index} d={ringsPath(frame, polygon)} fill="none" stroke="#0d4650" strokeWidth={3} strokeDasharray="10 6" fillRule="evenodd" />
      ))}
    </svg>
  );
}

export function PercentLegend() {
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
    </p>
  );
}
