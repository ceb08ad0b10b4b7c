import { Link } from "react-router";
import { Percent, Volume, ZoneName, zoneKey } from "~/components/progress-figures";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { requireRole } from "~/lib/auth/access.server";
import { loadQuantities } from "~/models/quantities.server";
import type { Route } from "./+types/projects.$projectId.quantities";

// The manager's and viewers' quantities exports: the survey pair and method, zone totals, and the
// CSV, GeoJSON and printable report downloads.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "quantities.read");
  const view = await loadQuantities(project);
  return { project: view.project, baseline: view.baseline, latest: view.latest, method: view.method, total: view.progress.total, zones: view.progress.zones, cellCount: view.cells.length };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Quantities · Firmsand" }];
}

const linkClass = "rounded border border-line bg-panel px-3 py-2 text-sm hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon";

export default function Quantities({ loaderData }: Route.ComponentProps) {
  const { project, total, zones } = loaderData;
  const unit = project.volumeLabel;
  return (
    <div className="space-y-6">
      <section aria-labelledby="exports" className="rounded border border-line bg-panel p-4">
        <h2 id="exports" className="font-semibold">Exports</h2>
        <p className="mt-1 text-sm">
          Survey pair: baseline {loaderData.baseline ? <span className="figures">{loaderData.baseline.surveyedOn}</span> : "none"} → latest{" "}
          {loaderData.latest ? <span className="figures">{loaderData.latest.surveyedOn} ({loaderData.latest.kind})</span> : "none"} · volumes in {unit} · {loaderData.cellCount} cells
        </p>
        <p className="mt-1 text-sm text-muted">{loaderData.method}</p>
        <div className="mt-3 flex flex-wrap gap-2">
          <a className={linkClass} href={`/api/projects/${project.id}/quantities.csv`} download>Quantities CSV (zones and cells)</a>
          <a className={linkClass} href={`/api/projects/${project.id}/quantities.geojson`} download>Cells GeoJSON</a>
          <Link className={linkClass} to={`/projects/${project.id}/quantities/report`}>Printable quantities report</Link>
        </div>
        <p className="mt-2 text-xs text-muted">Text in the CSV that a spreadsheet could read as a formula is prefixed with an apostrophe (OWASP advice on CSV injection).</p>
      </section>
      <section aria-labelledby="zone-totals" className="rounded border border-line bg-panel p-4">
        <h2 id="zone-totals" className="font-semibold">Totals per zone</h2>
        <table className="mt-2 w-full text-right text-sm">
          <thead><tr className="border-b border-line"><th className="py-1 text-left font-sans">Zone</th><th>Planned</th><th>Removed</th><th>Remaining</th><th>Complete</th></tr></thead>
          <tbody>
            {zones.map((zone) => (
              <tr key={zoneKey(zone)} className="border-b border-line">
                <th scope="row" className="py-1 text-left font-sans font-normal"><ZoneName zone={zone} /></th>
                <td><Volume value={zone.plannedVolume} unit={unit} /></td><td><Volume value={zone.removedVolume} unit={unit} /></td>
                <td><Volume value={zone.remainingVolume} unit={unit} /></td><td><Percent value={zone.percentCompleteByVolume} /></td>
              </tr>
            ))}
            <tr className="font-semibold">
              <th scope="row" className="py-1 text-left font-sans">Project</th>
              <td><Volume value={total.plannedVolume} unit={unit} /></td><td><Volume value={total.removedVolume} unit={unit} /></td>
              <td><Volume value={total.remainingVolume} unit={unit} /></td><td><Percent value={total.percentCompleteByVolume} /></td>
            </tr>
          </tbody>
        </table>
        {zones.some((zone) => zone.zoneId === null) ? <p className="mt-2 text-xs text-muted">{UNZONED_NOTE}</p> : null}
      </section>
    </div>
  );
}
