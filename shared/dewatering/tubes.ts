/** A tube's life on the laydown area, in order. */
export const TUBE_STATUSES = ["filling", "dewatering", "ready-to-open", "opened", "hauled"] as const;
export type TubeStatus = (typeof TUBE_STATUSES)[number];

/** A tube takes slurry while it is being filled, or is topped up while it dewaters. */
export const FILLABLE_TUBE_STATUSES: readonly TubeStatus[] = ["filling", "dewatering"];

/**
 * Geotextile tubes: the theoretical diameter of a round tube of the given circumference (a filled
 * tube flattens, so its practical fill height is a fraction of it that the supplier gives), and how
 * full a tube is from the dry solids delivered against the capacity on the supplier's sheet.
 */

export function theoreticalDiameter(circumference: number): number {
  return circumference / Math.PI;
}

/**
 * A tube at or beyond this share of its capacity is flagged: filling on risks a rupture. Practice,
 * not a published figure; the supplier's sheet and the site's plan decide when filling stops, so
 * the manager sets the project's own share (`projects.tubeNearCapacityShare`); this is its default.
 */
export const NEAR_CAPACITY_SHARE = 0.9;
/** The lowest share a project may flag at: below half full a flag says nothing. */
export const MIN_NEAR_CAPACITY_SHARE = 0.5;

/** Share of capacity filled (0–1 and beyond): delivered dry mass ÷ (capacity per length × length). */
export function fillLevel(deliveredDryMass: number, capacityDryMassPerLength: number, length: number): number {
  return deliveredDryMass / (capacityDryMassPerLength * length);
}

export function isNearCapacity(level: number, share: number = NEAR_CAPACITY_SHARE): boolean {
  return level >= share;
}

/**
 * The line a tube lies along on the laydown area: its two ends, `length` apart through its centre,
 * at a bearing in degrees clockwise from grid north (x east, y north, the project's CRS and unit).
 */
export function tubeEnds(centre: { x: number; y: number }, length: number, bearingDegrees: number): [[number, number], [number, number]] {
  const radians = (bearingDegrees * Math.PI) / 180;
  const dx = (Math.sin(radians) * length) / 2;
  const dy = (Math.cos(radians) * length) / 2;
  return [[centre.x - dx, centre.y - dy], [centre.x + dx, centre.y + dy]];
}
