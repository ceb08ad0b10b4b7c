import { z } from "zod";

/**
 * Length units a Firmsand project can work in. A project's coordinates, depths, thicknesses and
 * raster spacing all share one length unit; areas and volumes follow from it.
 * - "us-ft": US survey foot, 1200/3937 m (NIST, 85 FR 62698 (2020); retired for new work after
 *   2022 but still the unit of many state plane zones and existing surveys).
 * - "ft": international foot, 0.3048 m exactly (NIST SP 811).
 * - "m": metre.
 */
export type LengthUnit = "us-ft" | "ft" | "m";

export const lengthUnitSchema = z.enum(["us-ft", "ft", "m"]);

export type VolumeUnit = "yd3" | "m3";

/** One international foot in metres, exact: NIST SP 811 (2008) appendix B; the 1959 international yard and pound agreement. */
export const METRES_PER_FOOT = 0.3048;
/** One US survey foot in metres, exact: 1200/3937 m (NIST, 85 FR 62698 (2020), which retired it for new work after 2022). */
export const METRES_PER_US_SURVEY_FOOT = 1200 / 3937;
/** International feet in a metre, 3.280 839 9… */
export const FEET_PER_METRE = 1 / METRES_PER_FOOT;

/** Metres in one unit, exactly as NIST defines them (NIST SP 811; 85 FR 62698). */
export const METRES_PER_UNIT: Record<LengthUnit, number> = {
  "us-ft": METRES_PER_US_SURVEY_FOOT,
  ft: METRES_PER_FOOT,
  m: 1,
};

/** Feet-based projects report cubic yards (the unit of dredging contracts in the US); metre projects cubic metres. */
export function volumeUnitFor(unit: LengthUnit): VolumeUnit {
  return unit === "m" ? "m3" : "yd3";
}

/**
 * Volumes come in two units, told apart by name: the engine integrates in the cube of the
 * project's length unit (ft³ of the project's foot, or m³), and those names end in `CubicLength`
 * (`removedVolumeCubicLength`); what is stored, reported and shown is in the project's volume unit
 * (yd³ or m³), under the plain name (`removedVolume`). This function is the one step between them.
 *
 * Converts a volume measured in cubic project units (ft³ or m³) to the project's volume unit.
 * A cubic yard is 27 cubic feet of the same foot: a yard is three feet by definition whichever
 * foot the project uses, so a US-survey-foot project divides its (survey) ft³ by 27 and gets
 * (survey) cubic yards. The two feet differ by 2 ppm, i.e. 6 ppm in volume — far below survey
 * noise, and keeping the project's own foot means quantities never silently mix feet.
 * Metre projects are already in m³.
 */
export function cubicToVolumeUnit(volumeCubicLength: number, unit: LengthUnit): number {
  return unit === "m" ? volumeCubicLength : volumeCubicLength / 27;
}

export interface UnitDefaults {
  /** Cell side of the progress grid. */
  cellSize: number;
  /** Raster spacing the surfaces are sampled at. */
  resolution: number;
  /** Remaining thickness still counted as "at firm sand". */
  tolerance: number;
  /** Longest triangle edge kept when building a surface (longer edges span data gaps). */
  maxEdge: number;
}

/**
 * Project defaults in the project's own unit. The tolerance of 0.25 ft matches the 95 % depth
 * accuracy for mechanical (probe) dredging-support surveys in USACE EM 1110-2-1003 (2002) table
 * 3-1; 0.08 m is its metric counterpart. Cell, raster and edge sizes are practice.
 */
export function defaultsFor(unit: LengthUnit): UnitDefaults {
  if (unit === "m") return { cellSize: 5, resolution: 0.25, tolerance: 0.08, maxEdge: 15 };
  return { cellSize: 20, resolution: 1, tolerance: 0.25, maxEdge: 50 };
}

export function convertLength(value: number, from: LengthUnit, to: LengthUnit): number {
  if (from === to) return value;
  return (value * METRES_PER_UNIT[from]) / METRES_PER_UNIT[to];
}

/** Square metres in one square unit. */
function squareMetresPerSquareUnit(unit: LengthUnit): number {
  return METRES_PER_UNIT[unit] * METRES_PER_UNIT[unit];
}

/** Square feet in an acre (international foot; NIST). */
const SQUARE_FEET_PER_ACRE = 43_560;
/** Square metres in an acre: 43,560 × 0.3048² = 4,046.8564224 (NIST). */
export const SQUARE_METRES_PER_ACRE = SQUARE_FEET_PER_ACRE * 0.3048 * 0.3048;

