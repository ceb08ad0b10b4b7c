import {
  cubicMetresPerHourFrom, kilogramsTo, litresPerHourTo, massUnitsFor, measureLabel,
  type BulkMassUnit, type FlowUnit, type LengthUnit, type LiquidRateUnit, type MassUnit,
} from "../units";
import { polymerFeed } from "./polymer-feed";
import { drySolidsRateKgPerH, slurryFromSolidsByWeight, slurryFromSpecificGravity, type SlurryComposition } from "./slurry";
import { minutesOfClock } from "../local-time";

/**
 * A dewatering shift's figures, as the shift log shows them at once and the API answers them:
 * stock feed rate, neat polymer, slurry composition, dry solids and polymer per dry ton, each in
 * the project's units with its formula beside it. The same function runs in the browser (as the
 * operator types) and on the server (what is stored and answered), so the two cannot differ.
 */

/** A flow meter's totaliser read at the start and the end of the shift. */
export interface TotaliserReadings {
  start: number;
  end: number;
  unit: "gal" | "m3";
}

/** The mean slurry flow over the pumping time from the totaliser: gallons → gpm, m³ → m³/h. */
export function flowFromTotaliser(readings: TotaliserReadings, pumpHours: number): { value: number; unit: FlowUnit } {
  const volume = readings.end - readings.start;
  return readings.unit === "gal" ? { value: volume / (pumpHours * 60), unit: "gpm" } : { value: volume / pumpHours, unit: "m3/h" };
}

export interface ShiftMeasurements {
  slurryFlow: { value: number; unit: FlowUnit };
  /** Pumping time of the shift, hours. */
  pumpHours: number;
  /** One of the two: solids by weight (0–1) or the slurry's specific gravity. */
  solidsByWeight?: number | null;
  slurrySpecificGravity?: number | null;
  solidsSpecificGravity: number;
  polymer?: { doseMgPerL: number; stockPercent: number } | null;
}

/** A logged shift as its form or the API gives it (the shift log's input). */
export interface LoggedShift {
  start: string;
  end: string;
  pumpHours?: number | null;
  slurryFlow?: { value: number; unit: FlowUnit } | null;
  totaliser?: TotaliserReadings | null;
  solidsByWeight?: number | null;
  slurrySpecificGravity?: number | null;
  solidsSpecificGravity?: number | null;
  polymer?: { doseMgPerL: number; stockPercent: number } | null;
}

/**
 * What the figures take from a logged shift: the pump hours are the whole shift when not given, a
 * totaliser gives the mean flow over them, the solids' specific gravity is the project's when the
 * shift names none. The server stores a shift's figures from this and the field page shows them
 * from it, so the two agree. Null when the shift has no positive span or no flow.
 */
export function shiftMeasurementsOf(shift: LoggedShift, projectSolidsSpecificGravity: number): ShiftMeasurements | null {
  const pumpHours = shift.pumpHours ?? (minutesOfClock(shift.end) - minutesOfClock(shift.start)) / 60;
  if (!(pumpHours > 0)) return null;
  const slurryFlow = shift.slurryFlow ?? (shift.totaliser ? flowFromTotaliser(shift.totaliser, pumpHours) : null);
  if (!slurryFlow || !(slurryFlow.value > 0)) return null;
  return {
    slurryFlow, pumpHours, solidsByWeight: shift.solidsByWeight, slurrySpecificGravity: shift.slurrySpecificGravity,
    solidsSpecificGravity: shift.solidsSpecificGravity ?? projectSolidsSpecificGravity, polymer: shift.polymer,
  };
}

export interface Quantity<Unit extends string = string> {
  value: number;
  unit: Unit;
  /** The unit as shown. */
  label: string;
  /** The formula in words and symbols, for the figure's side. */
  formula: string;
}

export interface ShiftFigures {
  stockFeedRate: Quantity<LiquidRateUnit> | null;
  neatPolymer: Quantity<MassUnit> | null;
  neatPolymerForShift: Quantity<MassUnit> | null;
  slurrySpecificGravity: number | null;
  solidsByWeight: number | null;
  solidsByVolume: number | null;
  drySolidsRate: Quantity<BulkMassUnit> | null;
  drySolids: Quantity<BulkMassUnit> | null;
  polymerPerDryTon: Quantity<`${MassUnit}/${BulkMassUnit}`> | null;
  /** Dry solids in kilograms, for the totals that are kept in SI. */
  drySolidsKg: number | null;
  neatPolymerForShiftKg: number | null;
  slurryFormula: string | null;
}

