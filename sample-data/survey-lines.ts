/**
 * Where a crew takes soundings: planned lines of constant easting (across the run, which flows
 * east-south-east) every 5 ft, plus tie lines of constant northing every 50 ft, a sounding every
 * 2 ft along each line, with the rod's positioning wander. Lines are walked back and forth.
 * Coordinates are projected feet; rings are closed [easting, northing] lists.
 */
import type { Random } from "./prng";

export const MAIN_LINE_SPACING_FT = 5;
export const TIE_LINE_SPACING_FT = 50;
export const ALONG_LINE_STEP_FT = 2;
/** Soundings stay at least this far inside the area a pass covers, so wander never leaves it. */
const INSET_FT = 0.5;

export type Ring = [number, number][];

export function pointInRing(easting: number, northing: number, ring: Ring): boolean {
  let inside = false;
  for (let index = 0, previous = ring.length - 1; index < ring.length; previous = index++) {
    const [xi, yi] = ring[index];
    const [xj, yj] = ring[previous];
    if (yi > northing !== yj > northing && easting < ((xj - xi) * (northing - yi)) / (yj - yi) + xi) {
      inside = !inside;
    }
  }
  return inside;
}

export function distanceToRingFt(easting: number, northing: number, ring: Ring): number {
  let best = Infinity;
  for (let index = 0; index + 1 < ring.length; index++) {
    const [x0, y0] = ring[index];
    const [x1, y1] = ring[index + 1];
    const dx = x1 - x0;
    const dy = y1 - y0;
    const share = Math.max(0, Math.min(1, ((easting - x0) * dx + (northing - y0) * dy) / (dx * dx + dy * dy)));
    best = Math.min(best, Math.hypot(easting - (x0 + share * dx), northing - (y0 + share * dy)));
  }
  return best;
}

export interface PlannedSounding {
  easting: number;
  northing: number;
  /** First sounding of a new line (the crew turns, so more time passes). */
  startsLine: boolean;
}

/** Soundings of one pass over the area `rings` covers (any of them), lines keyed to the grid origin. */
export function planSoundings(
  rings: Ring[],
  origin: { easting: number; northing: number },
  random: Random,
): PlannedSounding[] {
  let minEasting = Infinity;
  let maxEasting = -Infinity;
  let minNorthing = Infinity;
  let maxNorthing = -Infinity;
  for (const ring of rings) {
    for (const [easting, northing] of ring) {
      minEasting = Math.min(minEasting, easting);
      maxEasting = Math.max(maxEasting, easting);
      minNorthing = Math.min(minNorthing, northing);
      maxNorthing = Math.max(maxNorthing, northing);
    }
  }
  const keep = (easting: number, northing: number) =>
    rings.some(
      (ring) => pointInRing(easting, northing, ring) && distanceToRingFt(easting, northing, ring) >= INSET_FT,
    );

  const soundings: PlannedSounding[] = [];
  function walk(fixed: number, from: number, to: number, fixedIsEasting: boolean, reverse: boolean) {
    const steps = Math.floor((to - from) / ALONG_LINE_STEP_FT);
    let startsLine = true;
    for (let step = 0; step <= steps; step++) {
      const along = from + (reverse ? steps - step : step) * ALONG_LINE_STEP_FT;
      const alongWander = random.clippedNormal(0.15, 0.4);
      const acrossWander = random.clippedNormal(0.2, 0.5);
      const easting = fixedIsEasting ? fixed + acrossWander : along + alongWander;
      const northing = fixedIsEasting ? along + alongWander : fixed + acrossWander;
      if (!keep(easting, northing)) continue;
      soundings.push({ easting, northing, startsLine });
      startsLine = false;
    }
  }

  // Main lines sit half a spacing off the grid lines, so no line runs along a cell edge.
  const firstMain = Math.ceil((minEasting - origin.easting) / MAIN_LINE_SPACING_FT - 0.5) + 0.5;
  let lineNumber = 0;
  for (let line = firstMain; origin.easting + line * MAIN_LINE_SPACING_FT <= maxEasting; line++) {
    walk(origin.easting + line * MAIN_LINE_SPACING_FT, minNorthing, maxNorthing, true, lineNumber++ % 2 === 1);
  }
  const firstTie = Math.ceil((minNorthing - origin.northing) / TIE_LINE_SPACING_FT - 0.5) + 0.5;
  for (let line = firstTie; origin.northing + line * TIE_LINE_SPACING_FT <= maxNorthing; line++) {
    walk(origin.northing + line * TIE_LINE_SPACING_FT, minEasting, maxEasting, false, lineNumber++ % 2 === 1);
  }
  return soundings;
}
