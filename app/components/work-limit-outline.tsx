import { fitOutlineFrame, ringsPath, type LonLatRing } from "../../shared/progress/outline-svg";

/** A lon/lat GeoJSON Polygon or MultiPolygon, as the settings hold the work limit and zones. */
export type LonLatPolygons = { type: "Polygon"; coordinates: LonLatRing[] } | { type: "MultiPolygon"; coordinates: LonLatRing[][] };

export function polygonsOf(geometry: LonLatPolygons): LonLatRing[][] {
  return geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates;
}

/** The work limit (and the zones inside it) drawn as a small SVG outline: the preview beside the settings. */
export function WorkLimitOutline({ workLimit, zones = [], title, testId }: { workLimit: LonLatPolygons; zones?: Array<{ name: string; colour?: string; geometry: LonLatPolygons }>; title: string; testId?: string }) {
  const limitPolygons = polygonsOf(workLimit);
  const frame = fitOutlineFrame([...limitPolygons.flat(), ...zones.flatMap((zone) => polygonsOf(zone.geometry).flat())], 600, 12);
  return (
    <svg viewBox={`0 0 ${frame.width} ${frame.height}`} role="img" aria-label={title} className="h-auto w-full max-w-xl rounded border border-line bg-panel" data-testid={testId}>
      {zones.map((zone) => (
        <path key={zone.name} d={polygonsOf(zone.geometry).map((polygon) => ringsPath(frame, polygon)).join("")} fill="#cfe6ea" fillRule="evenodd" stroke={zone.colour ?? "#ffffff"} strokeWidth={2} strokeDasharray={zone.colour ? "6 3" : undefined}>
          <title>{zone.name}</title>
        </path>
      ))}
      {limitPolygons.map((polygon, index) => (
        <path key={index} d={ringsPath(frame, polygon)} fill="none" stroke="#0d4650" strokeWidth={3} fillRule="evenodd" />
      ))}
    </svg>
  );
}
