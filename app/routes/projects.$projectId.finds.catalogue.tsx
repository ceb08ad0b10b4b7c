import { amountText, FIND_CATEGORY_LABELS, FIND_STATUS_LABELS, instantToLocalDateTime } from "../../shared/finds/finds";
import { unitLabel } from "../../shared/units";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { listFinds, recordFindsExport } from "~/models/finds.server";
import type { Route } from "./+types/projects.$projectId.finds.catalogue";

// The printable catalogue for the lab, with provenience (outside the project layout, so it prints
// without navigation): only for the roles that may see locations, and every opening is an export
// written to the audit log.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.locations.read");
  const { project, user } = access;
  const finds = await listFinds(project, access);
  await recordFindsExport(project, user, "printable", finds.length, clientAddress(request));
  return {
    project: { name: project.name, crs: project.crs, timeZone: project.timeZone, lengthLabel: unitLabel(project.lengthUnit) },
    finds: finds.map((find) => ({ ...find, foundAtLocal: instantToLocalDateTime(new Date(find.foundAt), project.timeZone) })).reverse(),
    printedBy: user.name,
    printedAt: instantToLocalDateTime(new Date(), project.timeZone),
  };
}

export function meta({ data: catalogue }: Route.MetaArgs) {
  return [{ title: `Finds catalogue · ${catalogue?.project.name ?? "Firmsand"}` }];
}

const printCss = `
@media print {
  body > header, .no-print { display: none !important; }
  body { background: #fff; }
  @page { size: letter landscape; margin: 12mm; }
  tr { page-break-inside: avoid; }
}`;

export default function FindsCatalogueSheet({ loaderData }: Route.ComponentProps) {
  const { project, finds } = loaderData;
  const cell = "border border-ink px-2 py-1 align-top";
  return (
    <main className="mx-auto max-w-6xl bg-panel px-6 py-6 print:px-0">
      <style>{printCss}</style>
      <p className="no-print mb-4 text-sm"><button type="button" className="rounded border border-line px-3 py-1" onClick={() => window.print()}>Print</button> or use the browser's print command.</p>
      <h1 className="text-2xl font-semibold">Finds catalogue</h1>
      <p className="mt-1 text-sm font-semibold text-danger">CONFIDENTIAL: site locations. Not for public release.</p>
      <p className="mt-1 text-sm">{project.name} · positions in {project.crs}, depths in {project.lengthLabel}, times in {project.timeZone}</p>
      <div className="mt-4 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Finds catalogue, scrollable">
        <table className="w-full border-collapse text-xs" aria-label="Finds catalogue">
          <thead>
            <tr>
              {["Catalogue no.", "Category", "Description", "Count / volume", "Found", "Cell", `Depth below surface (${project.lengthLabel})`, `Depth in muck (${project.lengthLabel})`, "Status", "Held by"].map((heading) => (
                <th key={heading} className={`${cell} text-left`}>{heading}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {finds.map((find) => (
              <tr key={find.id} data-testid="catalogue-row">
                <td className={`${cell} figures`}>{find.catalogueNumber}</td>
                <td className={cell}>{FIND_CATEGORY_LABELS[find.category]}</td>
                <td className={cell}>{find.description}{find.fromBasket ? " (basket load)" : ""}</td>
                <td className={`${cell} figures text-right whitespace-nowrap`}>{amountText(find)}</td>
                <td className={`${cell} figures`}>{find.foundAtLocal}</td>
                <td className={`${cell} figures`}>{find.cell ?? "–"}{find.position ? ` (${find.position.x}, ${find.position.y})` : ""}</td>
                <td className={`${cell} figures text-right`}>{find.depthBelowSurface ?? "–"}</td>
                <td className={`${cell} figures text-right`}>{find.depthInMuck ?? "–"}</td>
                <td className={cell}>{FIND_STATUS_LABELS[find.status]}</td>
                <td className={cell}>{find.currentHolder.name}, {find.currentHolder.place}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-4 text-xs text-muted">Printed <span className="figures">{loaderData.printedAt}</span> by {loaderData.printedBy}; this printing is recorded in the project's audit log.</p>
    </main>
  );
}