/** Area in square project units from acres. */
export function areaFromAcres(acres: number, unit: LengthUnit): number {
  return (acres * SQUARE_METRES_PER_ACRE) / squareMetresPerSquareUnit(unit);
}

/**
 * One short and one long label per unit, used for every figure, heading, picker and export: the
 * short one is EPSG's abbreviation (as in "NAD83 / Florida West (ftUS)"), the long one tells the two
 * feet apart. No other spelling ("us-ft", "US feet", a bare "ft" for survey feet) is shown.
 */
const LENGTH_LABELS: Record<LengthUnit, { short: string; long: string }> = {
  "us-ft": { short: "ftUS", long: "US survey feet" },
  ft: { short: "ft", long: "international feet" },
  m: { short: "m", long: "metres" },
};
const VOLUME_NAMES: Record<VolumeUnit, string> = { yd3: "cubic yards", m3: "cubic metres" };

const AREA_LABELS: Record<LengthUnit, string> = { "us-ft": "ft²", ft: "ft²", m: "m²" };
const VOLUME_LABELS: Record<VolumeUnit, string> = { yd3: "yd³", m3: "m³" };

/** Labels for display: `unitLabel("us-ft")` → "ftUS"; `unitLabel("m", "volume")` → "m³". The one unit-label function. */
export function unitLabel(
  unit: LengthUnit,
  kind: "length" | "length-long" | "area" | "volume" | "volume-long" = "length",
): string {
  switch (kind) {
    case "length":
      return LENGTH_LABELS[unit].short;
    case "length-long":
      return LENGTH_LABELS[unit].long;
    case "area":
      return AREA_LABELS[unit];
    case "volume":
      return VOLUME_LABELS[volumeUnitFor(unit)];
    case "volume-long":
      return VOLUME_NAMES[volumeUnitFor(unit)];
  }
}

/**
 * Masses and flows for the dewatering records. Feet projects weigh in short tons and pounds (the
 * units of US scale tickets and feed worksheets), metre projects in tonnes and kilograms; the
 * computation runs in SI and converts once, here.
 */
export type MassUnit = "lb" | "kg";
export type BulkMassUnit = "short-ton" | "t";
export type FlowUnit = "gpm" | "m3/h";
export type LiquidRateUnit = "gal/h" | "L/h";
export type DensityUnit = "lb/ft3" | "kg/m3" | "g/cm3";

/** One pound in kilograms, exact: NIST SP 811 (the 1959 international yard and pound agreement). */
export const KILOGRAMS_PER_POUND = 0.45359237;
/** One short ton (2,000 lb) in kilograms: NIST SP 811. */
export const KILOGRAMS_PER_SHORT_TON = 2000 * KILOGRAMS_PER_POUND;
/** One US gallon (231 in³) in litres, exact: NIST SP 811. */
export const LITRES_PER_US_GALLON = 3.785411784;

export const flowUnitSchema = z.enum(["gpm", "m3/h"]);
export const densityUnitSchema = z.enum(["lb/ft3", "kg/m3", "g/cm3"]);

export function massUnitsFor(unit: LengthUnit): { mass: MassUnit; bulkMass: BulkMassUnit; liquidRate: LiquidRateUnit; flow: FlowUnit; density: DensityUnit } {
  return unit === "m"
    ? { mass: "kg", bulkMass: "t", liquidRate: "L/h", flow: "m3/h", density: "kg/m3" }
    : { mass: "lb", bulkMass: "short-ton", liquidRate: "gal/h", flow: "gpm", density: "lb/ft3" };
}

export function kilogramsTo(massKg: number, unit: MassUnit | BulkMassUnit): number {
  switch (unit) {
    case "kg": return massKg;
    case "t": return massKg / 1000;
    case "lb": return massKg / KILOGRAMS_PER_POUND;
    case "short-ton": return massKg / KILOGRAMS_PER_SHORT_TON;
  }
}

export function kilogramsFrom(mass: number, unit: MassUnit | BulkMassUnit): number {
  return mass / kilogramsTo(1, unit);
}

/** Cubic metres per hour from a slurry flow in either unit (a US gallon per minute is 60 × 3.785411784 L/h). */
export function cubicMetresPerHourFrom(flow: number, unit: FlowUnit): number {
  return unit === "m3/h" ? flow : (flow * 60 * LITRES_PER_US_GALLON) / 1000;
}

