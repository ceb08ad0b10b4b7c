import { unitLabel, type LengthUnit } from "../../shared/units";
import { SURVEY_ORDER_NAMES } from "../../shared/qa/tvu";
import type { SettingsVersionView } from "~/models/project-setup.server";

const when = (iso: string) => new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" });
const figure = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 4 });

/**
 * Each version of the settings the figures rest on, newest first: who saved it and when, what it
 * changed, and its grid, tolerances and zones. Snapshots, the quantities and the daily report
 * name the version their figures were computed with, so an old report can be read against it.
 */
export function SettingsHistory({ versions, lengthUnit }: { versions: SettingsVersionView[]; lengthUnit: LengthUnit }) {
  const unit = unitLabel(lengthUnit);
  if (versions.length === 0) return <p className="text-sm text-muted">No settings version is kept yet: the first is kept when the work limit, grid, zones or tolerances are saved.</p>;
  return (
    <>
      <p className="text-sm text-muted">A new version is kept each time the work limit, grid, zones or tolerances change. The figures, the quantities and the daily report say which version they were computed with.</p>
      <div className="mt-3 overflow-x-auto" role="region" aria-label="Settings versions" tabIndex={0}>
        <table className="w-full min-w-[60rem] text-left text-sm" data-testid="settings-history">
          <thead>
            <tr className="border-b border-line">
              <th scope="col" className="py-1 pr-3 font-medium">Version</th>
              <th scope="col" className="py-1 pr-3 font-medium">Saved</th>
              <th scope="col" className="py-1 pr-3 font-medium">By</th>
              <th scope="col" className="py-1 pr-3 font-medium">Changed</th>
              <th scope="col" className="py-1 pr-3 font-medium">Cell size ({unit})</th>
              <th scope="col" className="py-1 pr-3 font-medium">Firm-sand tolerance ({unit})</th>
              <th scope="col" className="py-1 pr-3 font-medium">Share within / coverage</th>
              <th scope="col" className="py-1 pr-3 font-medium">Survey order</th>
              <th scope="col" className="py-1 font-medium">Zones</th>
            </tr>
          </thead>
          <tbody>
            {versions.map((version) => (
              <tr key={version.version} className="border-b border-line align-top last:border-0">
                <th scope="row" className="figures py-1 pr-3 font-normal">{version.version}</th>
                <td className="py-1 pr-3"><time dateTime={version.savedAt} className="figures whitespace-nowrap">{when(version.savedAt)}</time></td>
                <td className="py-1 pr-3">{version.savedBy ?? "—"}</td>
                <td className="py-1 pr-3">{version.changed.join(", ")}</td>
                <td className="figures py-1 pr-3 text-right">{figure(version.grid.cellSize)}</td>
                <td className="figures py-1 pr-3 text-right">{figure(version.tolerances.firmSand)}</td>
                <td className="figures py-1 pr-3 whitespace-nowrap">{figure(version.tolerances.firmShare)} / {figure(version.tolerances.minCoverage)}</td>
                {/* Versions kept before the project had its own order say nothing of it. */}
                <td className="py-1 pr-3 whitespace-nowrap">{version.tolerances.surveyOrder ? SURVEY_ORDER_NAMES[version.tolerances.surveyOrder] : "not kept"}</td>
                <td className="py-1">{version.zones.length === 0 ? "none" : version.zones.join(", ")}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
