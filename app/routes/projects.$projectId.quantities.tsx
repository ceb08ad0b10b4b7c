import { Form, Link, data } from "react-router";
import { z } from "zod";
import { ActionMessages, FormMessage } from "~/components/form-message";
import { PayPeriodTable, PeriodSurveyLine } from "~/components/pay-period";
import { Percent, Volume, ZoneName, formatNumber, zoneKey } from "~/components/progress-figures";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { requireAllowed, requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, ValidationError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, parseForm } from "~/lib/http/form";
import { listSignedPeriods, signPayPeriod } from "~/models/pay-periods.server";
import { loadQuantities, settingsVersionWords } from "~/models/quantities.server";
import type { Route } from "./+types/projects.$projectId.quantities";
import { readPageForm } from "~/lib/http/body.server";

// The manager's and viewers' quantities: the survey pair and method, zone totals, a pay period
// between any two surveys in force (per zone and project), the exports, and the signed periods.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "quantities.read");
  const { project } = access;
  const search = new URL(request.url).searchParams;
  const asked = { from: search.get("from"), to: search.get("to"), month: search.get("month") };
  let periodError: string | null = null;
  let view;
  try {
    view = await loadQuantities(project, asked);
  } catch (error) {
    if (!(error instanceof ValidationError)) throw error;
    // A hand-edited address: say what was wrong and show the default period.
    periodError = error.details.map((detail) => `${detail.field ?? "period"} ${detail.value ? `“${detail.value}” ` : ""}${detail.message}`).join(" ");
    view = await loadQuantities(project);
  }
  return {
    project: view.project, baseline: view.baseline, latest: view.latest, method: view.method, settingsVersion: settingsVersionWords(view.settingsVersion), total: view.progress.total, zones: view.progress.zones, cellCount: view.cells.length,
    period: view.period && { ...view.period, figures: { total: view.period.figures.total, zones: view.period.figures.zones } },
    periodError,
    canSign: can(access, "quantities.sign"),
    // As issued, from the stored snapshots; compared with now only where that period is already computed.
    signed: await listSignedPeriods(project, "cached"),
  };
}

const signSchema = z.object({
  intent: z.literal("sign"),
  from: z.string().min(1, "Choose the period's first survey"),
  to: z.string().min(1, "Choose the period's last survey"),
  signedName: z.string().trim().min(1, "Type your name to sign").max(200, "Use at most 200 characters"),
  reviewed: z.literal("yes", { error: "Confirm that you have reviewed the period's figures" }),
});

export async function action({ request, params }: Route.ActionArgs) {
  const access = await requireRole(request, params.projectId, "quantities.read");
  requireAllowed(access, "quantities.sign");
  const parsed = parseForm(await readPageForm(request), signSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, notice: null }, { status: 400 });
  try {
    const id = await signPayPeriod(access.project, access.user, parsed.data, clientAddress(request));
    return { errors: {}, notice: `Signed: report #${id} is kept as issued and listed under Signed periods.` };
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    return data({ errors: fieldErrorsFrom(error.details, (field) => field), notice: null }, { status: 422 });
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Quantities · Firmsand" }];
}

