import { data } from "react-router";
import { PayPeriodTable, PeriodSurveyLine } from "~/components/pay-period";
import { Percent, Volume, ZoneName, formatNumber, zoneKey } from "~/components/progress-figures";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { requireRole } from "~/lib/auth/access.server";
import { loadQuantities, settingsVersionWords } from "~/models/quantities.server";
import { getSignedPeriod, type PayPeriodView, type SignedPeriod } from "~/models/pay-periods.server";
import type { PayPeriodSnapshot } from "~/lib/db.server";
import { urlIdSchema } from "~/lib/http/url-id";
import { loadReconciliation } from "~/models/reconciliation.server";
import { ReconciliationPanel } from "~/components/dewatering/reconciliation-panel";
import type { Route } from "./+types/projects.$projectId.quantities.report";

// The printable quantities report (outside the project layout, so it prints without navigation):
// project, survey pair, method, totals per zone, the pay period (?from=&to=, survey ids; default the
// baseline to the latest) with both survey files' names and hashes, and a signature block.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project, user } = await requireRole(request, params.projectId, "quantities.read");
  const search = new URL(request.url).searchParams;
  const signedId = search.get("signed");
  let view;
  let signed: SignedPeriod | null = null;
  try {
    if (signedId !== null) {
      const id = urlIdSchema.safeParse(signedId);
      if (!id.success) throw new NotFoundError("There is no such signed period in this project.");
      signed = await getSignedPeriod(project, id.data);
    }
    view = await loadQuantities(project, signed ? {} : { from: search.get("from"), to: search.get("to"), month: search.get("month") });
  } catch (error) {
    if (error instanceof ValidationError) throw data(error.details.map((detail) => `${detail.field ?? ""} ${detail.message}`.trim()).join(" "), { status: 422 });
    if (error instanceof NotFoundError) throw data(error.message, { status: 404 });
    throw error;
  }
  // The reconciliation covers what the report covers: the signed or asked-for period, else the whole.
  const reconciled = signed ? signed.snapshot : view.period && !view.period.whole ? { from: view.period.from, to: view.period.to, zones: view.period.figures.zones } : null;
  const reconciliation = reconciled
    ? await loadReconciliation(project, undefined, reconciled)
    : view.progress.hasFigures ? await loadReconciliation(project, view.progress) : null;
  return {
    reconciliation,
    project: view.project, baseline: view.baseline, latest: view.latest, method: view.method, settingsVersion: settingsVersionWords(view.settingsVersion),
    // A signed report prints its figures as issued, whatever the surveys and settings are now.
    period: signed ? signedPeriod(signed.snapshot) : view.period && reportPeriod(view.period),
    signed: signed && { name: signed.signedName, at: signed.signedAt, difference: signed.difference, recomputeNote: signed.recomputeNote },
    total: view.progress.total, zones: view.progress.zones, preparedBy: user.name, preparedOn: new Date().toISOString().slice(0, 10),
  };
}

/** The period as the report prints it: no survey list, no cells. */
function reportPeriod(period: PayPeriodView) {
  const { from, to, volumeLabel, lengthLabel, settings, method, uncertainty, figures } = period;
  return { from, to, volumeLabel, lengthLabel, settings, method, uncertainty, figures: { total: figures.total, zones: figures.zones } };
}

/** A signed period's snapshot in the same shape. */
function signedPeriod(snapshot: PayPeriodSnapshot) {
  const { from, to, volumeLabel, lengthLabel, settings, method, uncertainty, total, zones } = snapshot;
  return { from, to, volumeLabel, lengthLabel, settings, method, uncertainty, figures: { total, zones } };
}

export function meta({ data: report }: Route.MetaArgs) {
  return [{ title: `Quantities report · ${report?.project.name ?? "Firmsand"}` }];
}

const printCss = `
@media print {
  body > header, .no-print { display: none !important; }
  html, body { background: #fff; }
  @page { size: letter portrait; margin: 18mm; }
  table { page-break-inside: avoid; }
  /* US letter less its margins is about 680 CSS px: tables at 9 pt (12 px) keep every column on the paper. */
  main table { font-size: 12px; line-height: 1.35; }
  [role="region"] { overflow: visible !important; }
}`;

