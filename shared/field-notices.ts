import { STAND_DOWN_CAUTION, WATER_QUALITY_CAUTION } from "./water-quality/wording";

/**
 * The safety notices a field write's answer carries as plain sentences (`notices`), so a client
 * that sent the entry from a queue can show them as soon as the server answers: an exceedance and
 * its stop-work, a wildlife stand-down, a hold around a find. Browser and server alike.
 */

/** A reading's notices: none unless it exceeds the rule. */
export function readingNotices(reading: { verdict: string; exceeds: boolean | null; stopWork?: { id: number; notifyBy: string } }): string[] {
  if (!reading.exceeds) return [];
  const notices = [reading.verdict];
  if (reading.stopWork) notices.push(`Stop-work event #${reading.stopWork.id} is open: stop the work causing the plume and resample until within the limit; the agency is to be told by ${reading.stopWork.notifyBy} (UTC).`);
  notices.push(WATER_QUALITY_CAUTION);
  return notices;
}

/** A sighting's notices: a stand-down that applies (still running, or ending at `until`). */
export function sightingNotices(species: string, standDown: { id: number; until: string | null } | undefined): string[] {
  if (!standDown) return [];
  const when = standDown.until === null ? "until the animal has left on its own and the wait after has passed" : `until ${standDown.until} (UTC), the wait after the animal left`;
  return [`Stand-down #${standDown.id} for ${species} applies: keep in-water equipment stopped ${when}.`, STAND_DOWN_CAUTION];
}

/** A find's notices: the hold it placed on cells. */
export function findNotices(hold: { id: number; cells: string[] } | undefined): string[] {
  if (!hold) return [];
  const cells = hold.cells.length === 1 ? `cell ${hold.cells[0]}` : `${hold.cells.length} cells (${hold.cells.join(", ")})`;
  return [
    `Hold #${hold.id} stops work in ${cells}: no dredging there until the hold is lifted. Leave the find in place if it is not yet raised, and follow the project's discovery procedure, the permit and the law that applies.`,
  ];
}
