import { Link } from "react-router";
import { fitOutlineFrame, ringsPath, type LonLatRing } from "../../shared/progress/outline-svg";
import type { EmergencyInfo } from "../../shared/dive-plan/emergency-info";

/**
 * The parts of the printed day sheet beyond the plan's tables: a small map of the day's cells, the
 * project's emergency information, and the sign-off lines. Drawn from the project's own geometry
 * as SVG (no tiles), so the sheet prints the same anywhere.
 */

export interface DaySheetMapData {
  workLimit: LonLatRing[][];
  cells: Array<{ label: string; team: string; teamIndex: number; ring: LonLatRing }>;
}

/** Team fills: light tints apart in lightness and hue, with dark labels legible on each; a dash pattern per team for grey printers. */
const TEAM_FILLS = ["#f6c978", "#9fd0ee", "#bfe0a6", "#e8b7d4", "#d9d3c4"];
const TEAM_DASHES = [undefined, "6 3", "2 2", "8 3 2 3", "1 3"];

const METRES_PER_DEGREE_LAT = 111_320; // mean length of a degree of latitude (memory: 1852 m per minute × 60 ≈ 111.1 km; 111.32 km at the equator)
const METRES_PER_FOOT = 0.3048; // international foot (published: exact by definition, 1959)

function boundsOf(rings: readonly LonLatRing[]) {
  let minLon = Infinity, maxLon = -Infinity, minLat = Infinity, maxLat = -Infinity;
  for (const ring of rings) {
    for (const [lon, lat] of ring) {
      minLon = Math.min(minLon, lon); maxLon = Math.max(maxLon, lon);
      minLat = Math.min(minLat, lat); maxLat = Math.max(maxLat, lat);
    }
  }
  return { minLon, maxLon, minLat, maxLat };
}

/** The day's cells padded around so nearby shore shows, kept between 1:2 and 2:1 so the sheet's map is neither a sliver nor a tower. */
function viewRing(cells: readonly LonLatRing[]): LonLatRing {
  const { minLon, maxLon, minLat, maxLat } = boundsOf(cells);
  const xScale = Math.cos((((minLat + maxLat) / 2) * Math.PI) / 180);
  let halfX = ((maxLon - minLon) * xScale) / 2;
  let halfY = (maxLat - minLat) / 2;
  // At least a cell and a half of margin each side: the cell ring's own span is one cell.
  const cellSpan = Math.max(...cells.map((ring) => { const b = boundsOf([ring]); return Math.max((b.maxLon - b.minLon) * xScale, b.maxLat - b.minLat); }));
  halfX = Math.max(halfX * 1.3, halfX + 1.5 * cellSpan);
  halfY = Math.max(halfY * 1.3, halfY + 1.5 * cellSpan);
  if (halfY < halfX / 2) halfY = halfX / 2;
  if (halfX < halfY / 2) halfX = halfY / 2;
  const midLon = (minLon + maxLon) / 2;
  const midLat = (minLat + maxLat) / 2;
  const dLon = halfX / xScale;
  return [[midLon - dLon, midLat - halfY], [midLon + dLon, midLat - halfY], [midLon + dLon, midLat + halfY], [midLon - dLon, midLat + halfY], [midLon - dLon, midLat - halfY]];
}

/** A round scale-bar length (1, 2 or 5 × a power of ten) close to a quarter of `span`. */
export function roundScaleLength(span: number): number {
  const target = span / 4;
  const power = 10 ** Math.floor(Math.log10(target));
  const steps = [1, 2, 5, 10].map((step) => step * power);
  return steps.reduce((best, step) => (Math.abs(step - target) < Math.abs(best - target) ? step : best));
}

