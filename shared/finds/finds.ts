import { cellIndex, cellLabel, toGridFrame, type CellGrid } from "../grid/cell-grid";
import { dateTimeFormat, instantOfLocal, localClockOf, localDayOf } from "../local-time";
import { handVolumeUnitFor, litresFrom, litresTo, measureLabel, type HandVolumeUnit, type LengthUnit } from "../units";

/**
 * Finds: what the divers' baskets and hoses bring up, recorded where and when it came up, handed
 * over with a chain of custody. Pure vocabulary and geometry here (no I/O); the records live in
 * app/models/finds.server.ts.
 */

export const FIND_CATEGORIES = ["cultural", "faunal", "human-remains", "historic-debris", "modern-debris"] as const;
export type FindCategory = (typeof FIND_CATEGORIES)[number];
export const FIND_CATEGORY_LABELS: Record<FindCategory, string> = {
  cultural: "Cultural",
  faunal: "Faunal",
  "human-remains": "Human remains",
  "historic-debris": "Historic debris",
  "modern-debris": "Modern debris",
};

/** Categories that stop work around the find until someone authorises resuming. */
export const HOLD_CATEGORIES: readonly FindCategory[] = ["cultural", "human-remains"];

export const FIND_STATUSES = ["in-field", "site-store", "at-lab", "curated", "released"] as const;
export type FindStatus = (typeof FIND_STATUSES)[number];
export const FIND_STATUS_LABELS: Record<FindStatus, string> = {
  "in-field": "In field",
  "site-store": "Site store",
  "at-lab": "At the lab",
  curated: "Curated",
  released: "Released",
};

export const CUSTODY_PURPOSES = ["to-site-store", "to-state-lab", "to-conservator", "returned"] as const;
export type CustodyPurpose = (typeof CUSTODY_PURPOSES)[number];
export const CUSTODY_PURPOSE_LABELS: Record<CustodyPurpose, string> = {
  "to-site-store": "To the site store",
  "to-state-lab": "To the state lab",
  "to-conservator": "To a conservator",
  returned: "Returned",
};

/** Who must be told of a hold. */
export const HOLD_AGENCIES = ["historic-preservation-office", "medical-examiner", "state-archaeologist"] as const;
export type HoldAgency = (typeof HOLD_AGENCIES)[number];
export const HOLD_AGENCY_LABELS: Record<HoldAgency, string> = {
  "historic-preservation-office": "State historic-preservation office",
  "medical-examiner": "Medical examiner",
  "state-archaeologist": "State archaeologist",
};

/** The agencies a find's hold must notify: the historic-preservation office always; human remains also the medical examiner and the state archaeologist. */
export function agenciesToNotify(category: FindCategory): HoldAgency[] {
  if (category === "human-remains") return ["historic-preservation-office", "medical-examiner", "state-archaeologist"];
  if (category === "cultural") return ["historic-preservation-office"];
  return [];
}

/**
 * The default hold radius. A published federal permit condition stops work within a
 * 100-metre-diameter area around a cultural find, i.e. within 50 m of it, with notice the same
 * business day. A project keeps its own radius and source as settings.
 */
export const PERMIT_HOLD_DIAMETER_M = 100;
export const DEFAULT_HOLD_RADIUS_M = PERMIT_HOLD_DIAMETER_M / 2;
export const DEFAULT_HOLD_RADIUS_SOURCE =
  "Permit condition: work stops within a 100-metre-diameter area (50 m radius) around a cultural find or human remains; notify the same business day.";

/** What the human-remains form shows at once. The law and the agencies decide what follows. */
export const HUMAN_REMAINS_PROTOCOL = [
  "Stop: all work near the find stops now; divers leave the area.",
  "Secure: leave the remains where they are or, if already raised, keep them covered, wet and untouched in a marked container; let no one photograph them for any use but the record.",
  "Notify: the medical examiner, the state archaeologist and the state historic-preservation office, today.",
] as const;
export const HUMAN_REMAINS_DEFERENCE =
  "This protocol is a reminder, not legal advice: state law, the permit conditions and the agencies decide what happens next, and their instructions come first.";

/** The catalogue number: project prefix, year, and a sequence never reused within that year. */
export function catalogueNumber(prefix: string, year: number, sequence: number): string {
  return `${prefix}-${year}-${String(sequence).padStart(4, "0")}`;
}

/** A catalogue prefix from a project's slug when none is set: its words' initials, 2 to 5 letters. */
export function defaultCataloguePrefix(slug: string): string {
  const words = slug.split(/[^a-z0-9]+/i).filter(Boolean);
  const initials = words.map((word) => word[0]).join("").toUpperCase().slice(0, 5);
  return initials.length >= 2 ? initials : (words[0] ?? "FND").slice(0, 3).toUpperCase().padEnd(2, "X");
}

