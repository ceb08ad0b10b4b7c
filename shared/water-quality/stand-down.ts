/**
 * Wildlife stand-downs: a protected animal seen within the project's shutdown distance of the
 * work stops in-water equipment; the stand-down ends when the animal has left on its own and the
 * project's wait has passed. Distance and wait are project settings with their source.
 */

/**
 * The common condition offered as a default: recalled from memory of Florida permit conditions
 * (50 ft, 30 minutes after the animal leaves), not confirmed: check it against the permit.
 */
export const DEFAULT_SHUTDOWN_DISTANCE_FT = 50;
export const DEFAULT_STAND_DOWN_WAIT_MINUTES = 30;
export const DEFAULT_STAND_DOWN_SOURCE = "Common permit condition recalled from memory (50 ft, 30 min after the animal leaves on its own): check it against the permit.";

export interface StandDownSettings {
  /** Project length unit. */
  shutdownDistance: number;
  waitMinutes: number;
}

export interface Sighting {
  seenAtMs: number;
  /** Distance from the work, project length unit; null when the animal is out of sight. */
  distance: number | null;
  /** The observer reports the animal has left (out of sight or moving away). */
  gone: boolean;
}

export interface StandDownState {
  startedAtMs: number;
  /** When the animal was seen to have left; null while it is still near. */
  departedAtMs: number | null;
}

/** "Within 50 ft" includes 50 ft. */
export function withinShutdownDistance(distance: number | null, settings: StandDownSettings): boolean {
  return distance !== null && distance <= settings.shutdownDistance;
}

/** When a stand-down ends: the wait after the animal left; null while it has not left. */
export function standDownEndMs(state: StandDownState, waitMinutes: number): number | null {
  return state.departedAtMs === null ? null : state.departedAtMs + waitMinutes * 60_000;
}

export function standDownActiveAt(state: StandDownState, nowMs: number, waitMinutes: number): boolean {
  const endMs = standDownEndMs(state, waitMinutes);
  return nowMs >= state.startedAtMs && (endMs === null || nowMs < endMs);
}

export type SightingEffect =
  /** No stand-down in force and the animal is near: one starts. */
  | { kind: "start" }
  /** A stand-down in force and the animal near again: it stays open (the departure, if any, is forgotten). */
  | { kind: "renew" }
  /** The animal has left: the stand-down ends after the wait. */
  | { kind: "depart"; untilMs: number }
  | { kind: "none" };

/** What a sighting does to the species' latest stand-down (null when it never had one). */
export function effectOfSighting(latest: StandDownState | null, sighting: Sighting, settings: StandDownSettings): SightingEffect {
  const inForce = latest !== null && standDownActiveAt(latest, sighting.seenAtMs, settings.waitMinutes);
  const near = !sighting.gone && withinShutdownDistance(sighting.distance, settings);
  if (near) return inForce ? { kind: "renew" } : { kind: "start" };
  if (inForce && latest.departedAtMs === null) return { kind: "depart", untilMs: sighting.seenAtMs + settings.waitMinutes * 60_000 };
  return { kind: "none" };
}