export function DaySheetMap({ map, date, lengthLabel }: { map: DaySheetMapData; date: string; lengthLabel: string }) {
  if (map.cells.length === 0) return null;
  // About the size it is drawn at, so the labels' user units are close to pixels (12 px at least).
  const width = 300;
  const view = viewRing(map.cells.map((cell) => cell.ring));
  const frame = fitOutlineFrame([view], width, 0);
  const bounds = boundsOf([view]);
  const midLat = (bounds.minLat + bounds.maxLat) / 2;
  const metresAcross = (bounds.maxLon - bounds.minLon) * Math.cos((midLat * Math.PI) / 180) * METRES_PER_DEGREE_LAT;
  const inFeet = lengthLabel.includes("ft");
  const across = inFeet ? metresAcross / METRES_PER_FOOT : metresAcross;
  const scaleLength = roundScaleLength(across);
  const scalePx = (scaleLength / across) * width;
  const inset = fitOutlineFrame(map.workLimit.flat(), 84, 4);
  const teams = [...new Map(map.cells.map((cell) => [cell.teamIndex, cell.team])).entries()].sort((a, b) => a[0] - b[0]);
  const clipId = `day-sheet-clip-${date}`;
  return (
    <figure className="day-sheet-map space-y-1" data-testid="day-sheet-map">
      <svg viewBox={`0 0 ${frame.width} ${frame.height}`} role="img" aria-labelledby={`${clipId}-title`} className="h-auto w-full max-w-md rounded border border-line bg-white">
        <title id={`${clipId}-title`}>{`The day's cells on ${date}: ${map.cells.map((cell) => `${cell.label} (${cell.team})`).join(", ")}`}</title>
        <defs>
          <clipPath id={clipId}><rect x={0} y={0} width={frame.width} height={frame.height} /></clipPath>
        </defs>
        <g clipPath={`url(#${clipId})`}>
          <rect x={0} y={0} width={frame.width} height={frame.height} fill="#f1f0ec" />
          {map.workLimit.map((polygon, index) => (
            <path key={index} d={ringsPath(frame, polygon)} fill="#e3f0f3" stroke="#0d4650" strokeWidth={2.5} fillRule="evenodd" />
          ))}
          {map.cells.map((cell) => {
            const path = ringsPath(frame, [cell.ring]);
            const points = cell.ring.slice(0, -1).map(([lon, lat]) => frame.project(lon, lat));
            const cx = points.reduce((sum, point) => sum + point[0], 0) / points.length;
            const cy = points.reduce((sum, point) => sum + point[1], 0) / points.length;
            const side = Math.hypot(points[1][0] - points[0][0], points[1][1] - points[0][1]);
            const fontSize = Math.max(12, Math.min(18, side / 3));
            return (
              <g key={cell.label} data-cell={cell.label}>
                <path d={path} fill={TEAM_FILLS[cell.teamIndex % TEAM_FILLS.length]} stroke="#1f2a30" strokeWidth={1.5} strokeDasharray={TEAM_DASHES[cell.teamIndex % TEAM_DASHES.length]} />
                <text x={cx} y={cy} textAnchor="middle" dominantBaseline="central" fontSize={fontSize} fontWeight={600} fill="#1f2a30">{cell.label}</text>
              </g>
            );
          })}
        </g>
        {/* North arrow: the frame is drawn north-up. */}
        <g transform={`translate(${frame.width - 28}, 10)`} aria-hidden="true">
          <path d="M0 22 L8 0 L16 22 L8 16 Z" fill="#1f2a30" />
          <text x={8} y={38} textAnchor="middle" fontSize={14} fontWeight={700} fill="#1f2a30">N</text>
        </g>
        <g transform={`translate(10, ${frame.height - 12})`} aria-hidden="true">
          <rect x={-4} y={-16} width={scalePx + 64} height={24} fill="#ffffff" opacity={0.85} />
          <path d={`M0 0 H${scalePx} M0 -6 V4 M${scalePx} -6 V4`} stroke="#1f2a30" strokeWidth={2} fill="none" />
          <text x={scalePx + 5} y={4} fontSize={12} fill="#1f2a30">{`${scaleLength.toLocaleString("en-US")} ${lengthLabel}`}</text>
        </g>
        {/* Locator: the whole work limit with the view marked. */}
        <g transform={`translate(${frame.width - inset.width - 8}, ${frame.height - inset.height - 8})`} aria-hidden="true">
          <rect x={0} y={0} width={inset.width} height={inset.height} fill="#ffffff" stroke="#9aa5a8" />
          {map.workLimit.map((polygon, index) => (
            <path key={index} d={ringsPath(inset, polygon)} fill="#e3f0f3" stroke="#0d4650" strokeWidth={1.2} fillRule="evenodd" />
          ))}
          <path d={ringsPath(inset, [view])} fill="none" stroke="#a3242a" strokeWidth={2} />
        </g>
      </svg>
      <figcaption className="flex flex-wrap items-center gap-x-3 text-xs">
        {teams.map(([index, name]) => (
          <span key={index} className="flex items-center gap-1">
            <svg width="14" height="14" aria-hidden="true"><rect x="1" y="1" width="12" height="12" fill={TEAM_FILLS[index % TEAM_FILLS.length]} stroke="#1f2a30" strokeDasharray={TEAM_DASHES[index % TEAM_DASHES.length]} /></svg>
            {name}
          </span>
        ))}
        <span className="text-muted">Blue: inside the work limit. Inset: the whole limit, this view in red. Not for navigation.</span>
      </figcaption>
    </figure>
  );
}

