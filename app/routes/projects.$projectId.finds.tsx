import { Link } from "react-router";
import { amountText, FIND_CATEGORY_LABELS, FIND_STATUS_LABELS, instantToLocalDateTime } from "../../shared/finds/finds";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { listFinds } from "~/models/finds.server";
import { unitLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.finds";

// The finds catalogue: every find's number, category, status and current holder; its cell and
// depths only for the roles that may see locations (the presenter leaves them out for the rest).

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.read");
  const { project } = access;
  const finds = await listFinds(project, access);
  return {
    projectId: project.id,
    lengthLabel: unitLabel(project.lengthUnit),
    canLog: can(access, "finds.log"),
    seesLocations: can(access, "finds.locations.read"),
    finds: finds.map((find) => ({ ...find, foundAtLocal: instantToLocalDateTime(new Date(find.foundAt), project.timeZone) })),
  };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Finds · Firmsand" }];
}

export default function FindsCatalogue({ loaderData }: Route.ComponentProps) {
  const { finds, seesLocations, projectId } = loaderData;
  const base = `/projects/${projectId}`;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-lg font-semibold">Finds catalogue</h2>
        <div className="flex flex-wrap gap-2">
          <Link to={`${base}/holds`} className="rounded border border-line bg-panel px-4 py-2 text-sm hover:bg-paper">Stop-work holds</Link>
          {seesLocations ? <a href={`/api/projects/${projectId}/finds.csv`} className="rounded border border-line bg-panel px-4 py-2 text-sm hover:bg-paper">Catalogue CSV (confidential)</a> : null}
          {seesLocations ? <Link to={`${base}/finds/catalogue`} className="rounded border border-line bg-panel px-4 py-2 text-sm hover:bg-paper">Printable catalogue</Link> : null}
          {loaderData.canLog ? <Link to={`${base}/finds/new`} className="rounded bg-lagoon px-4 py-2 font-medium text-white hover:bg-lagoon-dark">Log a find</Link> : null}
          {loaderData.canLog ? <Link to={`${base}/finds/basket`} className="rounded border border-lagoon px-4 py-2 font-medium text-lagoon">Log a basket load</Link> : null}
        </div>
      </div>
      <p className="text-sm text-muted">
        {seesLocations
          ? "Site locations are confidential: cells and depths are shown here to the resource monitor, the manager and site administrators only."
          : "Find locations are confidential and are not shown to your role."}
      </p>
      {finds.length === 0 ? <p className="text-sm text-muted">No finds logged yet.</p> : (
        <form method="get" action={`${base}/finds/custody-sheet`} target="_blank" className="space-y-2">
        <p className="flex flex-wrap items-center gap-3 text-sm">
          <button type="submit" className="rounded border border-line bg-panel px-4 py-2 hover:bg-paper">Custody sheet for the finds ticked</button>
          <span className="text-muted">One printable sheet for a batch handed over together.</span>
        </p>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-sm" aria-label="Finds">
            <thead>
              <tr className="border-b border-line text-left">
                <th scope="col" className="py-2 pr-3"><span className="sr-only">On the custody sheet</span></th>
                <th scope="col" className="py-2 pr-3">Catalogue no.</th>
                <th scope="col" className="py-2 pr-3">Category</th>
                <th scope="col" className="py-2 pr-3">Description</th>
                <th scope="col" className="py-2 pr-3">Found</th>
                {seesLocations ? <th scope="col" className="py-2 pr-3">Cell</th> : null}
                {seesLocations ? <th scope="col" className="py-2 pr-3 text-right">Depth ({loaderData.lengthLabel})</th> : null}
                <th scope="col" className="py-2 pr-3">Status</th>
                <th scope="col" className="py-2 pr-3">Held by</th>
              </tr>
            </thead>
            <tbody>
              {finds.map((find) => (
                <tr key={find.id} className="border-b border-line align-top" data-testid="find-row">
                  <td className="py-2 pr-3"><input type="checkbox" name="find" value={find.id} aria-label={`Put ${find.catalogueNumber} on the custody sheet`} /></td>
                  <td className="figures py-2 pr-3"><Link className="underline" to={`${base}/finds/${find.id}`}>{find.catalogueNumber}</Link></td>
                  <td className="py-2 pr-3">{FIND_CATEGORY_LABELS[find.category]}</td>
                  <td className="py-2 pr-3">
                    {find.description}
                    {find.count !== 1 || find.volume ? <span className="figures whitespace-nowrap" data-testid="find-amount"> ({amountText(find)})</span> : null}
                    {find.fromBasket ? <span className="ml-2 whitespace-nowrap rounded border border-line px-1.5 text-xs text-muted">basket load</span> : null}
                  </td>
                  <td className="figures py-2 pr-3 whitespace-nowrap">{find.foundAtLocal}</td>
                  {seesLocations ? <td className="figures py-2 pr-3">{find.cell ?? "–"}</td> : null}
                  {seesLocations ? <td className="figures py-2 pr-3 text-right">{find.depthBelowSurface ?? "–"}</td> : null}
                  <td className="py-2 pr-3">{FIND_STATUS_LABELS[find.status]}</td>
                  <td className="py-2 pr-3">{find.currentHolder.name}, {find.currentHolder.place}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        </form>
      )}
    </div>
  );
}
