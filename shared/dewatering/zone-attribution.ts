/**
 * Which zone the pumped and hauled solids came from. Shift logs and haul tickets name no zone, so
 * a zone's share is attributed, never measured, by this rule (stated with the figures):
 *
 * - A shift's dry solids are shared among the zones by the dive time in the shift's hours: a dive
 *   with its times logged counts the minutes from leaving the surface to leaving the bottom that
 *   fall between the shift's start and end (same local date); a dive logged with its bottom time
 *   only shares that time among the day's shifts by their length. A dive's minutes are split
 *   evenly over the cells it worked, each cell counting for its zone.
 * - A shift with no dive time in its hours, and a cell the grid's figures do not place, leave
 *   their solids unattributed.
 * - Hauled solids are shared as the pumped ones are: a ticket names neither tube nor shift, so
 *   each zone is given the share of the hauled mass that it has of the pumped mass.
 *
 * Pure: local dates (YYYY-MM-DD) and clock times (HH:MM) in, kilograms per zone out.
 */

import { minutesOfClock } from "../local-time";

export interface ShiftForAttribution {
  date: string;
  start: string;
  end: string;
  /** Null when the shift's figures could not be computed; it then adds nothing. */
  drySolidsKg: number | null;
}

export interface DiveForAttribution {
  date: string;
  leftSurface: string | null;
  leftBottom: string | null;
  bottomMinutes: number;
  /**
   * The zone of each cell the dive worked: a zone's id, null for a cell in no zone ("Unzoned"),
   * undefined for a cell the grid's figures do not place.
   */
  cellZones: ReadonlyArray<number | null | undefined>;
}

export interface ZoneAttribution {
  /** Kilograms per zone id (null: the cells in no zone). */
  pumpedKgByZone: Map<number | null, number>;
  unattributedPumpedKg: number;
  hauledKgByZone: Map<number | null, number>;
  unattributedHauledKg: number;
}


function add(map: Map<number | null, number>, key: number | null, value: number) {
  map.set(key, (map.get(key) ?? 0) + value);
}

/** Minutes of dive time in each of the day's shifts, by the rule above. */
function diveMinutesPerShift(dive: DiveForAttribution, shifts: ReadonlyArray<{ startMinutes: number; endMinutes: number }>): number[] {
  if (dive.leftSurface && dive.leftBottom) {
    const from = minutesOfClock(dive.leftSurface);
    const to = minutesOfClock(dive.leftBottom);
    return shifts.map((shift) => Math.max(0, Math.min(to, shift.endMinutes) - Math.max(from, shift.startMinutes)));
  }
  const lengths = shifts.map((shift) => Math.max(0, shift.endMinutes - shift.startMinutes));
  const total = lengths.reduce((sum, length) => sum + length, 0);
  return lengths.map((length) => (total > 0 ? (dive.bottomMinutes * length) / total : 0));
}

export function attributeSolidsToZones(input: {
  shifts: ReadonlyArray<ShiftForAttribution>;
  dives: ReadonlyArray<DiveForAttribution>;
  hauledKg: number;
}): ZoneAttribution {
  const shiftsByDate = new Map<string, { shift: ShiftForAttribution; startMinutes: number; endMinutes: number; weights: Map<number | null, number>; unplacedMinutes: number }[]>();
  for (const shift of input.shifts) {
    const day = shiftsByDate.get(shift.date) ?? [];
    day.push({ shift, startMinutes: minutesOfClock(shift.start), endMinutes: minutesOfClock(shift.end), weights: new Map(), unplacedMinutes: 0 });
    shiftsByDate.set(shift.date, day);
  }
  for (const dive of input.dives) {
    const day = shiftsByDate.get(dive.date);
    if (!day || dive.cellZones.length === 0) continue;
    diveMinutesPerShift(dive, day).forEach((minutes, index) => {
      if (minutes <= 0) return;
      const perCell = minutes / dive.cellZones.length;
      for (const zone of dive.cellZones) {
        if (zone === undefined) day[index].unplacedMinutes += perCell;
        else add(day[index].weights, zone, perCell);
      }
    });
  }

  const pumpedKgByZone = new Map<number | null, number>();
  let unattributedPumpedKg = 0;
  let pumpedKg = 0;
  for (const day of shiftsByDate.values()) {
    for (const { shift, weights, unplacedMinutes } of day) {
      const solids = shift.drySolidsKg ?? 0;
      pumpedKg += solids;
      const placedMinutes = [...weights.values()].reduce((sum, minutes) => sum + minutes, 0);
      const totalMinutes = placedMinutes + unplacedMinutes;
      if (totalMinutes <= 0) {
        unattributedPumpedKg += solids;
        continue;
      }
      for (const [zone, minutes] of weights) add(pumpedKgByZone, zone, (solids * minutes) / totalMinutes);
      unattributedPumpedKg += (solids * unplacedMinutes) / totalMinutes;
    }
  }

  const hauledKgByZone = new Map<number | null, number>();
  let unattributedHauledKg = input.hauledKg;
  if (pumpedKg > 0) {
    for (const [zone, kg] of pumpedKgByZone) hauledKgByZone.set(zone, (input.hauledKg * kg) / pumpedKg);
    unattributedHauledKg = (input.hauledKg * unattributedPumpedKg) / pumpedKg;
  }
  return { pumpedKgByZone, unattributedPumpedKg, hauledKgByZone, unattributedHauledKg };
}

/** The rule in words, for the reconciliation's assumptions. */
export const ZONE_ATTRIBUTION_RULE =
  "Pumped and hauled solids by zone are attributed, not measured: shift logs and haul tickets name no zone. A shift's dry solids are shared among the zones by the dive time logged in the shift's hours (leaving the surface to leaving the bottom; a dive with its bottom time only shares it among the day's shifts by their length), each dive's minutes split evenly over the cells it worked. Hauled solids are shared in the proportions of the pumped. A shift with no dive logged in its hours is left unattributed.";