/** Each row: words, then a phone number kept on one line. */
const EMERGENCY_ROWS: Array<{ label: string; value: (info: EmergencyInfo) => { text: string; phone: string } }> = [
  { label: "Emergency services", value: (info) => ({ text: "", phone: info.emergencyNumber }) },
  { label: "Nearest hospital", value: (info) => ({ text: info.hospitalName, phone: info.hospitalPhone }) },
  { label: "Nearest hyperbaric chamber", value: (info) => ({ text: info.chamberName, phone: info.chamberPhone }) },
  { label: "Site address", value: (info) => ({ text: info.siteAddress, phone: "" }) },
  { label: "Access point", value: (info) => ({ text: info.accessPoint, phone: "" }) },
];

export function EmergencyBlock({ info, missing, settingsHref }: { info: EmergencyInfo | null; missing: string[]; settingsHref: string | null }) {
  const none = !info || missing.length === EMERGENCY_ROWS.length;
  return (
    <section aria-labelledby="emergency-title" className="emergency-block rounded border-2 border-danger bg-white p-2 text-sm" data-testid="emergency-block">
      <h3 id="emergency-title" className="font-semibold text-danger">Emergency</h3>
      {none ? (
        <p className="font-semibold text-danger">
          <span data-testid="emergency-missing">No emergency information set — add it under Settings before diving.</span>
          {settingsHref ? <> <Link to={settingsHref} className="no-print underline">Open Settings</Link></> : null}
        </p>
      ) : (
        <>
          <dl className="grid grid-cols-1 gap-x-3 sm:grid-cols-[auto_1fr] sm:gap-y-0.5 print:grid-cols-[auto_1fr]">
            {EMERGENCY_ROWS.map((row) => {
              const { text, phone } = row.value(info!);
              return (
                <div key={row.label} className="contents">
                  <dt className="font-medium">{row.label}</dt>
                  <dd className={`mb-1 sm:mb-0 print:mb-0 ${text || phone ? "" : "text-danger"}`}>
                    {text}{text && phone ? " · " : ""}{phone ? <span className="figures whitespace-nowrap font-semibold">{phone}</span> : null}{text || phone ? "" : "not set"}
                  </dd>
                </div>
              );
            })}
          </dl>
          {missing.length > 0 ? (
            <p className="mt-1 font-semibold text-danger" data-testid="emergency-incomplete">
              Emergency information is incomplete, missing {missing.join("; ")} — add it under Settings before diving.
            </p>
          ) : null}
        </>
      )}
      <p className="mt-1 text-xs text-muted">The project's emergency action plan and the dive supervisor decide; check this against them.</p>
    </section>
  );
}

/** Sign-off lines: the dive supervisor, then each diver (the team's divers, then visitors who dived), then a spare line. */
export function SignOffLines({ teamName, divers }: { teamName: string; divers: Array<{ name: string; visitor: boolean }> }) {
  const lines = [{ role: "Dive supervisor", name: "" }, ...divers.map((diver) => ({ role: diver.visitor ? "Diver (visitor)" : "Diver", name: diver.name })), { role: "Diver", name: "" }];
  return (
    <table className="sign-off w-full border-collapse font-sans text-sm" aria-label={`Sign-off for ${teamName}`} data-testid="sign-off">
      <caption className="text-left font-semibold">Sign-off · {teamName}: briefed on this plan, the caution and the emergency information</caption>
      <thead>
        <tr className="text-left"><th className="w-40 py-1 pr-2">Role</th><th className="pr-2">Name</th><th className="pr-2">Signature</th><th className="w-24">Time</th></tr>
      </thead>
      <tbody>
        {lines.map((line, index) => (
          <tr key={index} className="h-9 border-b border-[#1f2a30]" data-testid="sign-off-line">
            <td className="pr-2 align-bottom">{line.role}</td>
            <td className="pr-2 align-bottom">{line.name}</td>
            <td />
            <td />
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Who signs as a diver: the team's people whose duty is diving (all of them when no duty says so), then the day's visitors. */
export function signingDivers(members: Array<{ name: string; duty: string }>, visitors: string[]): Array<{ name: string; visitor: boolean }> {
  const divers = members.filter((member) => /div/i.test(member.duty));
  const listed = (divers.length > 0 ? divers : members).map((member) => ({ name: member.name, visitor: false }));
  return [...listed, ...[...new Set(visitors)].map((name) => ({ name, visitor: true }))];
}
