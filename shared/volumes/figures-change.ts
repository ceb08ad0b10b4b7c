import { z } from "zod";
import { CELL_STATUSES, type CellStatus } from "../cell-status";
import type { FigureTotals } from "./figure-totals";

/**
 * What a recompute changed: the project's figures before it (as stored, computed with the earlier
 * settings) against after it, compared figure by figure and cell by cell. Nothing here is
 * estimated: every number is a difference of two stored figures. Cells are compared by label only
 * when both sides were laid on the same grid (cell size, rotation, origin); on a new grid a label
 * names another piece of ground, so only the counts by status are compared.
 */

/** One side of the comparison: the latest figures of the project (null totals: no figures then). */
export interface FiguresSide {
  totals: FigureTotals | null;
  cells: ReadonlyArray<{ label: string; status: CellStatus }>;
  zones: ReadonlyArray<{ name: string; totals: FigureTotals }>;
}

const VOLUME_KEYS = ["plannedVolume", "removedVolume", "remainingVolume", "depositedVolume"] as const;
export type ChangeVolumeKey = (typeof VOLUME_KEYS)[number];

export const figuresChangeSchema = z.object({
  sameGrid: z.boolean(),
  volumes: z.array(z.object({ key: z.enum(VOLUME_KEYS), before: z.number().nullable(), after: z.number().nullable() })),
  cells: z.object({ before: z.number(), after: z.number() }),
  /** Same grid: cells whose status differs (labels on both sides); new grid: null. */
  statusChanged: z.number().nullable(),
  /** Same grid: cells that came into or left the work limit. */
  cellsAdded: z.number().nullable(),
  cellsRemoved: z.number().nullable(),
  /** Cells by status before and after, for every status whose count changed. */
  statusCounts: z.array(z.object({ status: z.enum(CELL_STATUSES), before: z.number(), after: z.number() })),
  /** Zone rows whose planned or remaining volume changed, or that came or went (null: no such row on that side). */
  zones: z.array(z.object({
    name: z.string(),
    plannedBefore: z.number().nullable(),
    plannedAfter: z.number().nullable(),
    remainingBefore: z.number().nullable(),
    remainingAfter: z.number().nullable(),
  })),
});
export type FiguresChange = z.infer<typeof figuresChangeSchema>;

/** Two volumes are the same figure when they agree to a hundredth of the unit (what the quantities print). */
const sameVolume = (a: number | null, b: number | null) => (a === null || b === null ? a === b : Math.abs(a - b) < 0.005);

function countByStatus(cells: FiguresSide["cells"]): Record<CellStatus, number> {
  const counts = Object.fromEntries(CELL_STATUSES.map((status) => [status, 0])) as Record<CellStatus, number>;
  for (const cell of cells) counts[cell.status]++;
  return counts;
}

export function compareFigures(before: FiguresSide, after: FiguresSide, sameGrid: boolean): FiguresChange {
  const volumes = VOLUME_KEYS.map((key) => ({ key, before: before.totals?.[key] ?? null, after: after.totals?.[key] ?? null }));
  let statusChanged: number | null = null;
  let cellsAdded: number | null = null;
  let cellsRemoved: number | null = null;
  if (sameGrid) {
    const earlier = new Map(before.cells.map((cell) => [cell.label, cell.status]));
    const later = new Set<string>();
    statusChanged = 0;
    cellsAdded = 0;
    for (const cell of after.cells) {
      later.add(cell.label);
      const was = earlier.get(cell.label);
      if (was === undefined) cellsAdded++;
      else if (was !== cell.status) statusChanged++;
    }
    cellsRemoved = before.cells.filter((cell) => !later.has(cell.label)).length;
  }
  const countsBefore = countByStatus(before.cells);
  const countsAfter = countByStatus(after.cells);
  const statusCounts = CELL_STATUSES.filter((status) => countsBefore[status] !== countsAfter[status]).map((status) => ({ status, before: countsBefore[status], after: countsAfter[status] }));
  const names = [...new Set([...after.zones.map((zone) => zone.name), ...before.zones.map((zone) => zone.name)])];
  const zones = names
    .map((name) => {
      const was = before.zones.find((zone) => zone.name === name)?.totals ?? null;
      const now = after.zones.find((zone) => zone.name === name)?.totals ?? null;
      return { name, plannedBefore: was?.plannedVolume ?? null, plannedAfter: now?.plannedVolume ?? null, remainingBefore: was?.remainingVolume ?? null, remainingAfter: now?.remainingVolume ?? null };
    })
    .filter((zone) => !sameVolume(zone.plannedBefore, zone.plannedAfter) || !sameVolume(zone.remainingBefore, zone.remainingAfter));
  return { sameGrid, volumes, cells: { before: before.cells.length, after: after.cells.length }, statusChanged, cellsAdded, cellsRemoved, statusCounts, zones };
}

const VOLUME_WORDS: Record<ChangeVolumeKey, string> = { plannedVolume: "planned volume", removedVolume: "removed volume", remainingVolume: "remaining volume", depositedVolume: "deposited volume" };
const STATUS_WORDS: Record<CellStatus, string> = { "no-data": "without data", untouched: "untouched", "in-work": "in work", "at-firm-sand": "at firm sand", confirmed: "confirmed" };

const whole = (value: number) => Math.round(value).toLocaleString("en-US");
const plural = (count: number, word: string) => `${count.toLocaleString("en-US")} ${word}${count === 1 ? "" : "s"}`;

/** The volumes whose whole-unit figure changed (as the summary prints them). */
export function changedVolumes(change: FiguresChange) {
  return change.volumes.filter((volume) => volume.before === null || volume.after === null ? volume.before !== volume.after : Math.round(volume.before) !== Math.round(volume.after));
}

/**
 * The change in one line, e.g. "planned volume 6,348 → 6,401 yd³; 4 cells changed status".
 * `volumeLabel`: the project's volume unit's short label.
 */
export function describeFiguresChange(change: FiguresChange, volumeLabel: string): string {
  const parts: string[] = [];
  for (const volume of changedVolumes(change)) {
    const side = (value: number | null) => (value === null ? "none" : whole(value));
    parts.push(`${VOLUME_WORDS[volume.key]} ${side(volume.before)} → ${side(volume.after)} ${volumeLabel}`);
  }
  if (change.sameGrid) {
    if (change.statusChanged) parts.push(`${plural(change.statusChanged, "cell")} changed status`);
    if (change.cellsAdded) parts.push(`${plural(change.cellsAdded, "cell")} added`);
    if (change.cellsRemoved) parts.push(`${plural(change.cellsRemoved, "cell")} removed`);
  } else {
    parts.push(`a new grid: ${whole(change.cells.before)} → ${whole(change.cells.after)} cells`);
    for (const count of change.statusCounts) parts.push(`${STATUS_WORDS[count.status]} ${whole(count.before)} → ${whole(count.after)} cells`);
  }
  if (change.zones.length > 0 && change.zones.length <= 3) {
    for (const zone of change.zones) {
      if (zone.plannedBefore === null) parts.push(`zone "${zone.name}" added`);
      else if (zone.plannedAfter === null) parts.push(`zone "${zone.name}" removed`);
    }
  }
  return parts.length === 0 ? "no figure changed" : parts.join("; ");
}

/** The status words the summary uses (for the page's table). */
export const changeStatusWords = STATUS_WORDS;
export const changeVolumeWords = VOLUME_WORDS;