import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { keepRenderedForReader } from "~/lib/cache/document-cache.server";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { roleLabel } from "~/lib/auth/roles";
import { ProgressOverview } from "~/components/progress-overview";
import { ZoneSwatch } from "~/components/zone-swatch";
import { ReconciliationPanel } from "~/components/dewatering/reconciliation-panel";
import { keptProgress } from "~/models/progress.server";
import { loadReconciliation } from "~/models/reconciliation.server";
import { listZones } from "~/models/project.server";
import { loadSetupProgress } from "~/models/setup-guide.server";
import { Link } from "react-router";
import { unitLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId._index";

// The overview is what most members reload all day: its rendered answer is kept per reader until
// something is written (app/lib/cache/document-cache.server.ts).
export const middleware: Route.MiddlewareFunction[] = [keepRenderedForReader];

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project, role } = access;
  // Kept between requests until something is written (app/lib/cache/read-cache.server.ts).
  const shared = <T,>(name: string, compute: () => Promise<T>) => cachedReadFor(request, `${name}:${project.id}`, compute);
  const [zones, progress] = await Promise.all([shared("zones", () => listZones(project)), keptProgress(request, project)]);
  // The manager is reminded of the setup steps left until every one is done (an archived project is past setting up).
  const setup = can(access, "project.configure") ? await shared("setup-progress", () => loadSetupProgress(project)) : null;
  // The reconciliation rests on the same progress figures: handed over, not read twice.
  const reconciliation = progress.hasFigures ? await shared("reconciliation", () => loadReconciliation(project, progress)) : null;
  // Exports for the manager and viewers; the public share page for outreach and the manager.
  const exports = can(access, "quantities.read");
  const sharing = can(access, "share-links.manage");
  const base = `/projects/${project.id}`;
  const progressLinks = [
    ...(exports ? [{ href: `${base}/quantities`, label: "Quantities and exports" }, { href: `/api/projects/${project.id}/quantities.csv`, label: "CSV" }] : []),
    ...(sharing ? [{ href: `${base}/share`, label: "Public share links" }] : []),
  ];
  return {
    project,
    unitLabel: unitLabel(project.lengthUnit, "length-long"),
    unit: unitLabel(project.lengthUnit),
    roleLabel: role ? roleLabel(role) : `${roleLabel(null)} (not a member)`,
    zones,
    progress,
    progressLinks,
    reconciliation,
    setup: setup && !setup.complete ? { doneCount: setup.doneCount, total: setup.total } : null,
  };
}

/** A fact of the project: a figure (set in the mono font) or words (in the sans). */
function Fact({ term, children, words = false }: { term: string; children: React.ReactNode; words?: boolean }) {
  return (
    <div className="flex justify-between gap-4 border-t border-line py-2">
      <dt className="text-muted">{term}</dt>
      <dd className={`text-right ${words ? "" : "figures"}`}>{children}</dd>
    </div>
  );
}

export default function ProjectOverview({ loaderData }: Route.ComponentProps) {
  const { project, unit, zones } = loaderData;
  const percent = (share: number) => `${Math.round(share * 100)} %`;
  return (
    <div className="space-y-6">
    {loaderData.setup ? (
      <p className="flex flex-wrap items-center justify-between gap-2 rounded border border-lagoon bg-panel px-3 py-2 text-sm" data-testid="setup-reminder">
        <span>Setup: <span className="figures">{loaderData.setup.doneCount}</span> of <span className="figures">{loaderData.setup.total}</span> steps done.</span>
        <Link to={`/projects/${project.id}/setup`} className="font-medium text-lagoon underline focus-visible:outline-2 focus-visible:outline-lagoon">Continue setting up this project</Link>
      </p>
    ) : null}
    <ProgressOverview progress={loaderData.progress} links={loaderData.progressLinks} />
    {loaderData.reconciliation ? <ReconciliationPanel reconciliation={loaderData.reconciliation} dewateringHref={`/projects/${project.id}/dewatering`} /> : null}
    <div className="grid gap-6 md:grid-cols-2">
      <section aria-labelledby="facts" className="rounded border border-line bg-panel p-4">
        <h2 id="facts" className="font-semibold">Project facts</h2>
        {project.description ? <p className="mt-2 text-sm">{project.description}</p> : null}
        <dl className="mt-3 text-sm">
          <Fact term="Your role" words>{loaderData.roleLabel}</Fact>
          <Fact term="Coordinate reference system">{project.crs}</Fact>
          <Fact term="Length unit" words>{loaderData.unitLabel} ({unit})</Fact>
          <Fact term="Work limit" words>{project.hasWorkLimit ? "set" : "not set yet"}</Fact>
          <Fact term="Minimum dive team">{project.minTeamSize} people</Fact>
        </dl>
      </section>
      <section aria-labelledby="grid" className="rounded border border-line bg-panel p-4">
        <h2 id="grid" className="font-semibold">Grid and surfaces</h2>
        <dl className="mt-3 text-sm">
          <Fact term="Grid origin (easting, northing)">{project.grid.originX.toFixed(2)}, {project.grid.originY.toFixed(2)} {unit}</Fact>
          <Fact term="Cell size">{project.grid.cellSize} {unit}</Fact>
          <Fact term="Grid rotation">{project.grid.rotationDegrees}°</Fact>
          <Fact term="Raster resolution">{project.grid.rasterResolution} {unit}</Fact>
          <Fact term="Longest triangle edge">{project.grid.maxEdge} {unit}</Fact>
          <Fact term="Firm-sand tolerance">{project.grid.tolerance} {unit}</Fact>
          <Fact term="Share of cell within tolerance">{percent(project.grid.firmShare)}</Fact>
          <Fact term="Minimum surveyed coverage">{percent(project.grid.minCoverage)}</Fact>
        </dl>
      </section>
      <section aria-labelledby="zones" className="rounded border border-line bg-panel p-4 md:col-span-2">
        <h2 id="zones" className="font-semibold">Zones</h2>
        {zones.length === 0 ? (
          <p className="mt-2 text-sm text-muted">No zones yet: the whole work limit counts as one.</p>
        ) : (
          <ol className="mt-2 list-decimal pl-6 text-sm">
            {zones.map((zone) => <li key={zone.id}><ZoneSwatch colour={zone.colour} />{zone.name}</li>)}
          </ol>
        )}
      </section>
    </div>
    </div>
  );
}
