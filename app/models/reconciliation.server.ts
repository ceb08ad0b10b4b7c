import { reconcileSolids, type Reconciliation } from "../../shared/dewatering/reconciliation";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { pumpedDrySolidsKg } from "./dewatering.server";
import { hauledDrySolidsKg } from "./hauls.server";
import { loadProgress, type ProgressView } from "./progress.server";
import { listSamples } from "./sediment-samples.server";

/**
 * Surveyed, pumped and hauled solids and the nutrients removed. The surveyed volumes are the
 * engine's own figures per zone, as the progress view rolls them up (never recomputed here); pass
 * the progress a page has loaded already to save reading it twice.
 */
export async function loadReconciliation(project: ProjectView, progress?: ProgressView): Promise<Reconciliation & { hasFigures: boolean }> {
  const [figures, samples, pumpedKg, hauledKg] = await Promise.all([progress ?? loadProgress(project), listSamples(project), pumpedDrySolidsKg(project), hauledDrySolidsKg(project)]);
  const result = reconcileSolids({
    lengthUnit: project.lengthUnit,
    zones: figures.zones.map((zone) => ({ zoneId: zone.zoneId, name: zone.name, removedVolume: zone.removedVolume })),
    samples: samples.map((sample) => ({ zoneId: sample.zone?.id ?? null, dryBulkDensityKgPerM3: sample.dryBulkDensityKgPerM3, totalNitrogenMgKg: sample.totalNitrogenMgKg, totalPhosphorusMgKg: sample.totalPhosphorusMgKg })),
    pumpedDryKg: pumpedKg,
    hauledDryKg: hauledKg,
  });
  return { ...result, hasFigures: figures.hasFigures };
}
