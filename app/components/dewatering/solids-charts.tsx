import { measureLabel } from "../../../shared/units";
import type { SolidsCharts as SolidsChartsData } from "~/models/reconciliation.server";
import { DailyBarsChart, DatedLinesChart } from "../progress-charts";
import { formatNumber } from "../progress-figures";

/**
 * The dewatering charts: dry solids pumped per day, polymer per dry ton per day, and the
 * cumulative dry solids by the surveys, the shift logs and the haul tickets. Drawn on the server
 * first, at the panel's width once scripts run.
 */
export function SolidsCharts({ charts }: { charts: SolidsChartsData }) {
  const { days, cumulative } = charts;
  const bulk = `dry ${measureLabel(cumulative.unit)}`;
  const perTon = `${measureLabel(cumulative.massUnit)} per dry ${cumulative.unit === "t" ? "tonne" : "short ton"}`;
  const shifts = (count: number) => (count === 1 ? "1 shift" : `${count} shifts`);
  const lines = [
    { name: "Surveyed", values: cumulative.surveyed, marked: cumulative.own.surveyed },
    { name: "Pumped", values: cumulative.pumped, marked: cumulative.own.pumped },
    { name: "Hauled", values: cumulative.hauled, marked: cumulative.own.hauled },
  ].filter((line) => line.values.some((value) => value !== null));
  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <DailyBarsChart
        testId="dry-solids-chart" kind="total" unit={bulk} digits={1} emptyText="No shifts logged yet."
        caption={(per) => `Dry solids pumped per ${per} (${bulk})`}
        title={(per) => `Dry solids pumped per ${per}, from the shift logs (${bulk})`}
        bars={days.map((day) => ({
          date: day.date, value: day.drySolids,
          label: day.drySolids === null ? `${day.date}: ${shifts(day.shifts)}, no solids content logged` : `${day.date}: ${formatNumber(day.drySolids, 1)} ${bulk} from ${shifts(day.shifts)}`,
        }))}
      />
      <DailyBarsChart
        testId="polymer-per-ton-chart" kind="ratio" unit={perTon} digits={2} emptyText="No shifts logged yet."
        caption={(per) => `Polymer per dry ton${per === "day" ? "" : `, by ${per}`} (${perTon})`}
        title={(per) => `Neat polymer per dry ton by ${per}, from the shifts that logged both (${perTon})`}
        bars={days.map((day) => ({
          date: day.date, value: day.polymerPerDryTon,
          ratio: day.polymerParts && { numerator: day.polymerParts.polymer, denominator: day.polymerParts.drySolids },
          label: day.polymerPerDryTon === null ? `${day.date}: no shift logged both a polymer and its solids` : `${day.date}: ${formatNumber(day.polymerPerDryTon, 2)} ${perTon}`,
        }))}
      />
      <figure className="min-w-0 space-y-1 lg:col-span-2">
        <figcaption className="text-sm font-medium">Cumulative dry solids: surveyed, pumped and hauled ({bulk})</figcaption>
        <DatedLinesChart
          testId="cumulative-solids-chart" title={`Cumulative dry solids by the surveys, the shift logs and the haul tickets (${bulk})`} unit={bulk}
          emptyText="Nothing surveyed, pumped or hauled yet." dates={lines.length ? cumulative.dates : []} series={lines}
        />
        <p className="text-xs text-muted">
          {cumulative.surveyedMissing === "no-samples"
            ? "No surveyed line yet: turning removed volume into dry mass needs a lab sample's dry bulk density (Sediment samples)."
            : cumulative.surveyedMissing === "no-surveys"
              ? "No surveyed line yet: it needs a survey after the baseline."
              : "Surveyed: removed volume in place × dry bulk density of the lab samples, as in the reconciliation. Pumped: the shift logs' dry solids. Hauled: the tickets' dry solids. A dot is a record on that date; between its dots a line holds its last value."}
        </p>
      </figure>
    </div>
  );
}
