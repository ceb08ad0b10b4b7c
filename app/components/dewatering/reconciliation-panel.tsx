import { Link } from "react-router";
import type { Reconciliation } from "../../../shared/dewatering/reconciliation";
import { formatFigure } from "./dewatering-section";

/** The overview's reconciliation: surveyed, pumped and hauled solids side by side, and the nutrients removed. */

function signed(percent: number | null): string {
  if (percent === null) return "–";
  return `${percent > 0 ? "+" : percent < 0 ? "−" : ""}${formatFigure(Math.abs(percent), 1)} %`;
}

export function ReconciliationPanel({ reconciliation, dewateringHref }: { reconciliation: Reconciliation; dewateringHref: string }) {
  const { project, zones, unattributed } = reconciliation;
  const measure = (value: { value: number; label: string } | null, digits = 0) => (value ? `${formatFigure(value.value, digits)} ${value.label}` : "–");
  // In the table the unit is said once, in the column's heading.
  const figure = (value: { value: number } | null, digits = 0) => (value ? formatFigure(value.value, digits) : "–");
  const bulkLabel = project.dryMassPumped.label;
  const massLabel = project.nitrogenRemoved?.label ?? (project.dryMassPumped.unit === "t" ? "kg" : "lb");
  return (
    <section aria-labelledby="reconciliation" className="rounded border border-line bg-panel p-4">
      <h2 id="reconciliation" className="font-semibold">Solids and nutrients removed</h2>
      {reconciliation.period ? (
        <p className="text-sm text-muted" data-testid="reconciliation-period">
          In the period from the survey of <span className="figures">{reconciliation.period.from}</span> to that of <span className="figures">{reconciliation.period.to}</span>: shifts and tickets dated after the first up to and including the second.
        </p>
      ) : null}
      {project.phosphorusRemoved && project.nitrogenRemoved ? (
        <p className="mt-2 text-lg" data-testid="nutrients-removed">
          <span className="figures font-semibold">{formatFigure(project.phosphorusRemoved.value, 0)} {project.phosphorusRemoved.label}</span> of phosphorus and{" "}
          <span className="figures font-semibold">{formatFigure(project.nitrogenRemoved.value, 0)} {project.nitrogenRemoved.label}</span> of nitrogen removed with the muck, by the surveys and {project.sampleCount} lab {project.sampleCount === 1 ? "sample" : "samples"}.
        </p>
      ) : (
        <p className="mt-2 text-sm text-muted">No lab samples yet: the nutrients removed and the surveyed dry mass appear once a sediment sample's dry bulk density, N and P are recorded.</p>
      )}
      <dl className="mt-3 grid gap-x-6 text-sm sm:grid-cols-3">
        <div className="border-t border-line py-2"><dt className="text-muted">Surveyed removal</dt><dd className="figures">{measure(project.surveyedRemoved)} · {measure(project.dryMassFromSurveys)}</dd></div>
        <div className="border-t border-line py-2"><dt className="text-muted">Pumped (shift logs)</dt><dd className="figures">{measure(project.dryMassPumped)} <span className="text-muted">({signed(project.pumpedVersusSurveyedPercent)} vs surveyed)</span></dd></div>
        <div className="border-t border-line py-2"><dt className="text-muted">Hauled (tickets)</dt><dd className="figures">{measure(project.dryMassHauled)} <span className="text-muted">({signed(project.hauledVersusSurveyedPercent)} vs surveyed; {measure(project.dryMassNotYetHauled)} pumped and not yet hauled)</span></dd></div>
      </dl>
      <div className="relative mt-2 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon print:overflow-visible" tabIndex={0} role="region" aria-label="Reconciliation per zone, scrollable">
        <table className="w-full border-collapse text-sm" aria-label="Reconciliation per zone">
          <thead>
            <tr className="border-b border-line text-left align-bottom">
              <th scope="col" className="py-1 pr-3">Zone</th>
              <th scope="col" className="pr-3 text-right">Removed <span className="font-normal text-muted">{project.surveyedRemoved.label}</span></th>
              <th scope="col" className="pr-3 text-right">Dry mass <span className="font-normal text-muted">{bulkLabel}</span></th>
              <th scope="col" className="pr-3 text-right">Pumped<span aria-hidden="true">*</span><span className="sr-only"> (attributed by the dive log)</span> <span className="font-normal text-muted">{bulkLabel}</span></th>
              <th scope="col" className="pr-3 text-right">Hauled<span aria-hidden="true">*</span><span className="sr-only"> (attributed as pumped)</span> <span className="font-normal text-muted">{bulkLabel}</span></th>
              <th scope="col" className="pr-3 text-right">Nitrogen <span className="font-normal text-muted">{massLabel}</span></th>
              <th scope="col" className="pr-3 text-right">Phosphorus <span className="font-normal text-muted">{massLabel}</span></th>
              <th scope="col">Samples</th>
            </tr>
          </thead>
          <tbody>
            {zones.map((zone) => (
              <tr key={zone.zoneId ?? "unzoned"} className="border-b border-line">
                <td className="py-1 pr-3">{zone.name}</td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(zone.surveyedRemoved)}</td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(zone.dryMassFromSurveys, 1)}</td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">
                  {figure(zone.dryMassPumped, 1)}
                  {zone.pumpedVersusSurveyedPercent !== null ? <span className="text-muted"> ({signed(zone.pumpedVersusSurveyedPercent)})</span> : null}
                </td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(zone.dryMassHauled, 1)}</td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(zone.nitrogenRemoved)}</td>
                <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(zone.phosphorusRemoved)}</td>
                <td className="text-muted whitespace-nowrap print:whitespace-normal">{zone.samplesFrom === "zone" ? `the zone's (${zone.sampleCount})` : zone.samplesFrom === "project" ? "project mean" : "none"}</td>
              </tr>
            ))}
            <tr className="border-b border-line" data-testid="reconciliation-unattributed">
              <td className="py-1 pr-3">Unattributed</td>
              <td className="text-muted pr-3 text-right">–</td><td className="text-muted pr-3 text-right">–</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(unattributed.dryMassPumped, 1)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(unattributed.dryMassHauled, 1)}</td>
              <td className="text-muted pr-3 text-right">–</td><td className="text-muted pr-3 text-right">–</td><td className="text-muted whitespace-nowrap print:whitespace-normal">no dive in the shift&apos;s hours</td>
            </tr>
          </tbody>
          <tfoot>
            <tr className="font-semibold" data-testid="reconciliation-total">
              <td className="py-1 pr-3">Project</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.surveyedRemoved)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.dryMassFromSurveys, 1)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.dryMassPumped, 1)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.dryMassHauled, 1)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.nitrogenRemoved)}</td>
              <td className="figures pr-3 text-right whitespace-nowrap print:whitespace-normal print:pr-1">{figure(project.phosphorusRemoved)}</td>
              <td />
            </tr>
          </tfoot>
        </table>
      </div>
      <p className="mt-2 text-sm text-muted" data-testid="reconciliation-attribution">
        * Attributed, not measured: shift logs and haul tickets name no zone. A shift&apos;s solids are shared by the dive time logged in its hours over the cells worked; hauled solids in the same shares. The rule in full is under Assumptions.
      </p>
      <details className="mt-3 text-sm">
        <summary className="cursor-pointer text-lagoon-dark">Assumptions</summary>
        <ul className="mt-2 list-disc space-y-1 pl-5 text-muted">{reconciliation.assumptions.map((line) => <li key={line}>{line}</li>)}</ul>
      </details>
      <p className="no-print mt-2 text-sm"><Link to={dewateringHref} className="text-lagoon-dark underline">Dewatering records</Link></p>
    </section>
  );
}
