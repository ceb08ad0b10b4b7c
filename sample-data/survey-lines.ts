/**
 * Where a crew takes soundings: planned lines of constant easting (across the run, which flows
 * east-south-east) every 5 ft, plus tie lines of constant northing every 50 ft, a sounding every
 * 2 ft along each line, with the rod's positioning wander, and a line 1 ft inside the edge of the
 * area the pass covers (so every pass's surface reaches its edge). Lines are walked back and forth.
 * Stations are keyed to the grid origin, so every pass sounds the same planned stations.
 * Coordinates are projected feet; rings are closed [easting, northing] lists.
 */
import type { Random } from "./prng";

export const MAIN_LINE_SPACING_FT = 5;
export const TIE_LINE_SPACING_FT = 50;
export const ALONG_LINE_STEP_FT = 2;
/** Planned stations lie at least this far inside the area a pass covers; wander keeps 0.5 ft. */
const STATION_INSET_FT = 1;
const WANDER_INSET_FT = 0.5;
const EDGE_LINE_INSET_FT = 1;

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
  const inside = (easting: number, northing: number, insetFt: number) =>
    rings.some(
      (ring) => pointInRing(easting, northing, ring) && distanceToRingFt(easting, northing, ring) >= insetFt - 1e-9,
    );

  const soundings: PlannedSounding[] = [];
  let startsLine = true;
  /** A planned station: kept if well inside; its wander is dropped if it would reach the edge. */
  function sound(plannedEasting: number, plannedNorthing: number, stationInsetFt: number) {
    const wanderEasting = random.clippedNormal(0.2, 0.5);
    const wanderNorthing = random.clippedNormal(0.2, 0.5);
    if (!inside(plannedEasting, plannedNorthing, stationInsetFt)) return;
    let easting = plannedEasting + wanderEasting;
    let northing = plannedNorthing + wanderNorthing;
    if (!inside(easting, northing, WANDER_INSET_FT)) {
      easting = plannedEasting;
      northing = plannedNorthing;
    }
    soundings.push({ easting, northing, startsLine });
    startsLine = false;
  }
  function walk(fixed: number, from: number, to: number, fixedIsEasting: boolean, reverse: boolean) {
    const alongOrigin = fixedIsEasting ? origin.northing : origin.easting;
    const first = Math.ceil((from - alongOrigin) / ALONG_LINE_STEP_FT);
    const last = Math.floor((to - alongOrigin) / ALONG_LINE_STEP_FT);
    startsLine = true;
    for (let step = first; step <= last; step++) {
      const along = alongOrigin + (reverse ? first + last - step : step) * ALONG_LINE_STEP_FT;
      if (fixedIsEasting) sound(fixed, along, STATION_INSET_FT);
      else sound(along, fixed, STATION_INSET_FT);
    }
  }
  /** Along a counter-clockwise ring, 1 ft to the inside (the left of each edge). */
  function walkEdge(ring: Ring) {
    startsLine = true;
    for (let index = 0; index + 1 < ring.length; index++) {
      const [x0, y0] = ring[index];
      const [x1, y1] = ring[index + 1];
      const length = Math.hypot(x1 - x0, y1 - y0);
      const inwardX = -(y1 - y0) / length;
      const inwardY = (x1 - x0) / length;
      const steps = Math.max(1, Math.round(length / ALONG_LINE_STEP_FT));
      for (let step = 0; step < steps; step++) {
        const share = (step + 0.5) / steps;
        sound(
          x0 + share * (x1 - x0) + EDGE_LINE_INSET_FT * inwardX,
          y0 + share * (y1 - y0) + EDGE_LINE_INSET_FT * inwardY,
          EDGE_LINE_INSET_FT - 0.2,
        );
      }
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
  for (const ring of rings) walkEdge(ring);
  return soundings;
}
