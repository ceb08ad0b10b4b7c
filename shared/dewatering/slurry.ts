/**
 * Slurry arithmetic for the dewatering shift log: the mixture's specific gravity and solids by
 * volume from the solids by weight (or the reverse, from a density meter or a mud balance), and the
 * dry solids carried per hour. Water is taken at 1 g/cm³ (1,000 kg/m³), as the trade's slurry
 * tables do; the solids' specific gravity Gs is a project setting (organic muck is far lighter than
 * mineral sand, 2.65 being the usual figure for quartz sediment only).
 */

/** Water at 1 g/cm³, the reference of every specific gravity here. */
export const WATER_DENSITY_KG_PER_M3 = 1000;

export interface SlurryComposition {
  /** Mixture specific gravity Sm (water = 1). */
  specificGravity: number;
  /** Solids share by weight Cw, 0–1. */
  solidsByWeight: number;
  /** Solids share by volume Cv, 0–1. */
  solidsByVolume: number;
}

/** From Cw and Gs: Sm = 1 / (Cw/Gs + 1 − Cw), Cv = Cw·Sm/Gs (the mass balance of solids and water). */
export function slurryFromSolidsByWeight(solidsByWeight: number, solidsSpecificGravity: number): SlurryComposition {
  const specificGravity = 1 / (solidsByWeight / solidsSpecificGravity + 1 - solidsByWeight);
  return { specificGravity, solidsByWeight, solidsByVolume: (solidsByWeight * specificGravity) / solidsSpecificGravity };
}

/** From a measured Sm and Gs: Cv = (Sm − 1)/(Gs − 1), Cw = Cv·Gs/Sm (USACE slurry formulas). */
export function slurryFromSpecificGravity(specificGravity: number, solidsSpecificGravity: number): SlurryComposition {
  const solidsByVolume = (specificGravity - 1) / (solidsSpecificGravity - 1);
  return { specificGravity, solidsByVolume, solidsByWeight: (solidsByVolume * solidsSpecificGravity) / specificGravity };
}

/** Dry solids carried, kg/h: flow × Sm × ρw × Cw. */
export function drySolidsRateKgPerH(slurryFlowM3PerH: number, slurry: SlurryComposition): number {
  return slurryFlowM3PerH * slurry.specificGravity * WATER_DENSITY_KG_PER_M3 * slurry.solidsByWeight;
}
