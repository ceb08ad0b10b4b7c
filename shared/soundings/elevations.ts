import type { ParsedSoundings } from "./parse-csv";

/**
 * Depth → elevation → refusal: the one rule the import, the command line and the tests use.
 *
 * The crew sounds downward from the water surface and reads the probe rod there too (DESIGN.md,
 * step 1), so, all in the project's length unit and vertical datum:
 *   bottom elevation  = water-surface elevation − depth
 *   refusal elevation = water-surface elevation − probe depth
 * A file that carries bottom elevations is used as it is, row by row; depth fills in only where the
 * elevation cell is empty. A file of elevations may come without a water-surface elevation: then
 * each row's own surface is its elevation + depth, so refusal = elevation − (probe − depth).
 *
 * A missing reading is NaN (never a guess): no bottom elevation without a file elevation or a depth
 * with a water surface; no refusal without a probe reading, or without a water surface or the
 * row's depth to imply one. A non-finite file elevation counts as missing.
 */
export type DepthReadings = Pick<ParsedSoundings, "depth" | "probe" | "elevation">;

export interface SoundingElevations {
  /** Bottom elevation per sounding; NaN where it cannot be known. */
  elevation: Float64Array;
  /** Refusal (firm-sand) elevation per sounding, NaN where the row has no probe reading; null when the file has no probe column. */
  refusalElevation: Float64Array | null;
}

export function soundingElevations(readings: DepthReadings, waterSurfaceElevation: number | null): SoundingElevations {
  const { depth, probe, elevation: given } = readings;
  const count = depth.length;
  const elevation = new Float64Array(count);
  const refusalElevation = probe ? new Float64Array(count) : null;
  const surface = waterSurfaceElevation ?? Number.NaN;
  for (let index = 0; index < count; index++) {
    const fromFile = given === null ? Number.NaN : given[index];
    elevation[index] = Number.isFinite(fromFile) ? fromFile : surface - depth[index];
    if (refusalElevation && probe) {
      refusalElevation[index] = waterSurfaceElevation !== null
        ? waterSurfaceElevation - probe[index]
        : elevation[index] - (probe[index] - depth[index]);
    }
  }
  return { elevation, refusalElevation };
}