export interface HeldCell {
  row: number;
  col: number;
  label: string;
}

/**
 * Cells of the grid any part of which lies within `radius` of a point (project coordinates and
 * length unit): the distance from the point to each square cell, measured in the grid's own
 * (rotated) frame, is at most the radius. `inside(index)` keeps only cells of the work limit.
 */
export function cellsWithinRadius(grid: CellGrid, easting: number, northing: number, radius: number, inside: (index: number) => boolean): HeldCell[] {
  const [u, v] = toGridFrame(grid, easting, northing);
  const size = grid.cellSize;
  const held: HeldCell[] = [];
  const firstCol = Math.max(grid.firstCol, Math.floor((u - radius) / size));
  const lastCol = Math.min(grid.firstCol + grid.cols - 1, Math.floor((u + radius) / size));
  const firstRow = Math.max(grid.firstRow, Math.floor((v - radius) / size));
  const lastRow = Math.min(grid.firstRow + grid.rows - 1, Math.floor((v + radius) / size));
  for (let row = firstRow; row <= lastRow; row++) {
    for (let col = firstCol; col <= lastCol; col++) {
      const du = Math.max(col * size - u, 0, u - (col + 1) * size);
      const dv = Math.max(row * size - v, 0, v - (row + 1) * size);
      if (Math.hypot(du, dv) > radius) continue;
      const index = cellIndex(grid, row, col);
      if (index < 0 || !inside(index)) continue;
      held.push({ row, col, label: cellLabel(row, col) });
    }
  }
  return held;
}

/** The calendar year of an instant in an IANA time zone (the catalogue's year is the project's local year). */
export function localYear(instant: Date, timeZone: string): number {
  return Number(dateTimeFormat("en-US", { timeZone, year: "numeric" }).format(instant));
}

/** Minutes the zone is ahead of UTC at an instant. */
/**
 * A wall-clock time as a form's datetime-local field sends it ("2026-11-03T10:42"), read in the
 * project's zone, as an instant; null when it is not such a time. In the hour a clock skips or
 * repeats, the zone's offset just before the change is used.
 */
export function localDateTimeToInstant(local: string, timeZone: string): Date | null {
  const match = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(local.trim());
  if (!match) return null;
  const [year, month, day, hour, minute] = match.slice(1).map(Number);
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day || hour > 23 || minute > 59) return null;
  return new Date(instantOfLocal(`${match[1]}-${match[2]}-${match[3]}`, hour * 60 + minute, timeZone));
}

/** An instant as the project's wall-clock time, "2026-11-03 10:42". */
export function instantToLocalDateTime(instant: Date, timeZone: string): string {
  return `${localDayOf(instant.getTime(), timeZone)} ${localClockOf(instant.getTime(), timeZone)}`;
}

/** Cell labels in reading order for people: "A9" before "A10". */
export function sortCellLabels(labels: Iterable<string>): string[] {
  return [...labels].sort((a, b) => a.localeCompare(b, "en", { numeric: true }));
}

/** How much a catalogue entry holds: its count, and for a basket line its volume as measured. */
export interface FindAmount {
  count: number | null;
  volume: { value: number; unit: HandVolumeUnit } | null;
}

const figure = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 2 });

/** A volume as measured: "2.5 gal", "0.75 ft³", "12 L". */
export function handVolumeText(volume: { value: number; unit: HandVolumeUnit }): string {
  return `${figure(volume.value)} ${measureLabel(volume.unit)}`;
}

/** "14", "2.5 gal", or "14 · 2.5 gal" when a line gave both (never empty: a line gives one or the other). */
export function amountText(amount: FindAmount): string {
  return [amount.count !== null ? figure(amount.count) : null, amount.volume ? handVolumeText(amount.volume) : null].filter(Boolean).join(" · ") || "–";
}

/**
 * Totals of basket lines: items counted (lines by volume alone add none), and the volumes added in
 * litres and given in the project's hand-volume unit (US gallons on feet projects, litres on metre
 * projects), rounded to hundredths.
 */
export function basketTotals(lines: readonly FindAmount[], lengthUnit: LengthUnit): { lines: number; items: number; volume: { value: number; unit: "gal" | "L" } | null } {
  const unit = handVolumeUnitFor(lengthUnit);
  const measured = lines.filter((line) => line.volume !== null);
  const litres = measured.reduce((sum, line) => sum + litresFrom(line.volume!.value, line.volume!.unit), 0);
  return {
    lines: lines.length,
    items: lines.reduce((sum, line) => sum + (line.count ?? 0), 0),
    volume: measured.length ? { value: Math.round(litresTo(litres, unit) * 100) / 100, unit } : null,
  };
}
