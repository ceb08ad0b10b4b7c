import type { Bounds } from "../grid/work-limit";
import { FEET_PER_METRE } from "../units";
import { countFinite, finiteValues } from "../typed/finite";

/**
 * Finds the usual coordinate mistakes before anything is stored: a longitude/latitude file
 * declared as a projected CRS, metres declared as feet (or feet as metres: the numbers are off by
 * 3.2808, the feet in a metre), and soundings nowhere near the work limit. Pure: medians of the
 * coordinates and the work limit's bounds (both in project coordinates) in, a plain message out.
 */

export interface CoordinateCheckInput {
  /** Coordinates as written in the file. */
  fileEasting: Float64Array;
  fileNorthing: Float64Array;
  /** The same soundings converted into the project's CRS with the CRS the technician chose. */
  projectEasting: Float64Array;
  projectNorthing: Float64Array;
  declaredCrs: string;
  declaredIsGeographic: boolean;
  /** Work limit bounds in project coordinates. */
  workLimit: Bounds;
  projectUnitWord: string;
}

export interface CoordinateMistake {
  kind: "lon-lat-as-projected" | "not-degrees" | "metres-as-feet" | "feet-as-metres" | "far-from-work-limit";
  message: string;
}

function median(values: Float64Array): number {
  const finite = countFinite(values);
  if (finite === 0) return Number.NaN;
  // A sample of 2,001 values is plenty for a median used to spot a mistake: every step-th finite
  // value, taken straight from the column (a copy of a 1,000,000-row column as a list, twice
  // filtered, was the import's largest allocation).
  const sample = finiteValues(values, Math.max(1, Math.floor(finite / 2001)), finite).sort();
  return sample[Math.floor(sample.length / 2)];
}

/** Distance from a point to a box (0 inside). */
function distanceToBounds(bounds: Bounds, x: number, y: number): number {
  const dx = Math.max(bounds.minX - x, 0, x - bounds.maxX);
  const dy = Math.max(bounds.minY - y, 0, y - bounds.maxY);
  return Math.hypot(dx, dy);
}

export function findCoordinateMistake(input: CoordinateCheckInput): CoordinateMistake | null {
  const fileE = median(input.fileEasting);
  const fileN = median(input.fileNorthing);
  if (!Number.isFinite(fileE) || !Number.isFinite(fileN)) return null;
  const looksLikeDegrees = Math.abs(fileE) <= 180 && Math.abs(fileN) <= 90;
  if (!input.declaredIsGeographic && looksLikeDegrees) {
    return {
      kind: "lon-lat-as-projected",
      message:
        `The coordinates look like longitude and latitude in degrees (typical easting ${fileE.toFixed(5)}, northing ${fileN.toFixed(5)}), ` +
        `but the file was declared as ${input.declaredCrs}, a projected system. Choose EPSG:4326 (WGS 84 longitude/latitude) as the file's CRS.`,
    };
  }
  if (input.declaredIsGeographic && !looksLikeDegrees) {
    return {
      kind: "not-degrees",
      message: `The file was declared as longitude/latitude (${input.declaredCrs}), but its coordinates (typical ${fileE.toFixed(2)}, ${fileN.toFixed(2)}) are not degrees. Choose the projected CRS the crew used.`,
    };
  }
  const bounds = input.workLimit;
  const extent = Math.max(bounds.maxX - bounds.minX, bounds.maxY - bounds.minY);
  // Far means farther than the work limit is wide, and at least 1,000 project units.
  const farAway = Math.max(extent, 1000);
  const projectE = median(input.projectEasting);
  const projectN = median(input.projectNorthing);
  const distance = distanceToBounds(bounds, projectE, projectN);
  if (!(distance > farAway)) return null;
  if (distanceToBounds(bounds, projectE * FEET_PER_METRE, projectN * FEET_PER_METRE) <= extent) {
    return {
      kind: "metres-as-feet",
      message:
        `The coordinates look like metres, but ${input.declaredCrs} is in feet: multiplied by 3.2808 (feet per metre) they fall on the work limit. ` +
        "Choose the metre version of the coordinate system for this file.",
    };
  }
  if (distanceToBounds(bounds, projectE / FEET_PER_METRE, projectN / FEET_PER_METRE) <= extent) {
    return {
      kind: "feet-as-metres",
      message:
        `The coordinates look like feet, but ${input.declaredCrs} is in metres: divided by 3.2808 (feet per metre) they fall on the work limit. ` +
        "Choose the feet version of the coordinate system for this file.",
    };
  }
  return {
    kind: "far-from-work-limit",
    message: `The soundings lie about ${Math.round(distance).toLocaleString("en-US")} ${input.projectUnitWord} from the work limit. Check the coordinate system chosen for the file (${input.declaredCrs}).`,
  };
}
