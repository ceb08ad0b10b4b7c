/**
 * Pairing a compliance reading with its background: the background reading nearest in time, on
 * either side, no further away than the rule's pairing window. None in the window: the reading is
 * unpaired and a relative rule gives no verdict.
 */

export interface TimedReading {
  id: number;
  takenAtMs: number;
  value: number;
}

/** The background reading to pair with a compliance reading taken at `takenAtMs`, or null. Ties go to the earlier background (it was in the water first). */
export function pairBackground<Reading extends TimedReading>(takenAtMs: number, backgrounds: readonly Reading[], windowMinutes: number): Reading | null {
  const windowMs = windowMinutes * 60_000;
  let best: Reading | null = null;
  let bestGapMs = Infinity;
  for (const background of backgrounds) {
    const gapMs = Math.abs(background.takenAtMs - takenAtMs);
    if (gapMs > windowMs) continue;
    if (gapMs < bestGapMs || (gapMs === bestGapMs && best !== null && background.takenAtMs < best.takenAtMs)) {
      best = background;
      bestGapMs = gapMs;
    }
  }
  return best;
}
