import { cubicMetresPerVolumeUnit, kilogramsTo, massUnitsFor, type BulkMassUnit, type LengthUnit, type MassUnit } from "../units";
import { dryMassKg } from "./nutrients";
import { zoneSamples, type SampleFigures } from "./reconciliation";

/**
 * The series behind the dewatering charts: dry solids per day, polymer per dry ton per day, and
 * the cumulative dry solids by the surveys, the shift logs and the haul tickets. Masses come in as
 * kilograms (as stored) and go out in the project's units (short tons and pounds on a feet
 * project, tonnes and kilograms on a metre project).
 */

export interface ShiftSolids {
  date: string;
  /** Null when the shift logged no solids content. */
  drySolidsKg: number | null;
  /** Null when the shift dosed no polymer. */
  neatPolymerKg: number | null;
}

export interface HaulSolids {
  date: string;
  drySolidsKg: number;
}

export interface DewateringDay {
  date: string;
  shifts: number;
  /** Dry solids pumped that day, project bulk unit; null when no shift of the day logged solids. */
  drySolids: number | null;
  /**
   * Neat polymer per dry ton (project mass unit per bulk unit), from the shifts that logged both a
   * polymer and their solids: the day's polymer over the same shifts' solids, never a mean of ratios.
   */
  polymerPerDryTon: number | null;
  /** Its parts: the neat polymer (project mass unit) and the dry solids (bulk unit) of those shifts; null when no shift logged both. */
  polymerParts: { polymer: number; drySolids: number } | null;
}

/** One row per date with a shift, oldest first. */
export function dewateringDays(shifts: ReadonlyArray<ShiftSolids>, lengthUnit: LengthUnit): DewateringDay[] {
  const units = massUnitsFor(lengthUnit);
  const byDate = new Map<string, { shifts: number; solidsKg: number; hasSolids: boolean; dosedSolidsKg: number; polymerKg: number }>();
  for (const shift of shifts) {
    const day = byDate.get(shift.date) ?? { shifts: 0, solidsKg: 0, hasSolids: false, dosedSolidsKg: 0, polymerKg: 0 };
    day.shifts++;
    if (shift.drySolidsKg !== null) {
      day.solidsKg += shift.drySolidsKg;
      day.hasSolids = true;
      if (shift.neatPolymerKg !== null) {
        day.dosedSolidsKg += shift.drySolidsKg;
        day.polymerKg += shift.neatPolymerKg;
      }
    }
    byDate.set(shift.date, day);
  }
  return [...byDate.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([date, day]) => ({
      date,
      shifts: day.shifts,
      drySolids: day.hasSolids ? kilogramsTo(day.solidsKg, units.bulkMass) : null,
      polymerPerDryTon: day.dosedSolidsKg > 0 ? kilogramsTo(day.polymerKg, units.mass) / kilogramsTo(day.dosedSolidsKg, units.bulkMass) : null,
      polymerParts: day.dosedSolidsKg > 0 ? { polymer: kilogramsTo(day.polymerKg, units.mass), drySolids: kilogramsTo(day.dosedSolidsKg, units.bulkMass) } : null,
    }));
}

export interface SurveyedSeries {
  /** Survey dates, oldest first (the progress view's series). */
  dates: string[];
  /** Per zone (and the Unzoned row), cumulative removed volume in place by survey date, project volume unit. */
  zones: Array<{ zoneId: number | null; removedVolume: Array<number | null> }>;
}

export interface CumulativeSolids {
  /** Every date on which a survey, a shift or a haul fell, oldest first. */
  dates: string[];
  /** Dry solids removed according to the surveys; null before the first survey, or everywhere without lab samples. */
  surveyed: Array<number | null>;
  pumped: Array<number | null>;
  hauled: Array<number | null>;
  /** Whether a line has a record of its own on each date (a survey, a shift with solids, a haul), not a value held over. */
  own: { surveyed: boolean[]; pumped: boolean[]; hauled: boolean[] };
  unit: BulkMassUnit;
  massUnit: MassUnit;
  /** Why there is no surveyed line, when there is none. */
  surveyedMissing: "no-surveys" | "no-samples" | null;
}

/**
 * Cumulative dry solids by the three records on one date axis. Between its own dates a line holds
 * its last value (what was pumped by a date stays pumped); before its first date it is empty. The
 * surveyed line converts each zone's removed volume with the same samples the reconciliation uses,
 * so its last point equals the reconciliation's dry mass from surveys.
 */
export function cumulativeSolids(input: {
  lengthUnit: LengthUnit;
  surveyed: SurveyedSeries;
  samples: ReadonlyArray<SampleFigures>;
  shifts: ReadonlyArray<ShiftSolids>;
  hauls: ReadonlyArray<HaulSolids>;
}): CumulativeSolids {
  const units = massUnitsFor(input.lengthUnit);
  const m3PerUnit = cubicMetresPerVolumeUnit(input.lengthUnit);
  const samplesFor = zoneSamples(input.samples);
  const hasSamples = input.samples.length > 0;

  const surveyedKgByDate = new Map<string, number>();
  if (hasSamples) {
    const lastVolume = input.surveyed.zones.map(() => 0);
    input.surveyed.dates.forEach((date, index) => {
      let kg = 0;
      input.surveyed.zones.forEach((zone, zoneIndex) => {
        const value = zone.removedVolume[index];
        if (value !== null && value !== undefined) lastVolume[zoneIndex] = value;
        kg += dryMassKg(lastVolume[zoneIndex] * m3PerUnit, samplesFor(zone.zoneId).used!.density);
      });
      surveyedKgByDate.set(date, kg);
    });
  }
  const pumpedKgByDate = new Map<string, number>();
  for (const shift of input.shifts) if (shift.drySolidsKg !== null) pumpedKgByDate.set(shift.date, (pumpedKgByDate.get(shift.date) ?? 0) + shift.drySolidsKg);
  const hauledKgByDate = new Map<string, number>();
  for (const haul of input.hauls) hauledKgByDate.set(haul.date, (hauledKgByDate.get(haul.date) ?? 0) + haul.drySolidsKg);

  const dates = [...new Set([...input.surveyed.dates, ...pumpedKgByDate.keys(), ...hauledKgByDate.keys()])].sort();
  const toBulk = (kg: number) => kilogramsTo(kg, units.bulkMass);
  /** Surveys give a running total at each date; shifts and hauls give amounts to add up. */
  const line = (byDate: Map<string, number>, running: boolean): Array<number | null> => {
    let total: number | null = null;
    return dates.map((date) => {
      const value = byDate.get(date);
      if (value !== undefined) total = running ? value : (total ?? 0) + value;
      return total === null ? null : toBulk(total);
    });
  };
  return {
    dates,
    surveyed: line(surveyedKgByDate, true),
    pumped: line(pumpedKgByDate, false),
    hauled: line(hauledKgByDate, false),
    own: { surveyed: dates.map((date) => surveyedKgByDate.has(date)), pumped: dates.map((date) => pumpedKgByDate.has(date)), hauled: dates.map((date) => hauledKgByDate.has(date)) },
    unit: units.bulkMass,
    massUnit: units.mass,
    surveyedMissing: input.surveyed.dates.length === 0 ? "no-surveys" : hasSamples ? null : "no-samples",
  };
}
