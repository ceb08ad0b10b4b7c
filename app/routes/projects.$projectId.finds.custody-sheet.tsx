import { z } from "zod";
import { amountText, CUSTODY_PURPOSE_LABELS, CUSTODY_PURPOSES, FIND_CATEGORY_LABELS, instantToLocalDateTime } from "../../shared/finds/finds";
import { unitLabel } from "../../shared/units";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { NotFoundError } from "~/lib/errors";
import { getFind } from "~/models/finds.server";
import type { Route } from "./+types/projects.$projectId.finds.custody-sheet";

// The printable custody sheet of a batch (outside the project layout, so it prints without
// navigation): the finds chosen on the catalogue (`?find=<id>&find=<id>…`), each with its number,
// what it is and who holds it now, a tick box per item for the receiver, and one handover block
// signed on paper by whoever releases and receives the batch. Provenience only for location roles.

/** The most finds one sheet lists (a lab's transfer box, not the whole catalogue). */
const MAX_FINDS = 60;

const idsSchema = z
  .array(z.coerce.number().int().positive())
  .min(1, "Choose at least one find on the catalogue for the sheet.")
  .max(MAX_FINDS, `A sheet lists at most ${MAX_FINDS} finds: choose fewer.`);

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.read");
  const { project, user } = access;
  const ids = idsSchema.safeParse([...new Set(new URL(request.url).searchParams.getAll("find"))]);
  if (!ids.success) throw new Response(ids.error.issues[0]?.message ?? "Choose the finds for the sheet.", { status: 400 });
  const local = (iso: string) => instantToLocalDateTime(new Date(iso), project.timeZone);
  const finds = [];
  for (const id of ids.data) {
    try {
      const find = await getFind(project, access, id);
      finds.push({ ...find, foundAtLocal: local(find.foundAt) });
    } catch (error) {
      if (error instanceof NotFoundError) throw new Response(`There is no find #${id} in this project.`, { status: 404 });
      throw error;
    }
  }
  finds.sort((a, b) => a.catalogueNumber.localeCompare(b.catalogueNumber, "en", { numeric: true }));
  return {
    project: { name: project.name, timeZone: project.timeZone, lengthLabel: unitLabel(project.lengthUnit) },
    seesLocations: can(access, "finds.locations.read"),
    finds,
    printedBy: user.name,
    printedAt: local(new Date().toISOString()),
  };
}

export function meta({ data: sheet }: Route.MetaArgs) {
  return [{ title: `Custody sheet, ${sheet?.finds.length ?? 0} finds · Firmsand` }];
}

const printCss = `
@media print {
  body > header, .no-print { display: none !important; }
  body { background: #fff; }
  @page { size: letter portrait; margin: 16mm; }
  tr { break-inside: avoid; }
}`;

export default function BatchCustodySheet({ loaderData }: Route.ComponentProps) {
  const { finds, project, seesLocations } = loaderData;
  const cell = "border border-ink px-2 py-1 align-top";
  const total = finds.reduce((sum, find) => sum + (find.count ?? 0), 0);
  return (
    <main className="mx-auto max-w-4xl bg-panel px-8 py-6 print:px-0">
      <style>{printCss}</style>
      <p className="no-print mb-4 text-sm"><button type="button" className="rounded border border-line px-3 py-1" onClick={() => window.print()}>Print</button> or use the browser's print command.</p>
      <h1 className="text-2xl font-semibold">Chain of custody: batch transfer</h1>
      <p className="mt-1 text-sm">{project.name} · <span className="figures">{finds.length}</span> catalogue entr{finds.length === 1 ? "y" : "ies"}, <span className="figures">{total}</span> item{total === 1 ? "" : "s"} · times in {project.timeZone}</p>
      <table className="mt-4 w-full border-collapse text-sm" aria-label="Finds in this batch">
        <thead>
          <tr>
            <th className={`${cell} text-left`}>Catalogue no.</th><th className={`${cell} text-left`}>Category</th><th className={`${cell} text-left`}>Description</th>
            <th className={`${cell} text-right`}>Count / volume</th><th className={`${cell} text-left`}>Found</th>
            {seesLocations ? <th className={`${cell} text-left`}>Provenience (confidential)</th> : null}
            <th className={`${cell} text-left`}>Held by now</th><th className={`${cell} text-left`}>Received ✓</th>
          </tr>
        </thead>
        <tbody>
          {finds.map((find) => (
            <tr key={find.id} data-testid="batch-row">
              <td className={`${cell} figures`}>{find.catalogueNumber}</td><td className={cell}>{FIND_CATEGORY_LABELS[find.category]}</td>
              <td className={cell}>{find.description}{find.fieldTag ? <span className="figures"> · tag {find.fieldTag}</span> : null}</td>
              <td className={`${cell} figures text-right whitespace-nowrap`}>{amountText(find)}</td><td className={`${cell} figures`}>{find.foundAtLocal}</td>
              {seesLocations ? <td className={`${cell} figures`}>cell {find.cell ?? "–"}, {find.depthBelowSurface ?? "–"} {project.lengthLabel} below surface</td> : null}
              <td className={cell}>{find.currentHolder.name}, {find.currentHolder.place}</td><td className={cell} />
            </tr>
          ))}
        </tbody>
      </table>
      <section aria-labelledby="handover" className="mt-6 break-inside-avoid text-sm">
        <h2 id="handover" className="font-semibold">Handover of this batch</h2>
        <p className="mt-1 text-muted">Purpose (circle one): {CUSTODY_PURPOSES.map((purpose) => CUSTODY_PURPOSE_LABELS[purpose]).join(" · ")}</p>
        <div className="mt-4 grid grid-cols-2 gap-x-8 gap-y-8">
          {["Released by (name)", "Received by (name)", "Signature", "Signature", "Date and time", "Place"].map((label, index) => (
            <div key={`${label}-${index}`} className="border-b border-ink pb-6"><span className="text-xs text-muted">{label}</span></div>
          ))}
        </div>
        <p className="mt-4 text-xs text-muted">Record the handover on each find's page once signed (its photo of this sheet beside it).</p>
      </section>
      <p className="mt-4 text-xs text-muted">Printed <span className="figures">{loaderData.printedAt}</span> by {loaderData.printedBy}. Site locations are confidential; keep this sheet with the batch.</p>
    </main>
  );
}
