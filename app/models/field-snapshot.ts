import type { Stoppages } from "./stoppages.server";

/**
 * What the field page needs to take entries with no signal: the project's name, zone and length
 * unit, the cells inside the work limit, the dive teams and their rosters, the monitoring
 * stations, the species the stand-down rule names, the cells under a hold and the stoppages in
 * force, and which records the member may enter. The page keeps it on the device (IndexedDB) each
 * time it loads with signal, so it is "as of" that moment when used offline.
 */
export interface FieldSnapshot {
  /** Who the page is for: the device's queue keeps each person's entries apart by this id. */
  user: { id: number; name: string };
  project: { id: number; name: string; timeZone: string; lengthUnit: string; lengthLabel: string };
  /** Records this member may enter (the permission table's answer). */
  may: { dives: boolean; readings: boolean; finds: boolean; sightings: boolean; tubes: boolean };
  teams: Array<{ id: number; name: string; divers: string[] }>;
  stations: Array<{ id: number; name: string; kind: string }>;
  /** Geotextile tubes with the version a status change made offline is checked against (If-Match). */
  tubes: Array<{ id: number; name: string; status: string; version: string; fillLevel: number }>;
  /** The project's bulk mass unit, as a tube's fill is entered in it. */
  massLabel: string;
  /** The dewatering settings a shift log and a haul ticket are worked out with (null: the member logs no dewatering). */
  dewatering: { solidsSpecificGravity: number; cakeSolidsByWeight: number | null; flowUnit: "gpm" | "m3/h"; haulSites: Array<{ id: number; name: string; kind: string }> } | null;
  /** Finds still in custody, with the version a status change made offline is checked against (If-Match). */
  finds: Array<{ id: number; catalogueNumber: string; category: string; description: string; status: string; foundAt: string; currentHolder: { name: string; place: string }; version: string }>;
  cells: string[];
  heldCells: string[];
  species: string[];
  stoppages: Stoppages;
  /** When the server answered, ISO 8601: the age of a copy used offline. */
  takenAt: string;
}

