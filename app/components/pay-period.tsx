import { Volume, ZoneName, zoneKey } from "./progress-figures";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";

/** What a pay-period table needs: the zone rows (with Unzoned) and the project row. */
interface PeriodRow {
  /** ± 95 % on removed from the surveys' vertical uncertainty. */
  removedBandVolume: number;
  removedVolume: number;
  paidVolume: number;
  overDredgeVolume: number;
  depositedVolume: number;
  remainingVolume: number;
}

export interface PeriodTableFigures {
  total: PeriodRow & { cells: number };
  zones: Array<PeriodRow & { zoneId: number | null; name: string; cells: number }>;
}

/** A pay period per zone and for the project: removed, paid, over-dredge, deposited, remaining at the end. */
export function PayPeriodTable({ figures, unit, testId, digits = 0, label = "Figures per zone for the period" }: { figures: PeriodTableFigures; unit: string; testId?: string; digits?: number; label?: string }) {
  const cells = (row: PeriodRow) => (
    <>
      <td className="pl-3"><Volume value={row.removedVolume} unit={unit} digits={digits} /></td>
      <td className="pl-3"><Volume value={row.paidVolume} unit={unit} digits={digits} /></td>
      <td className="pl-3"><Volume value={row.overDredgeVolume} unit={unit} digits={digits} /></td>
      <td className="pl-3"><Volume value={row.depositedVolume} unit={unit} digits={digits} /></td>
      <td className="pl-3"><Volume value={row.remainingVolume} unit={unit} digits={digits} /></td>
      <td className="pl-3 text-muted">±&nbsp;<Volume value={row.removedBandVolume} unit={unit} digits={digits} /></td>
    </>
  );
  return (
    <>
    {/* On a phone the table scrolls sideways in a region the keyboard reaches; printed, it is shown whole. */}
    <div className="mt-2 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon print:overflow-visible" tabIndex={0} role="region" aria-label={`${label}, scrollable`}>
      <table className="w-full text-right text-sm" data-testid={testId} aria-label={label}>
        <thead>
          <tr className="border-b border-line">
            <th className="py-1 text-left font-sans">Zone</th><th className="pl-3">Removed</th><th className="pl-3">Paid</th><th className="pl-3">Over-dredge</th><th className="pl-3">Deposited</th><th className="pl-3">Remaining at end</th><th className="pl-3" title="95 % band on removed from the surveys' vertical uncertainty (IHO S-44)">Removed ±</th>
          </tr>
        </thead>
        <tbody>
          {figures.zones.map((zone) => (
            <tr key={zoneKey(zone)} className="border-b border-line" data-zone={zone.name}>
              <th scope="row" className="py-1 text-left font-sans font-normal"><ZoneName zone={zone} /></th>
              {cells(zone)}
            </tr>
          ))}
          <tr className="font-semibold" data-zone="project">
            <th scope="row" className="py-1 text-left font-sans">Project</th>
            {cells(figures.total)}
          </tr>
        </tbody>
      </table>
    </div>
    {figures.zones.some((zone) => zone.zoneId === null) ? <p className="mt-2 text-xs text-muted">{UNZONED_NOTE}</p> : null}
    </>
  );
}

/** One end of a period: date, kind, survey id, file name and its SHA-256. */
export function PeriodSurveyLine({ label, survey }: { label: string; survey: { id: number; kind: string; surveyedOn: string; datum: string; fileName: string; contentSha256: string } }) {
  return (
    <>
      {label}: <span className="figures">{survey.surveyedOn}</span> {survey.kind} survey #{survey.id} ({survey.datum}), file {survey.fileName}, SHA-256 <span className="figures">{survey.contentSha256}</span>
    </>
  );
}