function SignatureLine({ label }: { label: string }) {
  return (
    <div className="flex flex-col gap-1">
      <div className="h-10 border-b border-ink" />
      <span className="text-xs text-muted">{label}</span>
    </div>
  );
}

export default function QuantitiesReport({ loaderData }: Route.ComponentProps) {
  const { project, total, zones } = loaderData;
  const unit = project.volumeLabel;
  return (
    <main className="mx-auto max-w-4xl bg-panel px-4 py-6 sm:px-8 print:px-0">
      <style>{printCss}</style>
      <p className="no-print mb-4 text-sm"><button type="button" className="rounded border border-line px-3 py-1" onClick={() => window.print()}>Print</button> or use the browser's print command.</p>
      <h1 className="text-2xl font-semibold">Quantities report</h1>
      {/* On a phone each term sits above its value; on a wider screen and on paper, beside it. */}
      <dl className="mt-3 grid grid-cols-1 gap-x-6 text-sm sm:grid-cols-[max-content_1fr] sm:gap-y-1 print:grid-cols-[max-content_1fr] print:gap-y-1 [&>dd]:mb-2 [&>dd]:min-w-0 [&>dd]:break-words sm:[&>dd]:mb-0 print:[&>dd]:mb-0">
        <dt className="text-muted">Project</dt><dd>{project.name}</dd>
        <dt className="text-muted">Baseline survey</dt><dd>{loaderData.baseline ? <><time className="figures" dateTime={loaderData.baseline.surveyedOn}>{loaderData.baseline.surveyedOn}</time> (<span className="figures">#{loaderData.baseline.id}</span>, {loaderData.baseline.datum})</> : "none"}</dd>
        <dt className="text-muted">Compared with</dt><dd>{loaderData.latest ? <><time className="figures" dateTime={loaderData.latest.surveyedOn}>{loaderData.latest.surveyedOn}</time> {loaderData.latest.kind} (<span className="figures">#{loaderData.latest.id}</span>)</> : "none"}</dd>
        <dt className="text-muted">Coordinate system</dt><dd><span className="figures">{project.crs}</span>, {project.lengthLabelLong}</dd>
        <dt className="text-muted">Method</dt><dd>{loaderData.method}</dd>
        <dt className="text-muted">Settings</dt><dd>{loaderData.settingsVersion}</dd>
        <dt className="text-muted">Prepared</dt><dd><span className="figures">{loaderData.preparedOn}</span> by {loaderData.preparedBy}</dd>
      </dl>
      <div className="mt-6 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon print:overflow-visible" tabIndex={0} role="region" aria-label="Totals per zone, scrollable"><table className="w-full border-collapse text-right text-sm" aria-label="Totals per zone">
        <thead>
          <tr className="border-b-2 border-ink">
            {/* Padded and bottom-aligned: headers that wrap stay apart from their neighbours. */}
            <th scope="col" className="py-1 pr-2 text-left align-bottom font-sans">Zone</th>
            {[`Planned (${unit})`, `Removed (${unit})`, `Remaining (${unit})`, "Complete by volume", "Cells at firm sand", "Confirmed", "Last survey"].map((label) => (
              <th key={label} scope="col" className="px-2 py-1 align-bottom font-sans font-semibold">{label}</th>
            ))}
          </tr>
        </thead>
        <tbody>
          {zones.map((zone) => (
            <tr key={zoneKey(zone)} className="border-b border-line">
              <th scope="row" className="py-1 text-left font-sans font-normal"><ZoneName zone={zone} /></th>
              <td className="px-2"><Volume value={zone.plannedVolume} unit={unit} digits={1} /></td><td className="px-2"><Volume value={zone.removedVolume} unit={unit} digits={1} /></td>
              <td className="px-2"><Volume value={zone.remainingVolume} unit={unit} digits={1} /></td><td className="px-2"><Percent value={zone.percentCompleteByVolume} digits={1} /></td>
              <td className="figures whitespace-nowrap px-2">{zone.cellsAtFirmSand} / {zone.cells}</td><td className="figures px-2">{zone.cellsConfirmed}</td><td className="figures px-2">{zone.lastSurveyOn ? <time dateTime={zone.lastSurveyOn}>{zone.lastSurveyOn}</time> : "–"}</td>
            </tr>
          ))}
          <tr className="border-t-2 border-ink font-semibold">
            <th scope="row" className="py-1 text-left font-sans">Project total</th>
            <td className="px-2"><Volume value={total.plannedVolume} unit={unit} digits={1} /></td><td className="px-2"><Volume value={total.removedVolume} unit={unit} digits={1} /></td>
            <td className="px-2"><Volume value={total.remainingVolume} unit={unit} digits={1} /></td><td className="px-2"><Percent value={total.percentCompleteByVolume} digits={1} /></td>
            <td className="figures whitespace-nowrap px-2">{total.cellsAtFirmSand} / {total.cells}</td><td className="figures px-2">{total.cellsConfirmed}</td><td className="figures px-2">{total.lastSurveyOn ? <time dateTime={total.lastSurveyOn}>{total.lastSurveyOn}</time> : "–"}</td>
          </tr>
        </tbody>
      </table></div>
      {zones.some((zone) => zone.zoneId === null) ? <p className="mt-2 text-xs text-muted">{UNZONED_NOTE}</p> : null}
      {loaderData.period ? (
        <section aria-labelledby="period-heading" className="mt-8 break-inside-avoid">
          <h2 id="period-heading" className="font-semibold">Pay period <span className="figures">{loaderData.period.from.surveyedOn} → {loaderData.period.to.surveyedOn}</span></h2>
          {loaderData.signed ? (
            <p className="mt-1 rounded border border-ink px-3 py-2 text-sm" data-testid="signed-as-issued">
              Signed by <strong>{loaderData.signed.name}</strong> on <span className="figures">{loaderData.signed.at.slice(0, 16).replace("T", " ")} UTC</span>: the figures below are kept as issued.{" "}
              {loaderData.signed.difference
                ? `Recomputed now, paid differs by ${formatNumber(loaderData.signed.difference.paidVolume, 1)} ${loaderData.period.volumeLabel} and removed by ${formatNumber(loaderData.signed.difference.removedVolume, 1)} ${loaderData.period.volumeLabel}.`
                : loaderData.signed.recomputeNote}
            </p>
          ) : null}
          <ul className="mt-1 space-y-1 wrap-anywhere text-xs">
            <li><PeriodSurveyLine label="From" survey={loaderData.period.from} /></li>
            <li><PeriodSurveyLine label="To" survey={loaderData.period.to} /></li>
          </ul>
          <PayPeriodTable figures={loaderData.period.figures} unit={unit} digits={1} testId="report-period-table" />
          <p className="mt-2 text-xs">{loaderData.period.method}</p>
          <p className="mt-1 text-xs">{loaderData.period.uncertainty}</p>
          <p className="mt-1 text-xs">
            Settings in force: over-dredge allowance <span className="figures">{formatNumber(loaderData.period.settings.overDredgeAllowance, 2)} {loaderData.period.lengthLabel}</span>,
            firm-sand tolerance <span className="figures">{formatNumber(loaderData.period.settings.firmSandTolerance, 2)} {loaderData.period.lengthLabel}</span>,
            cells <span className="figures">{loaderData.period.settings.cellSize} {loaderData.period.lengthLabel}</span>, raster <span className="figures">{loaderData.period.settings.rasterResolution} {loaderData.period.lengthLabel}</span>,
            longest triangle edge <span className="figures">{loaderData.period.settings.maxEdge} {loaderData.period.lengthLabel}</span>.
          </p>
        </section>
      ) : null}
      {loaderData.reconciliation ? (
        // A page of its own: surveyed, pumped and hauled solids and the nutrients removed.
        <div className="mt-8 break-before-page">
          <ReconciliationPanel reconciliation={loaderData.reconciliation} dewateringHref={`/projects/${project.id}/dewatering`} />
        </div>
      ) : null}
      <section aria-labelledby="signatures" className="mt-10 break-inside-avoid">
        <h2 id="signatures" className="font-semibold">Review</h2>
        <p className="mt-1 text-sm">I have reviewed the quantities above against the surveys named in this report.</p>
        <div className="mt-4 grid grid-cols-2 gap-8">
          <SignatureLine label="Reviewer's signature" /><SignatureLine label="Date" />
          <SignatureLine label="Name and title" /><SignatureLine label="Organisation" />
        </div>
      </section>
    </main>
  );
}
