import type { LengthUnit } from "../units";

/**
 * A dive team's hoses and pumps, each with its name and diameter. Diameters follow the project's
 * length unit family, as the trade sizes them: inches on a feet project, millimetres on a metre
 * project. Each stored entry keeps the unit it was given in, so an entry still reads right after a
 * project's unit changes (allowed before the first survey); it is shown in the project's unit.
 */
export const DIAMETER_UNITS = ["in", "mm"] as const;
export type DiameterUnit = (typeof DIAMETER_UNITS)[number];

/** Millimetres in one inch, exact (the international inch: NIST SP 811 (2008) appendix B; the 1959 agreement). */
export const MILLIMETRES_PER_INCH = 25.4;

/** The diameter unit of a project's length unit family. */
export function diameterUnitFor(lengthUnit: LengthUnit): DiameterUnit {
  return lengthUnit === "m" ? "mm" : "in";
}

/** A diameter from one unit to the other (no rounding). */
export function convertDiameter(value: number, from: DiameterUnit, to: DiameterUnit): number {
  if (from === to) return value;
  return from === "in" ? value * MILLIMETRES_PER_INCH : value / MILLIMETRES_PER_INCH;
}

/**
 * The diameters accepted, per unit: 1 to 24 in, 25 to 610 mm (practice, a user-facing rule rather
 * than a published limit: the suction hoses divers guide run about 3 to 8 in and small dredge
 * pumps up to about 12 in; the range is wide enough for any pipe a diver team works, and narrow
 * enough that a diameter typed in the other unit, 150 for 6 in or 6 for 150 mm, is caught).
 */
export const DIAMETER_RANGE: Record<DiameterUnit, { min: number; max: number }> = {
  in: { min: 1, max: 24 },
  mm: { min: 25, max: 610 },
};

/**
 * One hose or pump as a team keeps it; `diameter` null when nobody has given it (teams from before
 * diameters). The stored JSON is checked against it where it is read (db/models/dive-team.ts); this
 * module stays free of the schema library, so the pages that describe equipment do not load it.
 */
export interface TeamEquipment {
  name: string;
  diameter: number | null;
  diameterUnit: DiameterUnit;
}

/** The entry with its diameter in `unit` (the project's), rounded to what a trade size is written with. */
export function equipmentIn(entry: TeamEquipment, unit: DiameterUnit): TeamEquipment {
  if (entry.diameter === null || entry.diameterUnit === unit) return { ...entry, diameterUnit: unit };
  const converted = convertDiameter(entry.diameter, entry.diameterUnit, unit);
  // Inches to two decimals (a 150 mm hose is 5.91 in), millimetres whole.
  const rounded = unit === "in" ? Math.round(converted * 100) / 100 : Math.round(converted);
  return { name: entry.name, diameter: rounded, diameterUnit: unit };
}

/** "Hose A (6 in)", or the name alone when no diameter is given. */
export function describeEquipment(entry: TeamEquipment): string {
  return entry.diameter === null ? entry.name : `${entry.name} (${formatDiameter(entry.diameter, entry.diameterUnit)})`;
}

/** "6 in", "150 mm", "5.91 in". */
export function formatDiameter(value: number, unit: DiameterUnit): string {
  return `${Number(value.toFixed(2)).toLocaleString("en-US")} ${unit}`;
}

/** Why `value` is not a plausible diameter in `unit`, or null when it is. */
export function diameterProblem(value: number, unit: DiameterUnit): string | null {
  const { min, max } = DIAMETER_RANGE[unit];
  if (value >= min && value <= max) return null;
  const other: DiameterUnit = unit === "in" ? "mm" : "in";
  const inOther = convertDiameter(value, other, unit);
  const hint = inOther >= min && inOther <= max ? ` Was it given in ${other === "in" ? "inches" : "millimetres"}? ${formatDiameter(value, other)} is ${formatDiameter(Math.round(inOther * 100) / 100, unit)}.` : "";
  return `must be from ${min} to ${max} ${unit} (this project gives diameters in ${unit === "in" ? "inches" : "millimetres"}).${hint}`;
}

/** The entry named `name` among `entries` described with its diameter, or the name as written when the team no longer has it. */
export function describeNamed(entries: readonly TeamEquipment[], name: string): string {
  const found = entries.find((entry) => entry.name.toLowerCase() === name.toLowerCase());
  return found ? describeEquipment({ ...found, name }) : name;
}

/** A team's hoses and pumps in one line for plans and sheets: "Hoses: Hose A (6 in), Hose B (6 in). Pumps: Pump 1 (6 in)." */
export function equipmentLine(hoses: readonly TeamEquipment[], pumps: readonly TeamEquipment[]): string {
  const list = (entries: readonly TeamEquipment[]) => (entries.length === 0 ? "none listed" : entries.map(describeEquipment).join(", "));
  return `Hoses: ${list(hoses)}. Pumps: ${list(pumps)}.`;
}
