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
