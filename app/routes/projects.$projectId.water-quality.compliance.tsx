import { Form, Link } from "react-router";
import { z } from "zod";
import { instantOfLocal, localDayOf } from "../../shared/local-time";
import { localTime } from "~/components/stop-work-banner";
import { TurbidityChart } from "~/components/turbidity-chart";
import { requireRole } from "~/lib/auth/access.server";
import { complianceSummary, listReadings, listStopWork, samplingRoutineInWords } from "~/models/water-quality.server";
import { listStandDowns } from "~/models/wildlife.server";
import { WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import type { Route } from "./+types/projects.$projectId.water-quality.compliance";

// The compliance page: per station a chart and a table of readings with their verdicts, the
// exceedances, the sampling intervals missed on days work was logged, and the CSV export.

const periodSchema = z.object({ from: z.iso.date().optional().catch(undefined), to: z.iso.date().optional().catch(undefined) });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const nowMs = Date.now();
  const query = periodSchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  // Without a period: the two weeks up to the latest reading (or today), so a quiet spell shows the last record, not an empty page.
  const [latest] = query.to ? [] : await listReadings(project, {}, { latest: 1 });
  const to = query.to ?? (latest ? latest.localDay : localDayOf(nowMs, project.timeZone));
  const from = query.from && query.from <= to ? query.from : localDayOf(Date.parse(`${to}T12:00:00Z`) - 13 * 86_400_000, "UTC");
  const [summary, stopWork, standDowns] = await Promise.all([complianceSummary(project, { from, to }), listStopWork(project, {}, nowMs), listStandDowns(project, {}, nowMs)]);
  const inPeriod = (iso: string) => localDayOf(Date.parse(iso), project.timeZone) >= from && localDayOf(Date.parse(iso), project.timeZone) <= to;
  return {
    projectId: project.id, projectName: project.name, timeZone: project.timeZone, from, to,
    fromMs: instantOfLocal(from, 0, project.timeZone), toMs: instantOfLocal(to, 24 * 60, project.timeZone),
    ...summary,
    routine: samplingRoutineInWords(summary.settings),
    stopWork: stopWork.filter((event) => inPeriod(event.openedAt)),
    standDowns: standDowns.filter((standDown) => inPeriod(standDown.startedAt)),
  };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Water-quality compliance · Firmsand" }];
}