function slurryOf(measured: ShiftMeasurements): SlurryComposition | null {
  const gs = measured.solidsSpecificGravity;
  if (measured.solidsByWeight != null) return slurryFromSolidsByWeight(measured.solidsByWeight, gs);
  if (measured.slurrySpecificGravity != null) return slurryFromSpecificGravity(measured.slurrySpecificGravity, gs);
  return null;
}

export function computeShiftFigures(measured: ShiftMeasurements, lengthUnit: LengthUnit): ShiftFigures {
  const units = massUnitsFor(lengthUnit);
  const flowM3PerH = cubicMetresPerHourFrom(measured.slurryFlow.value, measured.slurryFlow.unit);
  const flowLabel = measureLabel(measured.slurryFlow.unit);
  const quantity = <Unit extends string>(value: number, unit: Unit, label: string, formula: string): Quantity<Unit> => ({ value, unit, label, formula });
  const massLabel = measureLabel(units.mass);
  const bulkLabel = measureLabel(units.bulkMass);

  const feed = measured.polymer ? polymerFeed(flowM3PerH, measured.polymer.doseMgPerL, measured.polymer.stockPercent) : null;
  const slurry = slurryOf(measured);
  const drySolidsKgPerH = slurry ? drySolidsRateKgPerH(flowM3PerH, slurry) : null;
  const drySolidsKg = drySolidsKgPerH === null ? null : drySolidsKgPerH * measured.pumpHours;
  const neatForShiftKg = feed ? feed.neatPolymerKgPerH * measured.pumpHours : null;

  return {
    stockFeedRate: feed
      ? quantity(litresPerHourTo(feed.stockSolutionLPerH, units.liquidRate), units.liquidRate, measureLabel(units.liquidRate), `slurry flow (${flowLabel}) × dose (mg/L) ÷ stock concentration (% w/v × 10 g/L)`)
      : null,
    neatPolymer: feed ? quantity(kilogramsTo(feed.neatPolymerKgPerH, units.mass), units.mass, `${massLabel}/h`, "slurry flow × dose (1 mg/L = 1 g per m³)") : null,
    neatPolymerForShift: neatForShiftKg === null ? null : quantity(kilogramsTo(neatForShiftKg, units.mass), units.mass, massLabel, "neat polymer per hour × pump hours"),
    slurrySpecificGravity: slurry?.specificGravity ?? null,
    solidsByWeight: slurry?.solidsByWeight ?? null,
    solidsByVolume: slurry?.solidsByVolume ?? null,
    slurryFormula: slurry === null ? null
      : measured.solidsByWeight != null
        ? "SG = 1 ÷ (Cw ÷ Gs + 1 − Cw); Cv = Cw × SG ÷ Gs"
        : "Cv = (SG − 1) ÷ (Gs − 1); Cw = Cv × Gs ÷ SG",
    drySolidsRate: drySolidsKgPerH === null ? null
      : quantity(kilogramsTo(drySolidsKgPerH, units.bulkMass), units.bulkMass, `dry ${bulkLabel}/h`, "slurry flow × SG × Cw (water at 1 g/cm³)"),
    drySolids: drySolidsKg === null ? null : quantity(kilogramsTo(drySolidsKg, units.bulkMass), units.bulkMass, `dry ${bulkLabel}`, "dry solids rate × pump hours"),
    polymerPerDryTon: feed && drySolidsKgPerH
      ? quantity(
          kilogramsTo(feed.neatPolymerKgPerH, units.mass) / kilogramsTo(drySolidsKgPerH, units.bulkMass),
          `${units.mass}/${units.bulkMass}` as const,
          `${massLabel} per dry ${units.bulkMass === "t" ? "tonne" : "short ton"}`,
          "neat polymer per hour ÷ dry solids rate",
        )
      : null,
    drySolidsKg,
    neatPolymerForShiftKg: neatForShiftKg,
  };
}
