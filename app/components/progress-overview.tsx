import { useState } from "react";
import type { ProgressFigures, ProgressView, ZoneProgress } from "~/models/progress.server";
import { CumulativeRemovedChart, ProductionChart } from "./progress-charts";
import { RATE_WINDOW_CALENDAR_DAYS } from "../../shared/progress/forecast";
import { THIN_INTERVAL_WORKING_DAYS } from "../../shared/progress/working-days";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { Percent, Volume, ZoneName, formatNumber, zoneKey } from "./progress-figures";

/** The manager's progress overview: zone table with bars, charts, forecast, and their assumptions. */

type SortKey = "name" | "plannedVolume" | "removedVolume" | "remainingVolume" | "percentCompleteByVolume" | "percentCellsAtFirmSand" | "cellsConfirmed" | "lastSurveyOn";

const COLUMNS: Array<{ key: SortKey; label: string; numeric: boolean }> = [
  { key: "name", label: "Zone", numeric: false },
  { key: "plannedVolume", label: "Planned", numeric: true },
  { key: "removedVolume", label: "Removed", numeric: true },
  { key: "remainingVolume", label: "Remaining", numeric: true },
  { key: "percentCompleteByVolume", label: "Complete by volume", numeric: true },
  { key: "percentCellsAtFirmSand", label: "Cells at firm sand", numeric: true },
  { key: "cellsConfirmed", label: "Cells confirmed", numeric: true },
  { key: "lastSurveyOn", label: "Last survey", numeric: false },
];

function compare(a: ZoneProgress, b: ZoneProgress, key: SortKey): number {
  const left = a[key];
  const right = b[key];
  if (left === right) return 0;
  if (left === null) return 1;
  if (right === null) return -1;
  return left < right ? -1 : 1;
}

function Bar({ percent, label }: { percent: number | null; label: string }) {
  return (
    <div className="mt-1 h-1.5 w-full min-w-16 rounded bg-paper" role="presentation" title={label}>
      <div className="h-1.5 rounded bg-lagoon" style={{ width: `${Math.min(100, Math.max(0, percent ?? 0))}%` }} />
    </div>
  );
}

function FigureCells({ figures, unit }: { figures: ProgressFigures; unit: string }) {
  return (
    <>
      <td className="px-2 py-1"><Volume value={figures.plannedVolume} unit={unit} /></td>
      <td className="px-2 py-1"><Volume value={figures.removedVolume} unit={unit} /></td>
      <td className="px-2 py-1"><Volume value={figures.remainingVolume} unit={unit} /></td>
      <td className="px-2 py-1"><Percent value={figures.percentCompleteByVolume} /><Bar percent={figures.percentCompleteByVolume} label="complete by volume" /></td>
      <td className="px-2 py-1">
        <Percent value={figures.percentCellsAtFirmSand} /> <span className="figures text-xs text-muted">({figures.cellsAtFirmSand}/{figures.cells})</span>
        <Bar percent={figures.percentCellsAtFirmSand} label="cells at firm sand" />
      </td>
      <td className="figures px-2 py-1">{figures.cellsConfirmed}</td>
      <td className="figures whitespace-nowrap px-2 py-1">{figures.lastSurveyOn ? <time dateTime={figures.lastSurveyOn}>{figures.lastSurveyOn}</time> : "–"}</td>
    </>
  );
}