export default function WaterQualityCompliance({ loaderData }: Route.ComponentProps) {
  const { projectId, timeZone, from, to, stations, missed, rules } = loaderData;
  const dayLabel = (instantMs: number) => localDayOf(instantMs, timeZone).slice(5);
  const samplers = [...new Set(stations.flatMap((entry) => entry.readings.map((reading) => reading.sampledBy)))].filter(Boolean);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-xl font-semibold">Water-quality compliance, {from} to {to}</h2>
        <p className="flex gap-3 text-sm print:hidden">
          <Link to={`/projects/${projectId}/water-quality`} className="text-lagoon underline">Back to water quality</Link>
          <a href={`/projects/${projectId}/water-quality/readings.csv?from=${from}&to=${to}`} className="text-lagoon underline" download>Readings CSV</a>
        </p>
      </div>
      <Form method="get" className="flex flex-wrap items-end gap-3 text-sm print:hidden">
        <label className="block">From <input type="date" name="from" defaultValue={from} className="ml-1 rounded border border-line px-2 py-1" /></label>
        <label className="block">To <input type="date" name="to" defaultValue={to} className="ml-1 rounded border border-line px-2 py-1" /></label>
        <button type="submit" className="rounded border border-line bg-panel px-3 py-1 hover:bg-paper">Show</button>
      </Form>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution">{WATER_QUALITY_CAUTION}</p>
      <p className="text-sm">Rule in force: {rules.find((rule) => rule.inForce)?.summary ?? "none set"}{rules.find((rule) => rule.inForce) ? ` (source: ${rules.find((rule) => rule.inForce)!.source})` : ""}. Sampling: {loaderData.routine} on days a dive or a dewatering shift is logged. Times are project time ({timeZone}).</p>

      <section aria-labelledby="missed-heading">
        <h3 id="missed-heading" className="text-lg font-semibold">Missed sampling intervals</h3>
        {missed.length === 0 ? <p className="text-sm text-muted">None on the days work was logged.</p> : (
          <ul className="mt-1 text-sm" data-testid="missed-intervals">{missed.map((gap) => <li key={gap.fromMs} className="text-caution">{gap.day}: no compliance reading from {localTime(gap.from, timeZone)} to {localTime(gap.to, timeZone)}</li>)}</ul>
        )}
      </section>

      <section aria-labelledby="events-heading">
        <h3 id="events-heading" className="text-lg font-semibold">Stop-work events and stand-downs</h3>
        <p className="text-sm" data-testid="hours-lost">
          Hours lost in this period: {Math.round(loaderData.stopWork.reduce((sum, event) => sum + event.durationHours, 0) * 100) / 100} h to turbidity stop-work,{" "}
          {Math.round(loaderData.standDowns.reduce((sum, standDown) => sum + standDown.durationHours, 0) * 100) / 100} h to wildlife stand-downs (events that began in the period; an open one counts to now).
        </p>
        {loaderData.standDowns.length > 0 ? (
          <ul className="mt-1 text-sm">{loaderData.standDowns.map((standDown) => <li key={`sd-${standDown.id}`}>{standDown.species}: from {localTime(standDown.startedAt, timeZone)}{standDown.until ? ` to ${localTime(standDown.until, timeZone)}` : " · animal still near"} · {standDown.durationHours} h</li>)}</ul>
        ) : null}
        {loaderData.stopWork.length === 0 ? <p className="text-sm text-muted">None in this period.</p> : (
          <ul className="mt-1 text-sm">{loaderData.stopWork.map((event) => <li key={event.id}>{event.station}: {event.reading.value} {event.reading.unit} at {localTime(event.openedAt, timeZone)} · {event.open ? "OPEN" : `resumed ${localTime(event.resumedAt!, timeZone)}`} · {event.durationHours} h · agency {event.agencyNotified ? `told ${localTime(event.agencyNotified.at, timeZone)} (${event.agencyNotified.how}, ${event.agencyNotified.to})` : "notice not recorded"}</li>)}</ul>
        )}
      </section>

      {stations.map(({ station, readings, exceedances, unpaired }) => (
        <section key={station.id} aria-labelledby={`station-${station.id}`} className="space-y-2 break-inside-avoid">
          <h3 id={`station-${station.id}`} className="text-lg font-semibold">{station.name} <span className="text-sm font-normal text-muted">({station.kind}{station.depth ? `, ${station.depth}` : ""}) · {readings.length} readings{station.kind === "compliance" ? ` · ${exceedances} exceeding · ${unpaired} unpaired` : ""}</span></h3>
          {readings.length > 0 ? (
            <TurbidityChart station={station.name} readings={readings.map((reading) => ({ takenAt: reading.takenAt, value: reading.value, limit: reading.evaluation?.limit ?? null, background: reading.evaluation?.background ?? null, exceeds: reading.evaluation?.exceeds ?? null }))}
              missed={station.kind === "compliance" ? missed : []} fromMs={loaderData.fromMs} toMs={loaderData.toMs} dayLabel={dayLabel} />
          ) : null}
          {readings.length === 0 ? <p className="text-sm text-muted">No readings in this period.</p> : (
            <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label={`Readings at ${station.name}, scrollable`}>
              <table className="w-full text-sm" data-testid={`compliance-table-${station.name}`}>
                <thead><tr className="border-b border-line text-left align-bottom"><th scope="col" className="py-1 pr-3">Time</th><th scope="col" className="pr-3 text-right">Value</th><th scope="col" className="pr-3 text-right">Background</th><th scope="col" className="pr-3 text-right">Difference</th><th scope="col" className="pr-3 text-right">Limit</th><th scope="col" className="pr-3">Verdict</th><th scope="col">Sampled by</th></tr></thead>
                <tbody>
                  {readings.map((reading) => (
                    <tr key={reading.id} className="border-b border-line">
                      <td className="py-1 pr-3 whitespace-nowrap"><time dateTime={reading.takenAt}>{localTime(reading.takenAt, timeZone)}</time></td>
                      <td className="figures pr-3 text-right whitespace-nowrap">{reading.value} {reading.unit}</td>
                      <td className="figures pr-3 text-right">{reading.evaluation?.background ?? "—"}</td>
                      <td className="figures pr-3 text-right">{reading.evaluation?.difference ?? "—"}</td>
                      <td className="figures pr-3 text-right">{reading.evaluation?.limit ?? "—"}</td>
                      <td className={`pr-3 ${reading.evaluation?.exceeds ? "font-semibold text-danger" : ""}`}>{reading.evaluation ? (reading.evaluation.exceeds === null ? "unpaired: no verdict" : reading.evaluation.exceeds ? "EXCEEDS" : "within") : "—"}</td>
                      <td>{reading.sampledBy}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </section>
      ))}

      <section aria-label="Sign-off" className="space-y-3 border-t border-line pt-4 text-sm">
        <p>Sampled by: {samplers.join(", ") || "—"}</p>
        <p>Reviewed and signed: ______________________________ Date: ______________</p>
        <button type="button" onClick={() => window.print()} className="rounded border border-line bg-panel px-3 py-1 hover:bg-paper print:hidden">Print this report</button>
      </section>
    </div>
  );
}
