import type { ParsedSoundings } from "./parse-csv";

/**
 * Depths become elevations with the survey's water-surface elevation: the crew sounds downward
 * from the surface, so elevation = water-surface elevation − depth (all in the project's length
 * unit and vertical datum). A file that carries bottom elevations directly is used as it is, row
 * by row; depth fills in only where the elevation cell is empty.
 */
export function bottomElevations(
  soundings: Pick<ParsedSoundings, "depth" | "elevation">,
  waterSurfaceElevation: number,
): Float64Array {
  const count = soundings.depth.length;
  const elevation = new Float64Array(count);
  const given = soundings.elevation;
  for (let index = 0; index < count; index++) {
    const fromFile = given === null ? Number.NaN : given[index];
    elevation[index] = Number.isNaN(fromFile) ? waterSurfaceElevation - soundings.depth[index] : fromFile;
  }
  return elevation;
}

/**
 * Refusal (firm-sand) elevation from the probe: the probe rod is pushed through the muck until it
 * stops on firm sand, and its depth is read from the water surface, so refusal elevation =
 * water-surface elevation − probe depth. NaN where the row has no probe reading; null when the file
 * has no probe column at all.
 */
export function refusalElevations(
  soundings: Pick<ParsedSoundings, "probe">,
  waterSurfaceElevation: number,
): Float64Array | null {
  const probe = soundings.probe;
  if (probe === null) return null;
  const elevation = new Float64Array(probe.length);
  for (let index = 0; index < probe.length; index++) elevation[index] = waterSurfaceElevation - probe[index];
  return elevation;
}
