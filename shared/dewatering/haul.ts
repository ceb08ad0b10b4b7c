import { slurryFromSolidsByWeight, WATER_DENSITY_KG_PER_M3 } from "./slurry";

/**
 * A haul ticket's dry solids: the load weighed on a scale (wet mass) or measured in the truck body
 * (volume), times the cake's solids by weight. A body volume becomes a wet mass through the cake's
 * density, taken as a saturated mixture of solids (Gs) and water: the same relation as the slurry's.
 */
export function haulDryMassKg(load: { wetMassKg: number } | { volumeM3: number }, cakeSolidsByWeight: number, solidsSpecificGravity: number): number {
  const wetMassKg = "wetMassKg" in load
    ? load.wetMassKg
    : load.volumeM3 * slurryFromSolidsByWeight(cakeSolidsByWeight, solidsSpecificGravity).specificGravity * WATER_DENSITY_KG_PER_M3;
  return wetMassKg * cakeSolidsByWeight;
}

/** What a ticket with no cake solids of its own is told when the project has no default to count it at. */
export const CAKE_SOLIDS_MISSING = "Give the load's cake solids: the project has no default cake solids yet.";

/**
 * The cake solids a ticket is counted at: its own sample's when given, else the project's default.
 * Null when there is neither: the ticket cannot be counted and is refused (CAKE_SOLIDS_MISSING).
 * The server applies it when it stores a ticket, the field page before it queues one.
 */
export function cakeSolidsInForce(sample: number | null | undefined, projectDefault: number | null | undefined): { cakeSolidsByWeight: number; fromSample: boolean } | null {
  if (sample != null) return { cakeSolidsByWeight: sample, fromSample: true };
  if (projectDefault != null) return { cakeSolidsByWeight: projectDefault, fromSample: false };
  return null;
}
