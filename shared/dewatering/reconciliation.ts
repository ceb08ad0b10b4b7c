import { cubicMetresPerVolumeUnit, kilogramsTo, massUnitsFor, measureLabel, unitLabel, volumeUnitFor, type BulkMassUnit, type LengthUnit, type MassUnit, type VolumeUnit } from "../units";
import { dryMassKg, nutrientMassKg } from "./nutrients";
import { ZONE_ATTRIBUTION_RULE, type ZoneAttribution } from "./zone-attribution";

/**
 * Surveyed, pumped and hauled solids side by side, and the nitrogen and phosphorus that left the
 * water body. The surveyed volume removed in place (the engine's figures, per zone) becomes a dry
 * mass through the dry bulk density the lab measured: a zone's own samples when it has any, else
 * the mean of all the project's samples. Pumped (shift logs) and hauled (tickets) solids are not
 * tied to zones: their share per zone is attributed by zone-attribution.ts's rule, and what it
 * cannot place is an "unattributed" row, so the zones' rows and that row add up to the project.
 */

export interface RemovedByZone {
  zoneId: number | null;
  name: string;
  /** Project volume unit (yd³ or m³). */
  removedVolume: number;
}

export interface SampleFigures {
  zoneId: number | null;
  dryBulkDensityKgPerM3: number;
  totalNitrogenMgKg: number;
  totalPhosphorusMgKg: number;
}

export interface Measure<Unit extends string> {
  value: number;
  unit: Unit;
  label: string;
}

export interface ReconciledZone {
  zoneId: number | null;
  name: string;
  surveyedRemoved: Measure<VolumeUnit>;
  /** Whose samples gave the density and concentrations: the zone's own, the project's mean, or none yet. */
  samplesFrom: "zone" | "project" | "none";
  sampleCount: number;
  dryMassFromSurveys: Measure<BulkMassUnit> | null;
  nitrogenRemoved: Measure<MassUnit> | null;
  phosphorusRemoved: Measure<MassUnit> | null;
  /** The zone's attributed share of the pumped and hauled dry solids (see `attribution`). */
  dryMassPumped: Measure<BulkMassUnit>;
  dryMassHauled: Measure<BulkMassUnit>;
  /** (attributed pumped − surveyed) ÷ surveyed × 100; null without a surveyed dry mass, or while no zone has pumped solids attributed. */
  pumpedVersusSurveyedPercent: number | null;
}

/** A period between two surveys: records dated after `from` up to and including `to` count in it. */
export interface ReconciledPeriod {
  from: string;
  to: string;
}

export interface Reconciliation {
  /** Null: from the baseline to the latest survey, with every shift and ticket. */
  period: ReconciledPeriod | null;
  zones: ReconciledZone[];
  /** Pumped and hauled solids the attribution could not place in a zone; with the zones' rows they add up to the project's. */
  unattributed: {
    dryMassPumped: Measure<BulkMassUnit>;
    dryMassHauled: Measure<BulkMassUnit>;
  };
  /** How pumped and hauled solids were shared among the zones, in words. */
  attribution: { rule: string };
  project: {
    surveyedRemoved: Measure<VolumeUnit>;
    dryMassFromSurveys: Measure<BulkMassUnit> | null;
    dryMassPumped: Measure<BulkMassUnit>;
    dryMassHauled: Measure<BulkMassUnit>;
    /** Pumped less hauled: what is still in the tubes or stockpiled (never below 0). */
    dryMassNotYetHauled: Measure<BulkMassUnit>;
    /** (pumped − surveyed) ÷ surveyed × 100; null without a surveyed dry mass. */
    pumpedVersusSurveyedPercent: number | null;
    hauledVersusSurveyedPercent: number | null;
    hauledVersusPumpedPercent: number | null;
    nitrogenRemoved: Measure<MassUnit> | null;
    phosphorusRemoved: Measure<MassUnit> | null;
    sampleCount: number;
  };
  assumptions: string[];
}

export interface Means {
  density: number;
  nitrogen: number;
  phosphorus: number;
  count: number;
}

