import { Fragment } from "react";
import type { CompiledDay, EnteredNotes, EquipmentLine } from "../../shared/daily-report/compile";
import { Link } from "react-router";
import { byHandLine, enteredHeadCountsLine, equipmentRows, equipmentTotalsLine, findsLine, headCountCell, formatNumber as fmt, interruptionLine, lostHoursNote, noComplianceStationLine, productionRows, reportUnits, surveyLine, visitorRows } from "../../shared/daily-report/present";
import { localClockOf } from "../../shared/local-time";
import { unitLabel, type LengthUnit } from "../../shared/units";

// The compiled figures of a day's report, read-only: the day's page and the inspector's countersign
// page show the same sections (the PDF writes the same figures through shared/daily-report/present.ts).

export function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section className="break-inside-avoid rounded border border-line bg-panel p-4 print:border-0 print:p-0">
      <h3 className="mb-2 font-semibold">{title}</h3>
      {children}
    </section>
  );
}

/** The day's equipment, working and idle with the reasons, as entered (the PDF writes the same rows). */
export function EquipmentHours({ equipment }: { equipment: readonly EquipmentLine[] | undefined }) {
  const rows = equipmentRows(equipment);
  if (rows.length === 0) return <p className="text-sm text-muted" data-testid="equipment-hours">No equipment hours entered.</p>;
  return (
    <div data-testid="equipment-hours">
      <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Equipment working and idle, scrollable">
        <table className="w-full text-sm">
          <thead><tr className="text-left align-bottom text-muted"><th scope="col" className="pr-3">Equipment</th><th scope="col" className="pr-3">Working (h)</th><th scope="col" className="pr-3">Idle (h)</th><th scope="col">Idle reason</th></tr></thead>
          <tbody>
            {rows.map(([name, working, idle, reason]) => (
              <tr key={name} className="border-t border-line"><td className="pr-3">{name}</td><td className="figures pr-3">{working}</td><td className="figures pr-3">{idle}</td><td className="break-words">{reason}</td></tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-1 text-xs text-muted">{equipmentTotalsLine(equipment)}</p>
    </div>
  );
}

/**
 * The day's inspections and visitors with their local times (the PDF writes the same rows), and
 * the free-text note of a report entered before visitors were lines.
 */
export function InspectionsAndVisitors({ entered }: { entered: Pick<EnteredNotes, "visitors" | "inspections"> }) {
  const rows = visitorRows(entered.visitors);
  return (
    <div data-testid="visitors">
      {rows.length === 0 ? <p className="text-sm text-muted">No inspections or visitors entered.</p> : (
        <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Inspections and visitors, scrollable">
          <table className="w-full text-sm">
            <thead><tr className="text-left align-bottom text-muted"><th scope="col" className="pr-3">Arrived</th><th scope="col" className="pr-3">Left</th><th scope="col" className="pr-3">Name</th><th scope="col" className="pr-3">Organisation</th><th scope="col">Purpose or notes</th></tr></thead>
            <tbody>
              {rows.map(([arrived, left, name, organisation, purpose], index) => (
                <tr key={index} className="border-t border-line"><td className="figures pr-3">{arrived}</td><td className="figures pr-3">{left}</td><td className="pr-3">{name}</td><td className="pr-3">{organisation}</td><td className="break-words">{purpose}</td></tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {entered.inspections ? <p className="mt-1 text-sm" data-testid="inspections-note"><span className="font-medium">Earlier note (entered as text before visitors had their own lines):</span> {entered.inspections}</p> : null}
    </div>
  );
}

/**
 * `stationSetupHref`: the water-quality setup page, for a reader who may add a station there.
 * `crewsEditor`, `interruptionsEditor`: the day page's forms, shown in their sections until it is signed.
 */
export function DailyReportFigures({ report, timeZone, lengthUnit, stationSetupHref, crewsEditor, interruptionsEditor }: { report: CompiledDay; timeZone: string; lengthUnit: LengthUnit; stationSetupHref?: string; crewsEditor?: React.ReactNode; interruptionsEditor?: React.ReactNode }) {
  const units = reportUnits(lengthUnit);
  const lengthLabel = unitLabel(lengthUnit);
  const clock = (iso: string) => localClockOf(Date.parse(iso), timeZone);
  return (
    <>
      <Section title="Dive work">
        <p className="text-sm" data-testid="dive-summary"><span className="figures">{report.dives.count}</span> dives · <span className="figures">{report.dives.bottomMinutes}</span> bottom minutes · deepest <span className="figures whitespace-nowrap">{report.dives.maxDepth === null ? "—" : `${report.dives.maxDepth} ${lengthLabel}`}</span></p>
        {report.teams.length > 0 ? (
          <div className="mt-2 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Dive work per team, scrollable">
            <table className="w-full text-sm">
              <thead><tr className="text-left align-bottom text-muted"><th scope="col" className="pr-3">Team</th><th scope="col" className="pr-3 text-right">Head count</th><th scope="col" className="pr-3 text-right">Dives</th><th scope="col" className="pr-3 text-right">Bottom time (min)</th><th scope="col" className="pr-3 text-right">Max depth ({lengthLabel})</th><th scope="col">Cells</th></tr></thead>
              <tbody>
                {report.teams.map((team) => (
                  <tr key={team.team} className="border-t border-line"><td className="pr-3">{team.team}</td><td className="figures pr-3 text-right whitespace-nowrap">{headCountCell(team)}</td><td className="figures pr-3 text-right">{team.dives}</td><td className="figures pr-3 text-right">{team.bottomMinutes}</td><td className="figures pr-3 text-right">{team.maxDepth ?? "—"}</td><td className="figures break-words">{team.cells.join(" ")}</td></tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
        {enteredHeadCountsLine(report.teams) ? <p className="mt-2 text-sm" data-testid="entered-head-counts">{enteredHeadCountsLine(report.teams)}</p> : null}
        {report.teams.some((team) => (team.visitors ?? []).length > 0) ? (
          <p className="mt-2 text-sm" data-testid="report-visitors">
            Visitors diving (not on the team's roster): {report.teams.filter((team) => (team.visitors ?? []).length > 0).map((team) => `${team.team}: ${team.visitors!.join(", ")}`).join("; ")}.
          </p>
        ) : null}
        {report.dives.flags.length > 0 ? <ul className="mt-2 list-disc pl-5 text-sm text-danger">{report.dives.flags.map((flag) => <li key={flag}>{flag}</li>)}</ul> : null}
        {report.dives.flags.length > 0 ? <p className="text-xs text-muted">Flags are information from the published table, never approval; the dive safety plan governs.</p> : null}
        {crewsEditor}
      </Section>

      <Section title="Production">
        <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm md:grid-cols-4">
          {productionRows(report.production, units).map(([label, value]) => <Fragment key={label}><dt className="text-muted">{label}</dt><dd className="figures">{value}</dd></Fragment>)}
        </dl>
        {report.production.haulTickets.length > 0 ? <p className="mt-1 text-xs text-muted">Tickets: <span className="figures">{report.production.haulTickets.join(", ")}</span></p> : null}
        {report.production.survey ? <p className="mt-2 text-sm" data-testid="day-survey">{surveyLine(report.production.survey)}</p> : null}
      </Section>

      <Section title="Water quality">
        {report.waterQuality.complianceStations?.length === 0 ? (
          <p className="mb-1 text-sm" data-testid="no-compliance-station">
            {noComplianceStationLine()}{stationSetupHref ? <> <Link className="underline" to={stationSetupHref}>Set up a station</Link>.</> : null}
          </p>
        ) : null}
        {report.waterQuality.readings.length === 0 ? <p className="text-sm text-muted">{report.waterQuality.complianceStations?.length === 0 ? "No readings." : "No stations and no readings."}</p> : (
          <ul className="space-y-1 text-sm">
            {report.waterQuality.readings.map((row) => (
              <li key={row.station}>
                <span className="font-medium">{row.station}</span> <span className="text-muted">({row.stationKind})</span>: <span className="figures">{row.count}</span> readings
                {row.count > 0 ? <>, highest <span className="figures">{row.maxValue}</span> {row.unit} · <span className={row.verdict === "exceeds" ? "text-danger" : ""}>{row.verdict}</span></> : null}
              </li>
            ))}
          </ul>
        )}
        {report.waterQuality.exceedances.map((row) => <p key={row.at + row.station} className="text-sm text-danger">Exceedance at {row.station}, {clock(row.at)}: <span className="figures">{row.value}</span> {row.unit}</p>)}
        {report.waterQuality.missedIntervals.map((gap) => <p key={gap.from} className="text-sm text-danger">No compliance reading <span className="figures">{clock(gap.from)}–{clock(gap.to)}</span></p>)}
        <p className="mt-1 text-xs text-muted">Readings support the permit's monitoring; the permit and the agency decide compliance.</p>
      </Section>

      <Section title="Interruptions">
        {report.interruptions.length === 0 ? <p className="text-sm text-muted">None recorded.</p> : (
          <ul className="space-y-1 text-sm">
            {report.interruptions.map((event) => (
              <li key={event.kind + event.start}>{interruptionLine(event, timeZone)}</li>
            ))}
          </ul>
        )}
        <p className="mt-1 text-sm" data-testid="lost-hours">Lost in all: <span className="figures">{fmt(report.lostHours, 2)}</span> h{lostHoursNote(report) ? ` (${lostHoursNote(report)})` : ""}</p>
        {interruptionsEditor}
      </Section>

      <Section title="Finds">
        {Object.keys(report.finds.byCategory).length === 0 ? <p className="text-sm text-muted">No finds.</p> : (
          <p className="text-sm">{findsLine(report.finds.byCategory)}</p>
        )}
        {report.finds.byHand ? <p className="text-sm" data-testid="by-hand">{byHandLine(report.finds.byHand, lengthUnit)}</p> : null}
        {report.finds.catalogueNumbers.length > 0 ? <p className="figures text-xs">{report.finds.catalogueNumbers.join(", ")}</p> : null}
        {report.holds.placed.length > 0 ? <p className="text-sm">Holds placed: <span className="figures">{report.holds.placed.join(", ")}</span></p> : null}
        {report.holds.lifted.length > 0 ? <p className="text-sm">Holds lifted: <span className="figures">{report.holds.lifted.join(", ")}</span></p> : null}
        <p className="mt-1 text-xs text-muted">No find locations appear in this report.</p>
      </Section>

    </>
  );
}