export function ZoneTable({ progress }: { progress: ProgressView }) {
  const [sort, setSort] = useState<{ key: SortKey; ascending: boolean } | null>(null);
  const unit = progress.volumeLabel;
  const zones = sort ? [...progress.zones].sort((a, b) => (sort.ascending ? 1 : -1) * compare(a, b, sort.key)) : progress.zones;
  return (
    <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Progress per zone, scrollable">
      <table className="w-full text-right text-sm" data-testid="zone-table">
        <caption className="sr-only">Progress per zone; select a column heading to sort</caption>
        <thead>
          <tr className="border-b border-line align-bottom">
            {COLUMNS.map((column) => {
              const active = sort?.key === column.key;
              return (
                <th key={column.key} scope="col" className={`px-2 py-1 font-sans font-medium ${column.numeric ? "" : "text-left"}`} aria-sort={active ? (sort!.ascending ? "ascending" : "descending") : "none"}>
                  <button type="button" className="underline-offset-2 hover:underline" onClick={() => setSort({ key: column.key, ascending: active ? !sort!.ascending : !column.numeric })}>
                    {column.label}{active ? (sort!.ascending ? " ▲" : " ▼") : ""}
                  </button>
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {zones.map((zone) => (
            <tr key={zoneKey(zone)} className="border-b border-line" data-zone={zone.name} data-unzoned={zone.zoneId === null ? "" : undefined}>
              <th scope="row" className="px-2 py-1 text-left font-sans font-normal"><ZoneName zone={zone} /></th>
              <FigureCells figures={zone} unit={unit} />
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="font-semibold" data-zone="Project">
            <th scope="row" className="px-2 py-1 text-left font-sans">Project</th>
            <FigureCells figures={progress.total} unit={unit} />
          </tr>
        </tfoot>
      </table>
    </div>
  );
}

function ForecastList({ progress }: { progress: ProgressView }) {
  const unit = progress.volumeLabel;
  return (
    <ul className="mt-2 space-y-1 text-sm" data-testid="forecast">
      {progress.zones.map((zone) => {
        const { forecast } = zone;
        return (
          <li key={zoneKey(zone)} data-zone={zone.name} data-state={forecast.state}>
            <span className="font-medium"><ZoneName zone={zone} />:</span>{" "}
            {forecast.state === "finished" ? "finished: every cell is at firm sand (what remains is within the tolerance)." : null}
            {forecast.state === "no-rate" ? "no forecast yet: no removal measured between two surveys of this zone." : null}
            {forecast.state === "no-recent-rate" ? (
              <>
                no recent rate: no removal measured in this zone in the {RATE_WINDOW_CALENDAR_DAYS} days{" "}
                <span className="figures">{forecast.windowFromDate}</span> to <span className="figures">{forecast.windowToDate}</span>, so no date.
              </>
            ) : null}
            {forecast.state === "forecast" ? (
              <>
                finish about <span className="figures">{forecast.finishDate}</span>{" "}
                {forecast.latestFinishDate === null ? (
                  <>(not before <span className="figures">{forecast.earliestFinishDate}</span>; no latest date, as an interval in the window removed nothing)</>
                ) : (
                  <>(between <span className="figures">{forecast.earliestFinishDate}</span> and <span className="figures">{forecast.latestFinishDate}</span>)</>
                )}
                : {forecast.workingDaysLeft} weekdays from{" "}
                <span className="figures">{forecast.windowToDate}</span> at{" "}
                <span className="figures">{formatNumber(forecast.volumePerWorkingDay, 1)} {unit}/day</span>, the mean rate of the{" "}
                {RATE_WINDOW_CALENDAR_DAYS}-day window <span className="figures">{forecast.windowFromDate}</span> to{" "}
                <span className="figures">{forecast.windowToDate}</span> ({forecast.intervals.length === 1 ? "1 interval" : `${forecast.intervals.length} intervals`}, rates{" "}
                <span className="figures">{formatNumber(forecast.slowestVolumePerWorkingDay, 1)}–{formatNumber(forecast.fastestVolumePerWorkingDay, 1)} {unit}/day</span>).
              </>
            ) : null}
          </li>
        );
      })}
    </ul>
  );
}

function CrossCheck({ progress }: { progress: ProgressView }) {
  const check = progress.crossCheck;
  const unit = progress.volumeLabel;
  if (!check) return <p className="mt-2 text-sm text-muted">No end-area check yet: it needs a baseline with a probe column and a work limit.</p>;
  return (
    <>
      <dl className="mt-2 grid gap-2 text-sm sm:grid-cols-3" data-testid="cross-check">
        <div><dt className="text-muted">Removed, surface to surface</dt><dd><Volume value={check.surfaceRemovedVolume} unit={unit} digits={1} /></dd></div>
        <div><dt className="text-muted">Removed, average end area</dt><dd><Volume value={check.endAreaRemovedVolume} unit={unit} digits={1} /></dd></div>
        <div><dt className="text-muted">Difference</dt><dd><span className="figures">{check.differencePercent === null ? "–" : `${check.differencePercent >= 0 ? "+" : "−"}${formatNumber(Math.abs(check.differencePercent), 2)} %`}</span></dd></div>
      </dl>
      <p className="mt-2 text-xs text-muted">{check.method} The surface figure is the one the quantities rest on; the sections are the reviewer's check of it.</p>
    </>
  );
}

export function ProgressOverview({ progress, links }: { progress: ProgressView; links: Array<{ href: string; label: string }> }) {
  const unit = progress.volumeLabel;
  const series = [
    ...progress.series.zones.map((zone) => ({ name: zone.name, colour: zone.colour, values: zone.removedVolume })),
    { name: "Project", values: progress.series.totalRemovedVolume, total: true },
  ];
  return (
    <div className="space-y-6">
      <section aria-labelledby="progress-heading" className="rounded border border-line bg-panel p-4">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="progress-heading" className="font-semibold">Progress by zone</h2>
          <nav aria-label="Progress exports" className="flex flex-wrap gap-3 text-sm">
            {links.map((link) => <a key={link.href} className="underline" href={link.href}>{link.label}</a>)}
          </nav>
        </div>
        {progress.hasFigures ? <ZoneTable progress={progress} /> : <p className="mt-2 text-sm text-muted">{progress.reason}</p>}
        <p className="mt-2 text-xs text-muted">
          Volumes in {unit}. Complete by volume = (planned − remaining) ÷ planned, held within 0–100 %. Cells at firm sand include confirmed cells.
          {progress.zones.some((zone) => zone.zoneId === null) ? ` ${UNZONED_NOTE}` : null}
        </p>
      </section>
      {progress.hasFigures ? (
        <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
          <section aria-labelledby="cumulative-heading" className="rounded border border-line bg-panel p-4">
            <h2 id="cumulative-heading" className="font-semibold">Removed volume over time</h2>
            <CumulativeRemovedChart dates={progress.series.dates} series={series} unit={unit} />
          </section>
          <section aria-labelledby="production-heading" className="rounded border border-line bg-panel p-4">
            <h2 id="production-heading" className="font-semibold">Production per working day</h2>
            <ProductionChart intervals={progress.production} unit={unit} />
            <p className="mt-1 text-xs text-muted">
              {progress.workingDayBasis === "days-logged"
                ? `Working days: days with a logged dive or dewatering shift; weekdays for intervals with neither (${progress.production.filter((interval) => interval.basis === "weekdays").length} of ${progress.production.length}).`
                : "Working days: weekdays (no dives logged yet)."}
              {progress.production.some((interval) => interval.thin)
                ? ` Hatched bars rest on fewer than ${THIN_INTERVAL_WORKING_DAYS} working days (${progress.production.filter((interval) => interval.thin).length} of ${progress.production.length}): too few to compare with the others.`
                : null}
            </p>
          </section>
          <section aria-labelledby="cross-check-heading" className="rounded border border-line bg-panel p-4 lg:col-span-2">
            <h2 id="cross-check-heading" className="font-semibold">Surface volume and the end-area check</h2>
            <CrossCheck progress={progress} />
          </section>
          <section aria-labelledby="forecast-heading" className="rounded border border-line bg-panel p-4 lg:col-span-2">
            <h2 id="forecast-heading" className="font-semibold">Forecast finish per zone</h2>
            <ForecastList progress={progress} />
            <h3 className="mt-3 text-sm font-medium">Assumptions</h3>
            <ul className="mt-1 list-disc pl-5 text-xs text-muted">
              {progress.assumptions.map((assumption) => <li key={assumption}>{assumption}</li>)}
            </ul>
          </section>
        </div>
      ) : null}
    </div>
  );
}