const linkClass = "rounded border border-line bg-panel px-3 py-2 text-sm hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon";
const selectClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function Quantities({ loaderData, actionData }: Route.ComponentProps) {
  const { project, total, zones, period, signed } = loaderData;
  const unit = project.volumeLabel;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const periodQuery = period ? `?from=${period.from.id}&to=${period.to.id}` : "";
  return (
    <div className="space-y-6">
      <section aria-labelledby="exports" className="rounded border border-line bg-panel p-4">
        <h2 id="exports" className="font-semibold">Exports</h2>
        <p className="mt-1 text-sm">
          Survey pair: baseline {loaderData.baseline ? <span className="figures">{loaderData.baseline.surveyedOn}</span> : "none"} → latest{" "}
          {loaderData.latest ? <span className="figures">{loaderData.latest.surveyedOn} ({loaderData.latest.kind})</span> : "none"} · volumes in {unit} · {loaderData.cellCount} cells
        </p>
        <p className="mt-1 text-sm text-muted">{loaderData.method}</p>
        <p className="mt-1 text-sm text-muted" data-testid="settings-version">Settings: {loaderData.settingsVersion}.</p>
        {period ? <p className="mt-1 text-sm">The exports carry the pay period shown below: <span className="figures">{period.from.surveyedOn} → {period.to.surveyedOn}</span>.</p> : null}
        <div className="mt-3 flex flex-wrap gap-2">
          <a className={linkClass} href={`/api/projects/${project.id}/quantities.csv${periodQuery}`} download>Quantities CSV (zones and cells)</a>
          <a className={linkClass} href={`/api/projects/${project.id}/quantities.geojson${periodQuery}`} download>Cells GeoJSON</a>
          <Link className={linkClass} to={`/projects/${project.id}/quantities/report${periodQuery}`}>Printable quantities report</Link>
        </div>
        <p className="mt-2 text-xs text-muted">Text in the CSV that a spreadsheet could read as a formula is prefixed with an apostrophe (OWASP advice on CSV injection).</p>
      </section>
      <section aria-labelledby="zone-totals" className="rounded border border-line bg-panel p-4">
        <h2 id="zone-totals" className="font-semibold">Totals per zone</h2>
        <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Totals per zone, scrollable">
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
        </div>
        {zones.some((zone) => zone.zoneId === null) ? <p className="mt-2 text-xs text-muted">{UNZONED_NOTE}</p> : null}
      </section>

      <section aria-labelledby="pay-period" className="rounded border border-line bg-panel p-4">
        <h2 id="pay-period" className="font-semibold">Pay period</h2>
        <FormMessage tone="error">{loaderData.periodError}</FormMessage>
        {period ? (
          <>
            <Form method="get" className="mt-2 grid items-end gap-3 sm:grid-cols-[1fr_1fr_auto]">
              <label className="block text-sm font-medium">From survey
                <select name="from" defaultValue={period.from.id} className={selectClass}>
                  {period.surveys.slice(0, -1).map((survey) => <option key={survey.id} value={survey.id}>{survey.surveyedOn} {survey.kind} · {survey.fileName}</option>)}
                </select>
              </label>
              <label className="block text-sm font-medium">To survey
                <select name="to" defaultValue={period.to.id} className={selectClass}>
                  {period.surveys.slice(1).map((survey) => <option key={survey.id} value={survey.id}>{survey.surveyedOn} {survey.kind} · {survey.fileName}</option>)}
                </select>
              </label>
              <button type="submit" className="rounded border border-line bg-panel px-4 py-2 font-medium hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon">Show period</button>
            </Form>
            {period.months.length > 0 ? (
              <Form method="get" className="mt-3 flex flex-wrap items-end gap-3">
                <label className="block text-sm font-medium">Or a month
                  <select name="month" defaultValue={period.month?.key ?? period.months[0]!.key} className={selectClass}>
                    {period.months.map((month) => <option key={month.key} value={month.key}>{month.name}</option>)}
                  </select>
                </label>
                <button type="submit" className="rounded border border-line bg-panel px-4 py-2 font-medium hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon">Show month</button>
                <p className="basis-full text-xs text-muted">A month runs from the survey that closed the month before to the month&apos;s last survey in force.</p>
              </Form>
            ) : null}
            <p className="mt-3 text-sm" data-testid="period-ends">
              {period.month ? <strong>{period.month.name}: </strong> : null}
              <span className="figures">{period.from.surveyedOn} → {period.to.surveyedOn}</span>
              {period.whole ? " · baseline to latest: the figures as they stand today" : ""}
            </p>
            <PayPeriodTable figures={period.figures} unit={unit} testId="period-table" />
            <details className="mt-2 text-sm">
              <summary className="cursor-pointer text-muted">Surveys, method and settings this period rests on</summary>
              <ul className="mt-2 space-y-1 wrap-anywhere text-xs">
                <li><PeriodSurveyLine label="From" survey={period.from} /></li>
                <li><PeriodSurveyLine label="To" survey={period.to} /></li>
              </ul>
              <p className="mt-2 text-xs text-muted">{period.method}</p>
              <p className="mt-1 text-xs text-muted">{period.uncertainty}</p>
              <p className="mt-1 text-xs text-muted">
                Over-dredge allowance <span className="figures">{formatNumber(period.settings.overDredgeAllowance, 2)} {period.lengthLabel}</span> (project settings, tolerances).
                Removal below firm sand less the allowance is over-dredge, which pay practice usually does not pay; the contract decides.
              </p>
            </details>
            {loaderData.canSign ? (
              <Form method="post" className="mt-4 grid gap-3 border-t border-line pt-4 sm:grid-cols-[1fr_auto]">
                <input type="hidden" name="from" value={period.from.id} />
                <input type="hidden" name="to" value={period.to.id} />
                <p className="text-sm sm:col-span-2">Signing keeps this period's figures as issued, with the surveys and settings above. Later recomputes are shown beside them, never in their place.</p>
                <TextField label="Your name, as signed" name="signedName" autoComplete="name" maxLength={200} required error={errors.signedName} />
                <label className="flex items-center gap-2 self-end pb-2 text-sm">
                  <input type="checkbox" name="reviewed" value="yes" required /> I have reviewed these figures
                </label>
                {errors.reviewed || errors.from || errors.to || errors.form ? <p className="text-sm text-danger sm:col-span-2">{[errors.reviewed, errors.from, errors.to, errors.form].filter(Boolean).join(" ")}</p> : null}
                <div className="sm:col-span-2"><SubmitButton intent="sign" pendingLabel="Signing…">Sign this period's report</SubmitButton></div>
                <div className="sm:col-span-2"><ActionMessages notice={actionData?.notice} /></div>
              </Form>
            ) : null}
          </>
        ) : (
          <p className="mt-1 text-sm text-muted">There are no figures yet: a pay period needs the baseline survey and a work limit.</p>
        )}
      </section>

      <section aria-labelledby="signed-periods" className="rounded border border-line bg-panel p-4">
        <h2 id="signed-periods" className="font-semibold">Signed periods</h2>
        {signed.length === 0 ? (
          <p className="mt-1 text-sm text-muted">No period has been signed yet.</p>
        ) : (
          <div className="mt-2 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Reports signed so far, scrollable">
            <table className="w-full text-right text-sm" data-testid="signed-periods" aria-label="Reports signed so far">
              <thead>
                <tr className="border-b border-line">
                  <th className="py-1 text-left font-sans">Period</th><th className="pl-3 text-left font-sans">Signed</th>
                  <th className="pl-3">Paid</th><th className="pl-3">Over-dredge</th><th className="pl-3">Removed</th><th className="pl-3 text-left font-sans">Recomputed now</th>
                </tr>
              </thead>
              <tbody>
                {signed.map((report) => (
                  <tr key={report.id} className="border-b border-line align-top" data-report={report.id}>
                    <th scope="row" className="py-1 text-left font-sans font-normal">
                      <span className="figures whitespace-nowrap">{report.snapshot.from.surveyedOn} → {report.snapshot.to.surveyedOn}</span><br />
                      <Link className="text-xs text-lagoon underline" to={`/projects/${project.id}/quantities/report?signed=${report.id}`}>Report as signed</Link>
                    </th>
                    <td className="min-w-32 pl-3 text-left">{report.signedName}<br /><span className="figures text-xs text-muted">{report.signedAt.slice(0, 16).replace("T", " ")} UTC</span></td>
                    <td className="pl-3"><Volume value={report.snapshot.total.paidVolume} unit={report.snapshot.volumeLabel} digits={1} /></td>
                    <td className="pl-3"><Volume value={report.snapshot.total.overDredgeVolume} unit={report.snapshot.volumeLabel} digits={1} /></td>
                    <td className="pl-3"><Volume value={report.snapshot.total.removedVolume} unit={report.snapshot.volumeLabel} digits={1} /><br /><span className="text-xs text-muted">± <Volume value={report.snapshot.total.removedBandVolume} unit={report.snapshot.volumeLabel} digits={1} /></span></td>
                    <td className="min-w-40 pl-3 text-left text-xs">
                      {report.difference ? (
                        Math.abs(report.difference.paidVolume) < 0.05 && Math.abs(report.difference.overDredgeVolume) < 0.05 && Math.abs(report.difference.removedVolume) < 0.05
                          ? "same figures"
                          : <>paid {signedVolume(report.difference.paidVolume, report.snapshot.volumeLabel)}, over-dredge {signedVolume(report.difference.overDredgeVolume, report.snapshot.volumeLabel)}, removed {signedVolume(report.difference.removedVolume, report.snapshot.volumeLabel)}</>
                      ) : report.compared ? report.recomputeNote : (
                        <Link className="text-lagoon underline" to={`/projects/${project.id}/quantities/report?signed=${report.id}`} aria-label={`Compare the period ${report.snapshot.from.surveyedOn} to ${report.snapshot.to.surveyedOn} with its figures now`}>Compare with now</Link>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  );
}

/** A difference with its sign always written (+12.3 yd³, −4.0 yd³). */
function signedVolume(value: number, unit: string) {
  return <span className="figures whitespace-nowrap">{value >= 0 ? "+" : "−"}{formatNumber(Math.abs(value), 1)} {unit}</span>;
}