export function cubicMetresPerHourTo(flowM3PerH: number, unit: FlowUnit): number {
  return flowM3PerH / cubicMetresPerHourFrom(1, unit);
}

export function litresPerHourTo(rateLPerH: number, unit: LiquidRateUnit): number {
  return unit === "L/h" ? rateLPerH : rateLPerH / LITRES_PER_US_GALLON;
}

/** kg/m³ from a density in any of the units a lab reports (1 lb/ft³ = 0.45359237 / 0.3048³ kg/m³, NIST). */
export function kilogramsPerCubicMetreFrom(density: number, unit: DensityUnit): number {
  if (unit === "kg/m3") return density;
  if (unit === "g/cm3") return density * 1000;
  return (density * KILOGRAMS_PER_POUND) / METRES_PER_FOOT ** 3;
}

export function kilogramsPerCubicMetreTo(densityKgPerM3: number, unit: DensityUnit): number {
  return densityKgPerM3 / kilogramsPerCubicMetreFrom(1, unit);
}

/** Cubic metres in one of the project's volume units: a cubic yard of its own foot (27 ft³), or a cubic metre. */
export function cubicMetresPerVolumeUnit(unit: LengthUnit): number {
  return unit === "m" ? 1 : (3 * METRES_PER_UNIT[unit]) ** 3;
}

/**
 * Debris removed by hand (a diver's basket, a bucket on the barge) is measured in the vessel it
 * fills: US gallons or cubic feet on feet projects, litres or cubic metres on metre projects. Any
 * of the four is taken as entered and kept so; totals are added in litres and shown in the
 * project's hand-volume unit (gallons or litres).
 */
export const HAND_VOLUME_UNITS = ["gal", "ft3", "L", "m3"] as const;
export type HandVolumeUnit = (typeof HAND_VOLUME_UNITS)[number];
export const handVolumeUnitSchema = z.enum(HAND_VOLUME_UNITS);

/** Litres in one unit: a US gallon is 3.785411784 L and a cubic foot 0.3048³ m³ = 28.316846592 L, both exact (NIST SP 811). */
const LITRES_PER_HAND_UNIT: Record<HandVolumeUnit, number> = {
  gal: LITRES_PER_US_GALLON,
  // A vessel's cubic foot is the international foot's: the 2 ppm of the survey foot is far below any basket's measure.
  ft3: METRES_PER_FOOT ** 3 * 1000,
  L: 1,
  m3: 1000,
};

export function litresFrom(volume: number, unit: HandVolumeUnit): number {
  return volume * LITRES_PER_HAND_UNIT[unit];
}

export function litresTo(litres: number, unit: HandVolumeUnit): number {
  return litres / LITRES_PER_HAND_UNIT[unit];
}

/** The unit a project's hand-measured volumes are added up in: US gallons on feet projects, litres on metre projects. */
export function handVolumeUnitFor(unit: LengthUnit): "gal" | "L" {
  return unit === "m" ? "L" : "gal";
}

/** The units a form offers for a hand-measured volume, the project's own first. */
export function handVolumeUnitsFor(unit: LengthUnit): HandVolumeUnit[] {
  return unit === "m" ? ["L", "m3", "gal", "ft3"] : ["gal", "ft3", "L", "m3"];
}

const MASS_LABELS: Record<MassUnit | BulkMassUnit, string> = { lb: "lb", kg: "kg", "short-ton": "short tons", t: "t" };
const RATE_LABELS: Record<FlowUnit | LiquidRateUnit | DensityUnit | HandVolumeUnit, string> = {
  gpm: "gpm", "m3/h": "m³/h", "gal/h": "gal/h", "L/h": "L/h", "lb/ft3": "lb/ft³", "kg/m3": "kg/m³", "g/cm3": "g/cm³",
  gal: "gal", ft3: "ft³", L: "L", m3: "m³",
};

/** Labels for the dewatering and hand-volume units: `measureLabel("short-ton")` → "short tons", `measureLabel("m3/h")` → "m³/h", `measureLabel("ft3")` → "ft³". */
export function measureLabel(unit: MassUnit | BulkMassUnit | FlowUnit | LiquidRateUnit | DensityUnit | HandVolumeUnit): string {
  return unit in MASS_LABELS ? MASS_LABELS[unit as MassUnit] : RATE_LABELS[unit as FlowUnit];
}