function means(samples: ReadonlyArray<SampleFigures>): Means | null {
  if (samples.length === 0) return null;
  const mean = (pick: (sample: SampleFigures) => number) => samples.reduce((sum, sample) => sum + pick(sample), 0) / samples.length;
  return { density: mean((s) => s.dryBulkDensityKgPerM3), nitrogen: mean((s) => s.totalNitrogenMgKg), phosphorus: mean((s) => s.totalPhosphorusMgKg), count: samples.length };
}

/**
 * Whose samples stand for a zone: its own (their mean) when it has any, else the project's mean;
 * `used` is null while the project has no samples. One rule for the reconciliation and its charts.
 */
export function zoneSamples(samples: ReadonlyArray<SampleFigures>): (zoneId: number | null) => { own: Means | null; used: Means | null } {
  const projectMeans = means(samples);
  return (zoneId) => {
    const own = zoneId === null ? null : means(samples.filter((sample) => sample.zoneId === zoneId));
    return { own, used: own ?? projectMeans };
  };
}

function differencePercent(measured: number, reference: number | null): number | null {
  return reference === null || reference <= 0 ? null : ((measured - reference) / reference) * 100;
}

export function reconcileSolids(input: {
  lengthUnit: LengthUnit;
  zones: ReadonlyArray<RemovedByZone>;
  samples: ReadonlyArray<SampleFigures>;
  pumpedDryKg: number;
  hauledDryKg: number;
  /** The period the zones' volumes and the pumped and hauled masses were taken over; none for the whole project. */
  period?: ReconciledPeriod | null;
  /** The pumped and hauled solids shared among zones (zone-attribution.ts); none: all unattributed. */
  attribution?: ZoneAttribution | null;
}): Reconciliation {
  const period = input.period ?? null;
  const units = massUnitsFor(input.lengthUnit);
  const volumeUnit = volumeUnitFor(input.lengthUnit);
  const m3PerUnit = cubicMetresPerVolumeUnit(input.lengthUnit);
  const volume = (value: number): Measure<VolumeUnit> => ({ value, unit: volumeUnit, label: unitLabel(input.lengthUnit, "volume") });
  const bulk = (kg: number): Measure<BulkMassUnit> => ({ value: kilogramsTo(kg, units.bulkMass), unit: units.bulkMass, label: `dry ${measureLabel(units.bulkMass)}` });
  const mass = (kg: number): Measure<MassUnit> => ({ value: kilogramsTo(kg, units.mass), unit: units.mass, label: measureLabel(units.mass) });

  const projectMeans = means(input.samples);
  const samplesFor = zoneSamples(input.samples);
  let totalVolume = 0;
  let totalDryKg = 0;
  let totalNitrogenKg = 0;
  let totalPhosphorusKg = 0;
  // Attributed kilograms per zone row; a zone the attribution names that has no row here (a zone
  // drawn after the period, say) joins the unattributed, so the rows still add up.
  const rowIds = new Set(input.zones.map((zone) => zone.zoneId));
  let unattributedPumpedKg = input.attribution ? input.attribution.unattributedPumpedKg : input.pumpedDryKg;
  let unattributedHauledKg = input.attribution ? input.attribution.unattributedHauledKg : input.hauledDryKg;
  for (const [zoneId, kg] of input.attribution?.pumpedKgByZone ?? []) if (!rowIds.has(zoneId)) unattributedPumpedKg += kg;
  for (const [zoneId, kg] of input.attribution?.hauledKgByZone ?? []) if (!rowIds.has(zoneId)) unattributedHauledKg += kg;
  const anyAttributed = input.zones.some((zone) => (input.attribution?.pumpedKgByZone.get(zone.zoneId) ?? 0) > 0);
  const zones = input.zones.map((zone): ReconciledZone => {
    totalVolume += zone.removedVolume;
    const pumpedKg = input.attribution?.pumpedKgByZone.get(zone.zoneId) ?? 0;
    const attributed = { dryMassPumped: bulk(pumpedKg), dryMassHauled: bulk(input.attribution?.hauledKgByZone.get(zone.zoneId) ?? 0) };
    const { own, used } = samplesFor(zone.zoneId);
    if (!used) return { zoneId: zone.zoneId, name: zone.name, surveyedRemoved: volume(zone.removedVolume), samplesFrom: "none", sampleCount: 0, dryMassFromSurveys: null, nitrogenRemoved: null, phosphorusRemoved: null, ...attributed, pumpedVersusSurveyedPercent: null };
    const dryKg = dryMassKg(zone.removedVolume * m3PerUnit, used.density);
    const nitrogenKg = nutrientMassKg(dryKg, used.nitrogen);
    const phosphorusKg = nutrientMassKg(dryKg, used.phosphorus);
    totalDryKg += dryKg;
    totalNitrogenKg += nitrogenKg;
    totalPhosphorusKg += phosphorusKg;
    return {
      zoneId: zone.zoneId, name: zone.name, surveyedRemoved: volume(zone.removedVolume), samplesFrom: own ? "zone" : "project", sampleCount: used.count,
      dryMassFromSurveys: bulk(dryKg), nitrogenRemoved: mass(nitrogenKg), phosphorusRemoved: mass(phosphorusKg),
      // Only once the dive log places some solids: with none placed, "−100 %" in every zone would say nothing.
      ...attributed, pumpedVersusSurveyedPercent: anyAttributed ? differencePercent(kilogramsTo(pumpedKg, units.bulkMass), kilogramsTo(dryKg, units.bulkMass)) : null,
    };
  });
  const surveyedDryKg = projectMeans ? totalDryKg : null;
  const toBulk = (kg: number) => kilogramsTo(kg, units.bulkMass);
  return {
    period,
    zones,
    unattributed: { dryMassPumped: bulk(unattributedPumpedKg), dryMassHauled: bulk(unattributedHauledKg) },
    attribution: { rule: ZONE_ATTRIBUTION_RULE },
    project: {
      surveyedRemoved: volume(totalVolume),
      dryMassFromSurveys: surveyedDryKg === null ? null : bulk(surveyedDryKg),
      dryMassPumped: bulk(input.pumpedDryKg),
      dryMassHauled: bulk(input.hauledDryKg),
      dryMassNotYetHauled: bulk(Math.max(0, input.pumpedDryKg - input.hauledDryKg)),
      pumpedVersusSurveyedPercent: differencePercent(toBulk(input.pumpedDryKg), surveyedDryKg === null ? null : toBulk(surveyedDryKg)),
      hauledVersusSurveyedPercent: differencePercent(toBulk(input.hauledDryKg), surveyedDryKg === null ? null : toBulk(surveyedDryKg)),
      hauledVersusPumpedPercent: differencePercent(toBulk(input.hauledDryKg), toBulk(input.pumpedDryKg)),
      nitrogenRemoved: projectMeans ? mass(totalNitrogenKg) : null,
      phosphorusRemoved: projectMeans ? mass(totalPhosphorusKg) : null,
      sampleCount: input.samples.length,
    },
    assumptions: [
      period
        ? `Surveyed removal is the volume in place removed between the surveys of ${period.from} and ${period.to} (the pay period's figures), not the volume pumped or hauled; shifts and haul tickets dated after ${period.from} up to and including ${period.to} count in it.`
        : "Surveyed removal is the volume in place between the baseline and the latest surveys (the engine's figures), not the volume pumped or hauled.",
      "Dry mass from surveys = removed volume × dry bulk density of the muck in place, from a zone's own lab samples (their mean), or the mean of all the project's samples for a zone without any.",
      "Nitrogen and phosphorus removed = that dry mass × total N or total P (mg/kg dry weight), by the same samples.",
      "Pumped dry solids = slurry flow × slurry specific gravity × solids by weight × pump hours, from the shift logs (water at 1 g/cm³; the solids' specific gravity as logged).",
      "Hauled dry solids = each ticket's wet load × its cake solids (the project default when a ticket has none); a load measured in the truck body is weighed through a saturated cake of the project's solids specific gravity.",
      "Not yet hauled = pumped − hauled: solids still in the tubes or stockpiled.",
      ZONE_ATTRIBUTION_RULE,
      "Differences are (pumped or hauled − surveyed) ÷ surveyed. Solids still in tubes, fines lost with the decant water and bulking in the trucks make them differ; a difference is a question to look into, not an error.",
    ],
  };
}
