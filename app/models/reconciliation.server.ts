import { cumulativeSolids, dewateringDays, type CumulativeSolids, type DewateringDay } from "../../shared/dewatering/charts";
import { reconcileSolids, type Reconciliation, type SampleFigures } from "../../shared/dewatering/reconciliation";
import { attributeSolidsToZones } from "../../shared/dewatering/zone-attribution";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { pumpedDrySolidsKg, shiftSolids, shiftsForAttribution } from "./dewatering.server";
import { divesForAttribution } from "./dives.server";
import { hauledDrySolidsKg, haulSolids } from "./hauls.server";
import { loadProgress, type ProgressView } from "./progress.server";
import { listSamples, type SampleView } from "./sediment-samples.server";

const sampleFigures = (sample: SampleView): SampleFigures => ({
  zoneId: sample.zone?.id ?? null, dryBulkDensityKgPerM3: sample.dryBulkDensityKgPerM3, totalNitrogenMgKg: sample.totalNitrogenMgKg, totalPhosphorusMgKg: sample.totalPhosphorusMgKg,
});

/** A pay period's ends and its removed volume per zone (a live period, or a signed report's snapshot). */
export interface ReconciliationPeriod {
  from: { surveyedOn: string };
  to: { surveyedOn: string };
  zones: ReadonlyArray<{ zoneId: number | null; name: string; removedVolume: number }>;
}

/**
 * Surveyed, pumped and hauled solids and the nutrients removed. The surveyed volumes are the
 * engine's own figures per zone, as the progress view rolls them up (never recomputed here); pass
 * the progress a page has loaded already to save reading it twice. With a period, the zones'
 * volumes are the period's and only the shifts and tickets dated in it count. Pumped and hauled
 * solids are shared among the zones by the dive log (zone-attribution.ts), the rest unattributed.
 */
export async function loadReconciliation(project: ProjectView, progress?: ProgressView, period?: ReconciliationPeriod): Promise<Reconciliation & { hasFigures: boolean }> {
  const span = period ? { after: period.from.surveyedOn, through: period.to.surveyedOn } : null;
  const [figures, samples, pumpedKg, hauledKg, shifts] = await Promise.all([
    period ? null : progress ?? loadProgress(project), listSamples(project), pumpedDrySolidsKg(project, span), hauledDrySolidsKg(project, span), shiftsForAttribution(project, span),
  ]);
  const dives = await divesForAttribution(project, shifts.map((shift) => shift.date));
  const attribution = attributeSolidsToZones({ shifts, dives, hauledKg });
  const zones = period ? period.zones : figures!.zones;
  const result = reconcileSolids({
    lengthUnit: project.lengthUnit,
    zones: zones.map((zone) => ({ zoneId: zone.zoneId, name: zone.name, removedVolume: zone.removedVolume })),
    samples: samples.map(sampleFigures),
    pumpedDryKg: pumpedKg,
    hauledDryKg: hauledKg,
    period: span && { from: span.after, to: span.through },
    attribution,
  });
  return { ...result, hasFigures: period ? true : figures!.hasFigures };
}

export interface SolidsCharts {
  days: DewateringDay[];
  cumulative: CumulativeSolids;
}

/** The dewatering charts' series: the same records and samples the reconciliation reads. */
export async function loadSolidsCharts(project: ProjectView, progress?: ProgressView): Promise<SolidsCharts> {
  const [figures, samples, shifts, hauls] = await Promise.all([progress ?? loadProgress(project), listSamples(project), shiftSolids(project), haulSolids(project)]);
  return {
    days: dewateringDays(shifts, project.lengthUnit),
    cumulative: cumulativeSolids({
      lengthUnit: project.lengthUnit,
      surveyed: { dates: figures.series.dates, zones: figures.series.zones.map((zone) => ({ zoneId: zone.zoneId, removedVolume: zone.removedVolume })) },
      samples: samples.map(sampleFigures),
      shifts,
      hauls,
    }),
  };
}
