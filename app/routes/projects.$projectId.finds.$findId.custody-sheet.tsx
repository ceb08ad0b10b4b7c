import { amountText, CUSTODY_PURPOSE_LABELS, FIND_CATEGORY_LABELS, FIND_STATUS_LABELS, instantToLocalDateTime } from "../../shared/finds/finds";
import { unitLabel } from "../../shared/units";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { getFind } from "~/models/finds.server";
import type { Route } from "./+types/projects.$projectId.finds.$findId.custody-sheet";

// The printable chain-of-custody sheet of one find (outside the project layout, so it prints
// without navigation): the find, every handover with its typed signature, and blank rows for the
// next handovers signed on paper. Provenience (cell, depths) only for roles that may see locations.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.read");
  const { project, user } = access;
  const findId = urlIdSchema.safeParse(params.findId);
  if (!findId.success) throw new Response("There is no such find in this project.", { status: 404 });
  let find;
  try {
    find = await getFind(project, access, findId.data);
  } catch (error) {
    if (error instanceof NotFoundError) throw new Response(error.message, { status: 404 });
    throw error;
  }
  const local = (iso: string) => instantToLocalDateTime(new Date(iso), project.timeZone);
  return {
    project: { name: project.name, timeZone: project.timeZone, lengthLabel: unitLabel(project.lengthUnit) },
    seesLocations: can(access, "finds.locations.read"),
    find: { ...find, foundAtLocal: local(find.foundAt), custody: find.custody.map((entry) => ({ ...entry, handedAtLocal: local(entry.handedAt) })) },
    printedBy: user.name,
    printedAt: local(new Date().toISOString()),
  };
}

export function meta({ data: sheet }: Route.MetaArgs) {
  return [{ title: `Custody sheet ${sheet?.find.catalogueNumber ?? ""} · Firmsand` }];
}

const printCss = `
@media print {
  body > header, .no-print { display: none !important; }
  body { background: #fff; }
  @page { size: letter portrait; margin: 16mm; }
}`;

const BLANK_ROWS = 4;

export default function CustodySheet({ loaderData }: Route.ComponentProps) {
  const { find, project, seesLocations } = loaderData;
  const cell = "border border-ink px-2 py-1 align-top";
  return (
    <main className="mx-auto max-w-4xl bg-panel px-8 py-6 print:px-0">
      <style>{printCss}</style>
      <p className="no-print mb-4 text-sm"><button type="button" className="rounded border border-line px-3 py-1" onClick={() => window.print()}>Print</button> or use the browser's print command.</p>
      <h1 className="text-2xl font-semibold">Chain of custody</h1>
      <dl className="mt-3 grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-sm">
        <dt className="text-muted">Project</dt><dd>{project.name}</dd>
        <dt className="text-muted">Catalogue no.</dt><dd className="figures" data-testid="sheet-catalogue">{find.catalogueNumber}</dd>
        <dt className="text-muted">Category</dt><dd>{FIND_CATEGORY_LABELS[find.category]}</dd>
        <dt className="text-muted">Description</dt><dd>{find.description}{find.count !== 1 || find.volume ? <span className="figures"> ({amountText(find)})</span> : null}</dd>
        {find.fieldTag ? <><dt className="text-muted">Field tag</dt><dd className="figures">{find.fieldTag}</dd></> : null}
        <dt className="text-muted">Found</dt><dd><span className="figures">{find.foundAtLocal}</span> ({project.timeZone}){find.finder ? ` by ${find.finder}` : ""}</dd>
        {seesLocations ? (
          <><dt className="text-muted">Provenience</dt><dd className="figures">cell {find.cell ?? "–"}, {find.depthBelowSurface ?? "–"} {project.lengthLabel} below surface, {find.depthInMuck ?? "–"} {project.lengthLabel} in muck (confidential)</dd></>
        ) : null}
        <dt className="text-muted">Status now</dt><dd>{FIND_STATUS_LABELS[find.status]}; held by {find.currentHolder.name}, {find.currentHolder.place}</dd>
      </dl>
      <table className="mt-6 w-full border-collapse text-sm" aria-label="Handovers">
        <thead>
          <tr>
            <th className={`${cell} text-left`}>Date and time</th><th className={`${cell} text-left`}>Released by</th><th className={`${cell} text-left`}>Received by</th>
            <th className={`${cell} text-left`}>Place</th><th className={`${cell} text-left`}>Purpose</th><th className={`${cell} text-left`}>Receiver's signature</th>
          </tr>
        </thead>
        <tbody>
          {find.custody.map((entry) => (
            <tr key={entry.id} data-testid="sheet-row">
              <td className={`${cell} figures`}>{entry.handedAtLocal}</td><td className={cell}>{entry.fromName}</td><td className={cell}>{entry.toName}</td>
              <td className={cell}>{entry.place}</td><td className={cell}>{CUSTODY_PURPOSE_LABELS[entry.purpose]}</td><td className={`${cell} italic`}>{entry.receiverSignature} (typed)</td>
            </tr>
          ))}
          {Array.from({ length: BLANK_ROWS }, (_, index) => (
            <tr key={`blank-${index}`} className="h-10"><td className={cell} /><td className={cell} /><td className={cell} /><td className={cell} /><td className={cell} /><td className={cell} /></tr>
          ))}
        </tbody>
      </table>
      <p className="mt-4 text-xs text-muted">Printed <span className="figures">{loaderData.printedAt}</span> by {loaderData.printedBy}. Site locations are confidential; keep this sheet with the find.</p>
    </main>
  );
}
