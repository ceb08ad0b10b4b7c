/**
 * What the removed muck held: its dry mass from the volume removed in place and the dry bulk
 * density a lab measured, and the nitrogen or phosphorus in that mass from its concentration on a
 * dry-weight basis (mg per kg dry).
 */

export function dryMassKg(volumeM3: number, dryBulkDensityKgPerM3: number): number {
  return volumeM3 * dryBulkDensityKgPerM3;
}

/** mass × mg/kg × 10⁻⁶ kg/mg. */
export function nutrientMassKg(dryMassKg: number, concentrationMgPerKg: number): number {
  return dryMassKg * concentrationMgPerKg * 1e-6;
}
