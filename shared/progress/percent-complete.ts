/**
 * Percent complete, two ways. By volume: the share of the planned volume (muck top down to firm
 * sand at the baseline) that no longer remains above firm sand, (planned − remaining) / planned,
 * held within 0–100 % (over-dredging into sand does not count as more than done). By cells: the
 * share of cells at firm sand (confirmed cells included).
 */
export function percentCompleteByVolume(plannedVolume: number, remainingVolume: number): number | null {
  if (!(plannedVolume > 0)) return null;
  const share = (plannedVolume - remainingVolume) / plannedVolume;
  return Math.min(100, Math.max(0, share * 100));
}

export function percentCellsAtFirmSand(cellsAtFirmSand: number, cells: number): number | null {
  if (!(cells > 0)) return null;
  return (cellsAtFirmSand / cells) * 100;
}

/** Difference of `other` from `reference` in percent of `reference` (the end-area check beside the surface volume). */
export function percentDifference(reference: number, other: number): number | null {
  if (!(Math.abs(reference) > 0)) return null;
  return ((other - reference) / reference) * 100;
}
